// PostgreSQL for tests: a template database migrated once with the real `prisma migrate deploy`
// (named after a hash of the migrations, so it is reused until they change), and a fresh copy of
// it per test file (CREATE DATABASE … TEMPLATE, a file copy inside the server: about 0.1 s).
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

const root = path.resolve(__dirname, "..", "..");

/**
 * The server and role the tests use: ARMSIFT_TEST_PG_URL, else a postgresql:// DATABASE_URL,
 * else the local server with the `postgres` role (these machines trust local connections).
 * The role needs CREATEDB. Databases are created and dropped from its `postgres` database.
 */
export function adminUrl(env: NodeJS.ProcessEnv = process.env): string {
  return urlFor("postgres", serverUrl(env));
}

/** The URL the settings above name (any database on the server). */
function serverUrl(env: NodeJS.ProcessEnv): string {
  if (env.ARMSIFT_TEST_PG_URL) return env.ARMSIFT_TEST_PG_URL;
  if (/^postgres(ql)?:\/\//.test(env.DATABASE_URL ?? "")) return env.DATABASE_URL!;
  return "postgresql://postgres@127.0.0.1:5432/postgres";
}

/** The same server and role, another database. */
export function urlFor(database: string, base: string = serverUrl(process.env)): string {
  const u = new URL(base);
  u.pathname = `/${database}`;
  return u.toString();
}

/** True when a TCP connection to the test server opens within the timeout. */
export function reachable(url: string = adminUrl(), timeoutMs = 1000): Promise<boolean> {
  const u = new URL(url);
  return new Promise((resolve) => {
    const socket = net.connect({ host: u.hostname, port: Number(u.port || 5432) });
    const done = (ok: boolean) => {
      socket.destroy();
      resolve(ok);
    };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once("connect", () => done(true));
    socket.once("error", () => done(false));
  });
}

const short = (text: string) => createHash("sha256").update(text).digest("hex").slice(0, 8);

/** Hash of the PostgreSQL migrations: the template is rebuilt when any of them changes. */
export function migrationsHash(): string {
  const dir = path.join(root, "prisma", "postgres", "migrations");
  const h = createHash("sha256");
  for (const name of readdirSync(dir).sort()) {
    if (name.endsWith(".toml")) continue;
    h.update(name);
    h.update(readFileSync(path.join(dir, name, "migration.sql")));
  }
  return h.digest("hex").slice(0, 8);
}

/** Templates of this checkout and role share a prefix (several checkouts may share one server). */
const templatePrefix = (): string => `armsift_tmpl_${short(`${root}\n${new URL(adminUrl()).username}`)}_`;
export const templateName = (): string => templatePrefix() + migrationsHash();

/** Runs SQL statements on the admin connection from a child process (keeps helpers synchronous). */
export function adminSql(statements: string[], url: string = adminUrl()): string {
  const script = `const { Client } = require("pg");
    (async () => { const c = new Client({ connectionString: process.env.URL }); await c.connect();
      let out = []; try { for (const s of JSON.parse(process.env.SQL)) { const r = await c.query(s); out.push(r.rows); } }
      finally { await c.end(); } process.stdout.write(JSON.stringify(out)); })().catch((e) => { console.error(e.message); process.exit(1); });`;
  return execFileSync(process.execPath, ["-e", script], { cwd: root, env: { ...process.env, URL: url, SQL: JSON.stringify(statements) }, encoding: "utf8" });
}

/** Applies the migrations to a database with the real `prisma migrate deploy`. */
export function migrate(url: string): void {
  execFileSync(process.execPath, [path.join(root, "scripts", "prisma.mjs"), "migrate", "deploy"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: url },
    stdio: "pipe",
  });
}

/** Creates the migrated template unless it exists (vitest globalSetup of the PostgreSQL project). */
export function ensureTemplate(): string {
  const name = templateName();
  const found = JSON.parse(adminSql([`SELECT datname FROM pg_database WHERE datname LIKE '${templatePrefix()}%'`]))[0] as { datname: string }[];
  if (found.some((d) => d.datname === name)) return name;
  // Templates of older migrations of this checkout are dropped; a half-built one is rebuilt.
  for (const { datname } of found) {
    adminSql([`ALTER DATABASE ${datname} WITH IS_TEMPLATE false`, `DROP DATABASE IF EXISTS ${datname} WITH (FORCE)`]);
  }
  const building = `${name}_building`;
  adminSql([`DROP DATABASE IF EXISTS ${building} WITH (FORCE)`, `CREATE DATABASE ${building}`]);
  migrate(urlFor(building));
  adminSql([`ALTER DATABASE ${building} RENAME TO ${name}`, `ALTER DATABASE ${name} WITH IS_TEMPLATE true`]);
  return name;
}

/** A fresh migrated database copied from the template. */
export function createDatabase(prefix = "armsift_t"): { name: string; url: string; drop(): void } {
  const name = `${prefix}_${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
  adminSql([`CREATE DATABASE ${name} TEMPLATE ${templateName()}`]);
  return { name, url: urlFor(name), drop: () => void adminSql([`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`]) };
}
