import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { createDb, db, type Db, type DbProvider } from "@/lib/db/client";
import { armSchema, requirementSetSchema, type ArmDocument, type RequirementSet } from "@/shared/schemas";
import { createDatabase } from "../helpers/postgres";

const root = path.resolve(__dirname, "..", "..");

/**
 * The provider the database suites run on: SQLite, or PostgreSQL in the `db-pg` test project
 * (ARMSIFT_TEST_PROVIDER=postgres), which runs the same files against a real server.
 */
export const testProvider: DbProvider = process.env.ARMSIFT_TEST_PROVIDER === "postgres" ? "postgres" : "sqlite";

export interface TestDb {
  provider: DbProvider;
  /** URL of the temporary database (`file:…` or `postgresql://…`). */
  url: string;
  /** The SQLite file (empty on PostgreSQL). */
  file: string;
  /** A client of its own (the code under test uses the shared one from `db()`, same file). */
  client: Db;
  cleanup(): Promise<void>;
}

/**
 * Creates a temporary database with the real migrations applied (SQLite: a file migrated with
 * `prisma migrate deploy`; PostgreSQL: a copy of the migrated template database) and points
 * DATABASE_URL (and ARMSIFT_DB) at it so the shared client of lib/db opens it on first use.
 * Call once per test file, before anything touches the database.
 */
export function createTestDb(): TestDb {
  if (testProvider === "postgres") {
    const pg = createDatabase();
    process.env.DATABASE_URL = pg.url;
    delete process.env.ARMSIFT_DB;
    const client = createDb(pg.url);
    return {
      provider: "postgres",
      url: pg.url,
      file: "",
      client,
      async cleanup() {
        await client.$disconnect();
        await db().$disconnect();
        pg.drop();
      },
    };
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), "armsift-test-"));
  const file = path.join(dir, "test.db");
  const url = `file:${file}`;
  execFileSync(process.execPath, [path.join(root, "scripts", "prisma.mjs"), "migrate", "deploy"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: url, ARMSIFT_DB: file },
    stdio: "pipe",
  });
  process.env.DATABASE_URL = url;
  process.env.ARMSIFT_DB = file;
  const client = createDb(url);
  return {
    provider: "sqlite",
    url,
    file,
    client,
    async cleanup() {
      await client.$disconnect();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A small invented 3-axis arm (SI units) for tests. */
export function sampleArm(overrides: Record<string, unknown> = {}) {
  return {
    name: "Test arm TA-3",
    maker: "Example Works",
    modelCode: "TA-3",
    convention: "dh",
    joints: [
      { type: "revolute", a: 0, alpha: Math.PI / 2, d: 0.3, theta: 0, min: -Math.PI, max: Math.PI, maxSpeed: 3, maxTorque: 120, mass: 4 },
      { type: "revolute", a: 0.4, alpha: 0, d: 0, theta: 0, min: -2, max: 2, maxSpeed: 3, maxTorque: 90, mass: 3, com: [-0.2, 0, 0] },
      { type: "revolute", a: 0.3, alpha: 0, d: 0, theta: 0, min: -2.5, max: 2.5, maxSpeed: 4, maxTorque: 40, mass: 2, com: [-0.15, 0, 0] },
    ],
    specs: { ratedPayload: 5, reach: 0.7, repeatability: 0.00005, ipCode: "IP54", mounting: ["floor"], price: 21000, currency: "EUR" },
    ...overrides,
  };
}

/** A small invented requirement set (input form, defaults not applied). */
export function sampleRequirementSet(overrides: Record<string, unknown> = {}) {
  const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  return {
    name: "Test cell: pick and place",
    base: I,
    tool: { tcp: I, mass: 0.5, cog: [0, 0, 0.05] },
    payload: { mass: 1, cog: [0, 0, 0.02] },
    targets: [
      { name: "pick", position: [0.4, 0.1, 0.2], rpy: [Math.PI, 0, 0], mode: "axis" },
      { name: "place", position: [0.3, -0.3, 0.25], rpy: [Math.PI, 0, 0], mode: "point" },
    ],
    paths: [],
    specs: [{ field: "ratedPayload", comparator: "atLeast", value: 3, priority: "must" }],
    ...overrides,
  };
}

/** sampleArm() as the data layer takes it: validated with armSchema, as the API edge does. */
export const armDoc = (overrides: Record<string, unknown> = {}): ArmDocument => armSchema.parse(sampleArm(overrides));

/** sampleRequirementSet() validated (defaults applied), as the API edge hands it to the data layer. */
export const requirementDoc = (overrides: Record<string, unknown> = {}): RequirementSet => requirementSetSchema.parse(sampleRequirementSet(overrides));
