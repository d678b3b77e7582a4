import "server-only";
import path from "node:path";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { PrismaClient } from "./generated/client";
import { PrismaClient as PgPrismaClient } from "./generated-pg/client";

// Two providers, one data model (prisma/models.prisma): DATABASE_URL=postgresql://… selects
// PostgreSQL through the pg driver adapter; anything else is the embedded SQLite file. The two
// generated clients have the same models and methods; the SQLite one serves as the type.
//
// Isolation: SQLite runs one writer at a time (transactions begin IMMEDIATE, see below), so every
// transaction is serializable. PostgreSQL's default, Read Committed, would let two transactions
// each read and then write on stale reads (two first sign-ups both becoming admin, two demotions
// leaving no admin), so interactive transactions run at Serializable there, and a transaction
// that loses a serialization conflict (SQLSTATE 40001, Prisma P2034) or a deadlock is run again
// from the start, a few times with a short random pause. Revision saves additionally claim the
// head row with a conditional UPDATE, which is exact at any isolation level: the second of two
// racing saves from one base updates nothing and becomes a 409.

export type Db = PrismaClient;
/** The client handed to a `$transaction` callback. */
export type Tx = Parameters<Parameters<PrismaClient["$transaction"]>[0]>[0];

/** Milliseconds a connection waits for another writer before giving up (SQLite busy_timeout). */
export const BUSY_TIMEOUT_MS = 5000;

export type DbProvider = "sqlite" | "postgres";

/** "postgres" for a postgresql:// or postgres:// URL, else "sqlite". */
function providerOf(url: string): DbProvider {
  return /^postgres(ql)?:\/\//i.test(url) ? "postgres" : "sqlite";
}

/** The provider this process uses (from DATABASE_URL). */
export function dbProvider(env: NodeJS.ProcessEnv = process.env): DbProvider {
  return providerOf(databaseUrl(env));
}

/**
 * Resolves the database URL: DATABASE_URL if set, else `file:` + ARMSIFT_DB
 * (default ./data/armsift.db, relative to the current directory).
 */
export function databaseUrl(env: NodeJS.ProcessEnv = process.env): string {
  if (env.DATABASE_URL) return env.DATABASE_URL;
  return `file:${env.ARMSIFT_DB ?? path.join(".", "data", "armsift.db")}`;
}

/** A promise-chain mutex: `run` executes callbacks one at a time, in call order. */
function createLock() {
  let tail: Promise<unknown> = Promise.resolve();
  return {
    acquire(): Promise<() => void> {
      let release!: () => void;
      const held = new Promise<void>((r) => (release = r));
      const ready = tail.then(() => release);
      tail = tail.then(() => held);
      return ready;
    },
  };
}

/**
 * Opens every connection with WAL journaling, a busy timeout and foreign keys enforced.
 *
 * The adapter has one connection. An interactive transaction holds it from BEGIN to COMMIT, but
 * plain queries would otherwise run on the same connection in the middle of it and be rolled
 * back with it. Here a statement outside a transaction waits until no transaction is open.
 */
class ArmsiftSqliteAdapter extends PrismaBetterSQLite3 {
  override async connect(): ReturnType<PrismaBetterSQLite3["connect"]> {
    const adapter = await super.connect();
    await adapter.executeScript(
      `PRAGMA journal_mode = WAL; PRAGMA busy_timeout = ${BUSY_TIMEOUT_MS}; PRAGMA foreign_keys = ON; PRAGMA synchronous = NORMAL;`,
    );
    // Transactions start with BEGIN IMMEDIATE instead of the adapter's deferred BEGIN: under WAL a
    // deferred transaction that reads and then writes fails at once with SQLITE_BUSY (no busy
    // timeout applies) when another process, such as the analysis runner, committed in between;
    // taking the write lock up front makes it wait for the lock instead.
    const sqlite = (adapter as unknown as { client?: { prepare(sql: string): unknown } }).client;
    if (sqlite && typeof sqlite.prepare === "function") {
      const prepare = sqlite.prepare.bind(sqlite);
      sqlite.prepare = (sql: string) => prepare(sql === "BEGIN" ? "BEGIN IMMEDIATE" : sql);
    }
    const lock = createLock();
    const startTransaction = adapter.startTransaction.bind(adapter);
    adapter.startTransaction = async (isolationLevel) => {
      const release = await lock.acquire();
      try {
        const tx = await startTransaction(isolationLevel);
        const commit = tx.commit.bind(tx);
        const rollback = tx.rollback.bind(tx);
        tx.commit = () => commit().finally(release);
        tx.rollback = () => rollback().finally(release);
        return tx;
      } catch (err) {
        release();
        throw err;
      }
    };
    const queryRaw = adapter.queryRaw.bind(adapter);
    const executeRaw = adapter.executeRaw.bind(adapter);
    adapter.queryRaw = async (query) => {
      const release = await lock.acquire();
      try {
        return await queryRaw(query);
      } finally {
        release();
      }
    };
    adapter.executeRaw = async (query) => {
      const release = await lock.acquire();
      try {
        return await executeRaw(query);
      } finally {
        release();
      }
    };
    return adapter;
  }
}

