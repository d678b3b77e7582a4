import "server-only";
import path from "node:path";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaClient } from "./generated/client";

export type Db = PrismaClient;
/** The client handed to a `$transaction` callback. */
export type Tx = Parameters<Parameters<PrismaClient["$transaction"]>[0]>[0];

/** Milliseconds a connection waits for another writer before giving up (SQLite busy_timeout). */
export const BUSY_TIMEOUT_MS = 5000;

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

/** Creates a client for the given SQLite URL (`file:<path>`). The app uses the shared one from `db()`. */
export function createDb(url: string = databaseUrl()): Db {
  const adapter = new ArmsiftSqliteAdapter({ url, timeout: BUSY_TIMEOUT_MS });
  // Interactive transactions queue on the adapter's single connection: allow for waiting.
  return new PrismaClient({ adapter, transactionOptions: { maxWait: 10_000, timeout: 20_000 } });
}

const globalCache = globalThis as unknown as { __armsiftDb?: Db };
let instance: Db | undefined;

/**
 * The one client of this process, created on first use from ARMSIFT_DB / DATABASE_URL.
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

/** Closes this process's client (scripts call it before they exit). */
export async function disconnectDb(): Promise<void> {
  await db().$disconnect();
}
