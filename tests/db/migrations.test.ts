// Migrations of the provider under test (SQLite in `db`, PostgreSQL in `db-pg`), applied with the
// real `prisma migrate deploy`: a database migrated from empty has the whole schema and its
// immutability triggers; a database at the previous migration, with rows in every table, keeps
// every row through the newest migration and reads back through the data layer. Also: npm start's
// check for pending migrations answers while another process holds the database busy.
import { execFileSync, spawn } from "node:child_process";
import { cpSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { createDb, type Db } from "@/lib/db/client";
import { testProvider } from "./helpers";
import { adminSql, urlFor } from "../helpers/postgres";
import { migrationNames, pendingMigrations } from "../../scripts/migrations.mjs";

const ROOT = path.resolve(__dirname, "..", "..");
const cleanups: Array<() => void> = [];
afterAll(() => {
  for (const c of cleanups.reverse()) c();
});

/** An empty database of the provider under test (nothing migrated). */
function emptyDatabase(): string {
  if (testProvider === "postgres") {
    const name = `armsift_mig_${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
    adminSql([`CREATE DATABASE ${name}`]);
    cleanups.push(() => adminSql([`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`]));
    return urlFor(name);
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), "armsift-mig-"));
  cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
  return `file:${path.join(dir, "armsift.db")}`;
}

function deploy(url: string, migrationsDir?: string): void {
  execFileSync(process.execPath, [path.join(ROOT, "scripts", "prisma.mjs"), "migrate", "deploy"], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: url, ...(migrationsDir ? { ARMSIFT_MIGRATIONS_DIR: migrationsDir } : {}) },
    stdio: "pipe",
  });
}

async function tableCounts(client: Db): Promise<Record<string, number>> {
  const tables = (testProvider === "postgres"
    ? await client.$queryRawUnsafe(`SELECT table_name::text AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE'`)
    : await client.$queryRawUnsafe(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'`)) as { name: string }[];
  const out: Record<string, number> = {};
  for (const { name } of tables) {
    if (name === "_prisma_migrations") continue;
    const [row] = (await client.$queryRawUnsafe(`SELECT count(*) AS n FROM "${name}"`)) as { n: number | bigint }[];
    out[name] = Number(row.n);
  }
  return out;
}

const client = (url: string) => {
  const c = createDb(url);
  cleanups.push(() => void c.$disconnect());
  return c;
};

describe(`migrations (${testProvider})`, () => {
  it("migrates an empty database to the whole schema, immutable revisions included", async () => {
    const url = emptyDatabase();
    expect(await pendingMigrations(url)).toEqual(migrationNames(testProvider));
    deploy(url);
    expect(await pendingMigrations(url)).toEqual([]);
    const c = client(url);
    const counts = await tableCounts(c);
    for (const table of ["User", "Arm", "ArmRevision", "Shortlist", "AnalysisRun", "Comment", "CommentRevision", "AuditEvent", "WorkerProcess"]) expect(counts[table]).toBe(0);
    const now = new Date();
    await c.arm.create({ data: { id: "a1", name: "Arm", axes: 3, currentRevision: 1, updatedAt: now } });
    await c.armRevision.create({ data: { id: "r1", armId: "a1", revision: 1, document: "{}", summary: "created" } });
    await expect(c.$executeRaw`UPDATE "ArmRevision" SET "summary" = 'x' WHERE "id" = 'r1'`).rejects.toThrow(/arm revisions are immutable/);
    await expect(c.$executeRaw`DELETE FROM "ArmRevision" WHERE "id" = 'r1'`).rejects.toThrow(/arm revisions are immutable/);
    await c.auditEvent.create({ data: { id: "e1", action: "arm.create", entityType: "arm", entityId: "a1" } });
    await expect(c.$executeRaw`UPDATE "AuditEvent" SET "action" = 'x'`).rejects.toThrow(/append-only/);
  }, 120_000);

  it("keeps every row of a database at the previous migration through the newest one", async () => {
    const names = migrationNames(testProvider);
    const previous = mkdtempSync(path.join(os.tmpdir(), "armsift-mig-dir-"));
    cleanups.push(() => rmSync(previous, { recursive: true, force: true }));
    const source = path.join(ROOT, "prisma", testProvider, "migrations");
    cpSync(path.join(source, "migration_lock.toml"), path.join(previous, "migration_lock.toml"));
    for (const name of names.slice(0, -1)) cpSync(path.join(source, name), path.join(previous, name), { recursive: true });

    const url = emptyDatabase();
    deploy(url, previous);
    expect(await pendingMigrations(url)).toEqual(names.slice(-1));

    // Rows in every table of the previous schema, written with plain SQL (the newest client may
    // name columns the previous schema does not have yet).
    const c = client(url);
    const now = new Date();
    const id = () => randomUUID();
    const user = id(), arm = id(), set = id(), shortlist = id(), run = id(), comment = id(), link = id();
    await c.$executeRaw`INSERT INTO "User" ("id", "email", "name", "role", "passwordHash", "createdAt", "updatedAt") VALUES (${user}, 'ada@example.test', 'Ada', 'admin', 'x', ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "Session" ("id", "userId", "createdAt", "expiresAt") VALUES (${id()}, ${user}, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "Arm" ("id", "name", "axes", "currentRevision", "createdAt", "updatedAt") VALUES (${arm}, 'Test arm', 3, 1, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "ArmRevision" ("id", "armId", "revision", "document", "summary", "authorId", "createdAt") VALUES (${id()}, ${arm}, 1, '{}', 'created', ${user}, ${now})`;
    await c.$executeRaw`INSERT INTO "RequirementSet" ("id", "name", "targets", "paths", "currentRevision", "createdAt", "updatedAt") VALUES (${set}, 'Cell', 1, 0, 1, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "RequirementRevision" ("id", "setId", "revision", "document", "summary", "createdAt") VALUES (${id()}, ${set}, 1, '{}', 'created', ${now})`;
    await c.$executeRaw`INSERT INTO "Shortlist" ("id", "name", "requirementSetId", "requirementRevision", "createdById", "createdAt", "updatedAt") VALUES (${shortlist}, 'Kept', ${set}, 1, ${user}, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "ShortlistArm" ("shortlistId", "armId", "armRevision", "position", "addedAt") VALUES (${shortlist}, ${arm}, 1, 0, ${now})`;
    await c.$executeRaw`INSERT INTO "AnalysisRun" ("id", "shortlistId", "key", "analysisVersion", "status", "progress", "createdAt", "pins", "resultJson") VALUES (${run}, ${shortlist}, 'k', 'v', 'done', 1, ${now}, '{"requirement":{"setId":"s","revision":1},"arms":[]}', '{"version":"v","arms":[]}')`;
    // a run that reused the first one's result (it held a copy of the JSON), and one without a result
    const reuse = id(), queued = id();
    await c.$executeRaw`INSERT INTO "AnalysisRun" ("id", "shortlistId", "key", "analysisVersion", "status", "progress", "createdAt", "pins", "resultJson", "reusedFromId") VALUES (${reuse}, ${shortlist}, 'k', 'v', 'done', 1, ${now}, '{"requirement":{"setId":"s","revision":1},"arms":[]}', '{"version":"v","arms":[]}', ${run})`;
    await c.$executeRaw`INSERT INTO "AnalysisRun" ("id", "shortlistId", "key", "analysisVersion", "status", "progress", "createdAt", "pins") VALUES (${queued}, ${shortlist}, 'k2', 'v', 'queued', 0, ${now}, '{"requirement":{"setId":"s","revision":1},"arms":[]}')`;
    await c.$executeRaw`INSERT INTO "WorkerProcess" ("id", "host", "pid", "concurrency", "startedAt", "lastSeenAt") VALUES ('h:1:x', 'h', 1, 1, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "ShareLink" ("id", "shortlistId", "tokenHash", "access", "createdAt") VALUES (${link}, ${shortlist}, ${id()}, 'view', ${now})`;
    await c.$executeRaw`INSERT INTO "Comment" ("id", "shortlistId", "anchorType", "authorId", "body", "revision", "createdAt", "updatedAt") VALUES (${comment}, ${shortlist}, 'shortlist', ${user}, 'kept', 1, ${now}, ${now})`;
    await c.$executeRaw`INSERT INTO "CommentRevision" ("id", "commentId", "revision", "body", "editorId", "createdAt") VALUES (${comment + ":1"}, ${comment}, 1, 'kept', ${user}, ${now})`;
    await c.$executeRaw`INSERT INTO "CommentMention" ("commentId", "userId") VALUES (${comment}, ${user})`;
    await c.$executeRaw`INSERT INTO "CommentRead" ("userId", "shortlistId", "lastReadAt") VALUES (${user}, ${shortlist}, ${now})`;
    await c.$executeRaw`INSERT INTO "AuditEvent" ("id", "at", "actorId", "action", "entityType", "entityId") VALUES (${id()}, ${now}, ${user}, 'arm.create', 'arm', ${arm})`;
    await c.$executeRaw`INSERT INTO "Setting" ("key", "value", "updatedAt") VALUES ('signUpMode', '"approval"', ${now})`;
    await c.$executeRaw`INSERT INTO "Invitation" ("id", "tokenHash", "role", "createdAt", "expiresAt") VALUES (${id()}, ${id()}, 'viewer', ${now}, ${now})`;
    const before = await tableCounts(c);
    const empty = Object.entries(before).filter(([, n]) => n === 0).map(([t]) => t);
    expect(empty, "every table of the previous schema has a row").toEqual([]);
    await c.$disconnect();

    deploy(url);
    expect(await pendingMigrations(url)).toEqual([]);
    const after = await tableCounts(c);
    for (const [table, n] of Object.entries(before)) expect(after[table], table).toBe(n);
    // The rows read back with the newest client; the new columns have their defaults.
    expect(await c.analysisRun.findUnique({ where: { id: run }, select: { status: true, attempt: true, runner: true } })).toEqual({ status: "done", attempt: 0, runner: null });
    expect((await c.comment.findUnique({ where: { id: comment } }))!.body).toBe("kept");
    // The stored results moved to one shared row per analysis key, whole, and the runs refer to it.
    expect(await c.analysisResult.findMany({ select: { key: true, format: true, head: true, armCount: true } })).toEqual([{ key: "k", format: "whole-json", head: '{"version":"v","arms":[]}', armCount: 0 }]);
    const runs = await c.analysisRun.findMany({ where: { id: { in: [run, reuse, queued] } }, select: { id: true, resultKey: true } });
    expect(Object.fromEntries(runs.map((r) => [r.id, r.resultKey]))).toEqual({ [run]: "k", [reuse]: "k", [queued]: null });
  }, 180_000);

  it("tells that nothing is pending while another process holds the database busy", async () => {
    const url = emptyDatabase();
    deploy(url);
    // SQLite: a writer inside an open write transaction; PostgreSQL: the migration engine's lock held.
    const script = testProvider === "postgres"
      ? `const { Client } = require("pg"); const c = new Client({ connectionString: ${JSON.stringify(url)} });
         c.connect().then(() => c.query("SELECT pg_advisory_lock(72707369)")).then(() => { process.stdout.write("holding\\n"); setInterval(() => {}, 1000); });`
      : `const D = require("better-sqlite3"); const d = new D(${JSON.stringify(url.replace(/^file:/, ""))});
         d.pragma("journal_mode = WAL"); d.exec("BEGIN IMMEDIATE"); d.prepare('UPDATE "Arm" SET "name" = "name"').run();
         process.stdout.write("holding\\n"); setInterval(() => {}, 1000);`;
    const holder = spawn(process.execPath, ["-e", script], { cwd: ROOT, stdio: ["ignore", "pipe", "inherit"] });
    try {
      await new Promise<void>((resolve, reject) => {
        holder.stdout!.once("data", () => resolve());
        holder.once("exit", (code) => reject(new Error(`holder exited with ${code}`)));
      });
      const t0 = Date.now();
      expect(await pendingMigrations(url)).toEqual([]);
      expect(Date.now() - t0).toBeLessThan(3000);
    } finally {
      holder.kill("SIGKILL");
    }
  }, 120_000);
});