/** Attempts of a PostgreSQL transaction that keeps losing serialization conflicts. */
const SERIALIZATION_ATTEMPTS = 8;

type AdapterCause = { originalCode?: unknown; kind?: unknown };

/**
 * A lost serialization conflict or a deadlock: Prisma's P2034, or (when it surfaces at COMMIT)
 * the driver adapter's own error with the SQLSTATE as its cause.
 */
export const isRetryable = (err: unknown): boolean => {
  const e = err as { code?: unknown; cause?: AdapterCause; meta?: { driverAdapterError?: { cause?: AdapterCause } } } | null;
  const cause = e?.meta?.driverAdapterError?.cause ?? e?.cause;
  return e?.code === "P2034" || cause?.kind === "TransactionWriteConflict" || cause?.originalCode === "40001" || cause?.originalCode === "40P01";
};

/** Connections per process to PostgreSQL (pg's default); count them against max_connections. */
const PG_POOL_SIZE = 10;

/**
 * Returns a transaction's connection to the pool when its COMMIT (or ROLLBACK) fails.
 *
 * The client sends COMMIT as a query on the transaction and only then tells the adapter to
 * release the connection; when COMMIT itself fails (a serialization conflict found at commit,
 * SQLSTATE 40001) that second step never comes, so each such failure kept one pooled connection
 * checked out for good: after PG_POOL_SIZE of them every query waited for a connection, and
 * closing the client waited forever. PostgreSQL has already ended the transaction when COMMIT
 * fails, so the connection is clean and goes back to the pool; the error still reaches the
 * caller (and the retry below).
 */
class ArmsiftPgAdapter extends PrismaPg {
  override async connect(): ReturnType<PrismaPg["connect"]> {
    const adapter = await super.connect();
    const startTransaction = adapter.startTransaction.bind(adapter);
    adapter.startTransaction = async (isolationLevel) => {
      const tx = await startTransaction(isolationLevel);
      let released = false;
      const releaseOnce = (release: () => Promise<void>) => async () => {
        if (released) return;
        released = true;
        await release();
      };
      tx.commit = releaseOnce(tx.commit.bind(tx));
      tx.rollback = releaseOnce(tx.rollback.bind(tx));
      const executeRaw = tx.executeRaw.bind(tx);
      tx.executeRaw = async (query) => {
        try {
          return await executeRaw(query);
        } catch (err) {
          if (query.sql === "COMMIT" || query.sql === "ROLLBACK") await tx.rollback();
          throw err;
        }
      };
      return tx;
    };
    return adapter;
  }
}

function createPgDb(url: string): Db {
  const adapter = new ArmsiftPgAdapter({ connectionString: url, max: PG_POOL_SIZE });
  const client = new PgPrismaClient({
    adapter,
    transactionOptions: { maxWait: 10_000, timeout: 20_000, isolationLevel: "Serializable" },
  }) as unknown as Db;
  const transaction = client.$transaction.bind(client) as (arg: unknown, opts?: unknown) => Promise<unknown>;
  const retrying = async (arg: unknown, opts?: unknown): Promise<unknown> => {
    // A batch (array of queries) runs once; a callback is run again after a lost conflict.
    if (typeof arg !== "function") return transaction(arg, opts);
    for (let attempt = 1; ; attempt++) {
      try {
        return await transaction(arg, opts);
      } catch (err) {
        if (attempt >= SERIALIZATION_ATTEMPTS || !isRetryable(err)) throw err;
        await new Promise((r) => setTimeout(r, Math.random() * 10 * 2 ** attempt));
      }
    }
  };
  (client as unknown as { $transaction: typeof retrying }).$transaction = retrying;
  return client;
}

/**
 * Creates a client for a database URL: `file:<path>` (SQLite) or `postgresql://…`.
 * The app uses the shared one from `db()`.
 */
export function createDb(url: string = databaseUrl()): Db {
  if (providerOf(url) === "postgres") return createPgDb(url);
  const adapter = new ArmsiftSqliteAdapter({ url, timeout: BUSY_TIMEOUT_MS });
  // Interactive transactions queue on the adapter's single connection: allow for waiting.
  return new PrismaClient({ adapter, transactionOptions: { maxWait: 10_000, timeout: 20_000 } });
}

const globalCache = globalThis as unknown as { __armsiftDb?: Db };
let instance: Db | undefined;

/**
 * The one client of this process, created on first use from DATABASE_URL / ARMSIFT_DB.
 * In development it is cached on globalThis so hot reloads do not open new connections.
 */
export function db(): Db {
  if (process.env.NODE_ENV === "development") {
    globalCache.__armsiftDb ??= createDb();
    return globalCache.__armsiftDb;
  }
  instance ??= createDb();
  return instance;
}

/** Round trip to the database (health check); throws when it does not answer. */
export async function pingDatabase(): Promise<void> {
  await db().$queryRawUnsafe("SELECT 1");
}

/** Closes this process's client (scripts call it before they exit). */
export async function disconnectDb(): Promise<void> {
  await db().$disconnect();
}
