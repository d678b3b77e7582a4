import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";

// The Prisma CLI (through scripts/prisma.mjs) works on one provider at a time: DB_PROVIDER
// ("sqlite" or "postgres", set by the wrapper from DATABASE_URL) picks the schema folder, its
// migrations and the driver adapter. Both folders share prisma/models.prisma.

type SqliteAdapter = Awaited<ReturnType<PrismaBetterSQLite3["connect"]>>;

/**
 * The migration engine replays existing migrations into an in-memory shadow database when it
 * diffs from the migrations folder. The adapter sends raw SQL through better-sqlite3's prepare(),
 * which takes one statement only (error P3006 on multi-statement migrations, triggers included).
 * This factory routes argument-less raw SQL on the shadow connection through executeScript.
 */
class SqliteMigrationAdapter extends PrismaBetterSQLite3 {
  override async connectToShadowDb(): Promise<SqliteAdapter> {
    const adapter = (await super.connectToShadowDb()) as SqliteAdapter;
    const executeRaw = adapter.executeRaw.bind(adapter);
    const queryRaw = adapter.queryRaw.bind(adapter);
    adapter.executeRaw = async (query) => {
      if (query.args.length > 0) return executeRaw(query);
      await adapter.executeScript(query.sql);
      return 0;
    };
    adapter.queryRaw = async (query) => {
      if (query.args.length > 0 || !/;\s*\S/.test(query.sql)) return queryRaw(query);
      await adapter.executeScript(query.sql);
      return { columnNames: [], columnTypes: [], rows: [] };
    };
    return adapter;
  }
}

type PgAdapter = Awaited<ReturnType<PrismaPg["connect"]>>;
type PerformIO = (query: unknown) => Promise<{ fields?: { dataTypeID: number }[] }>;

/**
 * The schema engine reads catalog columns of PostgreSQL's internal types `name` (OID 19) and
 * `"char"` (OID 18), which adapter-pg 6.19.3 cannot map ("Column type 'name' could not be
 * deserialized"). Both are text; report them as `text` (OID 25).
 */
function readInternalTypesAsText(queryable: object): void {
  const target = queryable as { performIO: PerformIO };
  const performIO = target.performIO.bind(queryable);
  target.performIO = async (query) => {
    const result = await performIO(query);
    for (const field of result.fields ?? []) if (field.dataTypeID === 19 || field.dataTypeID === 18) field.dataTypeID = 25;
    return result;
  };
}

/**
 * Fixes the adapter for migrations: internal catalog types as text, on the connection and on each
 * transaction it opens; and a migration file runs as one script (adapter-pg splits it on every `;`,
 * which breaks PL/pgSQL bodies between `$$` and runs the pieces outside a transaction; the simple
 * query protocol runs a multi-statement string as one implicit transaction, so a failing migration
 * rolls back whole).
 */
function forMigrations(adapter: PgAdapter): PgAdapter {
  readInternalTypesAsText(adapter);
  adapter.executeScript = async (script) => {
    try {
      await adapter.underlyingDriver().query(script);
    } catch (err) {
      (adapter as unknown as { onError(e: unknown): never }).onError(err);
    }
  };
  const startTransaction = adapter.startTransaction.bind(adapter);
  adapter.startTransaction = async (isolationLevel) => {
    const tx = await startTransaction(isolationLevel);
    readInternalTypesAsText(tx);
    return tx;
  };
  return adapter;
}

class PgMigrationAdapter extends PrismaPg {
  override async connect(): Promise<PgAdapter> {
    return forMigrations(await super.connect());
  }
  override async connectToShadowDb(): Promise<PgAdapter> {
    return forMigrations(await super.connectToShadowDb());
  }
}

/**
 * Pool settings from the URL as separate fields: adapter-pg builds the shadow database's pool as
 * `{ ...config, database: shadowName }`, and a `connectionString` would override that name (the
 * shadow replay would then run on the real database). A short idle timeout lets the CLI exit as
 * soon as it is done instead of waiting out pg's 10 s default.
 */
export function pgPoolConfig(url: string) {
  const u = new URL(url);
  const sslmode = u.searchParams.get("sslmode");
  return {
    host: decodeURIComponent(u.hostname),
    port: Number(u.port || 5432),
    user: decodeURIComponent(u.username),
    password: decodeURIComponent(u.password),
    database: decodeURIComponent(u.pathname.slice(1)),
    ...(sslmode && sslmode !== "disable" ? { ssl: { rejectUnauthorized: sslmode === "verify-full" } } : {}),
    idleTimeoutMillis: 100,
  };
}

const provider = process.env.DB_PROVIDER === "postgres" ? "postgres" : "sqlite";

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join("prisma", provider),
  // ARMSIFT_MIGRATIONS_DIR: another folder of the same provider's migrations (the migration test
  // applies all but the newest from a copy).
  migrations: { path: process.env.ARMSIFT_MIGRATIONS_DIR ?? path.join("prisma", provider, "migrations") },
  async adapter() {
    if (provider === "postgres") return new PgMigrationAdapter(pgPoolConfig(process.env.DATABASE_URL ?? ""));
    return new SqliteMigrationAdapter({ url: process.env.DATABASE_URL ?? "file:./data/armsift.db" });
  },
});
