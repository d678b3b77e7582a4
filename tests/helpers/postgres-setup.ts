// globalSetup of the `db-pg` test project: the migrated template database exists before any file runs.
import { adminUrl, ensureTemplate, reachable } from "./postgres";

export default async function setup(): Promise<void> {
  if (!(await reachable())) {
    throw new Error(`PostgreSQL is not reachable at ${new URL(adminUrl()).host} (set ARMSIFT_TEST_PG_URL, or start the server: see DEVELOPERS.md)`);
  }
  ensureTemplate();
}
