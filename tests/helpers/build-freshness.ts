/**
 * Whether the production build (`.next/BUILD_ID`) is older than its sources, so the browser tests
 * rebuild before they run against stale pages.
 */
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

// What the production build is made of: a file here newer than the build means it is stale.
const BUILD_INPUTS = ["app", "components", "lib", "shared", "seed-data", "prisma", "public", "instrumentation.ts", "next.config.mjs", "tsconfig.json", "package-lock.json"];

/** Newest modification time (ms) of the files under `p` (0 when it does not exist). */
function newestMtime(p: string): number {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(p)) {
    if (entry === "node_modules" || entry.startsWith(".")) continue;
    newest = Math.max(newest, newestMtime(path.join(p, entry)));
  }
  return newest;
}

/** True when there is no production build or a source file is newer than it. */
export function buildIsStale(root: string): boolean {
  const buildId = path.join(root, ".next", "BUILD_ID");
  if (!existsSync(buildId)) return true;
  const built = statSync(buildId).mtimeMs;
  return BUILD_INPUTS.some((input) => newestMtime(path.join(root, input)) > built);
}
