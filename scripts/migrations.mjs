// Which migrations a database still needs, read without the migration engine: `npm start` skips
// `prisma migrate deploy` when nothing is pending, so a server starts even while another process
// holds the database busy (the engine's lock would otherwise time out).
import { existsSync, readdirSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const require = createRequire(import.meta.url);

/** "postgres" for a postgresql:// or postgres:// URL, else "sqlite". */
export const providerOf = (url) => (/^postgres(ql)?:\/\//i.test(url ?? "") ? "postgres" : "sqlite");

/** Migration folder names of a provider, in order. */
export function migrationNames(provider) {
  const dir = path.join(root, "prisma", provider, "migrations");
  return readdirSync(dir, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort();
}

const APPLIED = `SELECT migration_name FROM "_prisma_migrations" WHERE finished_at IS NOT NULL AND rolled_back_at IS NULL`;

/** Names of the migrations recorded as applied (empty for a new database). */
export async function appliedMigrations(url) {
  if (providerOf(url) === "postgres") {
    const { Client } = require("pg");
    const client = new Client({ connectionString: url, connectionTimeoutMillis: 10_000 });
    await client.connect();
    try {
      const r = await client.query(APPLIED);
      return r.rows.map((x) => x.migration_name);
    } catch (err) {
      if (err.code === "42P01") return []; // no migrations table yet
      throw err;
    } finally {
      await client.end();
    }
  }
  const file = url.replace(/^file:/, "");
  if (!existsSync(file)) return [];
  const Database = require("better-sqlite3");
  const conn = new Database(file, { readonly: true, timeout: 5000 });
  try {
    const table = conn.prepare(`SELECT name FROM sqlite_master WHERE type = 'table' AND name = '_prisma_migrations'`).get();
    return table ? conn.prepare(APPLIED).all().map((x) => x.migration_name) : [];
  } finally {
    conn.close();
  }
}

/** Migrations of the provider that the database has not applied yet, in order. */
export async function pendingMigrations(url) {
  const applied = new Set(await appliedMigrations(url));
  return migrationNames(providerOf(url)).filter((name) => !applied.has(name));
}

/** Rows in the Arm table (the demo is seeded into an empty catalog). */
export async function armCount(url) {
  if (providerOf(url) === "postgres") {
    const { Client } = require("pg");
    const client = new Client({ connectionString: url });
    await client.connect();
    try {
      return Number((await client.query('SELECT count(*)::int AS n FROM "Arm"')).rows[0].n);
    } finally {
      await client.end();
    }
  }
  const Database = require("better-sqlite3");
  const conn = new Database(url.replace(/^file:/, ""), { readonly: true, timeout: 5000 });
  try {
    return Number(conn.prepare('SELECT count(*) AS n FROM "Arm"').get().n);
  } finally {
    conn.close();
  }
}
