// The built production server on a temporary database, for load and fault tests: the test
// prepares the data through lib/db in its own process, then starts the production server (scripts/serve.mjs) as a detached
// process group it can kill with any signal and start again on the same database file.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { closeSync, existsSync, mkdtempSync, openSync, readFileSync, rmSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { randomBytes } from "node:crypto";
import { ensureBuild } from "../browser/harness";

const ROOT = path.resolve(__dirname, "..", "..");

export interface TempDb {
  dir: string;
  file: string;
  cleanup(): void;
}

/** A migrated temporary database; ARMSIFT_DB/DATABASE_URL of this process point at it. */
export function tempDatabase(): TempDb {
  const dir = mkdtempSync(path.join(os.tmpdir(), "armsift-load-"));
  const file = path.join(dir, "armsift.db");
  const env = { ...process.env, ARMSIFT_DB: file, DATABASE_URL: `file:${file}` };
  const r = spawnSync(process.execPath, [path.join(ROOT, "scripts", "prisma.mjs"), "migrate", "deploy"], { cwd: ROOT, env, encoding: "utf8" });
  if (r.status !== 0) throw new Error(`migrate deploy failed:\n${r.stdout}\n${r.stderr}`);
  process.env.ARMSIFT_DB = file;
  process.env.DATABASE_URL = `file:${file}`;
  return { dir, file, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

/** A folder for server logs only (for a server on a database given by URL). */
export function logFolder(): TempDb {
  const dir = mkdtempSync(path.join(os.tmpdir(), "armsift-server-"));
  return { dir, file: "", cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const a = srv.address();
      const port = typeof a === "object" && a ? a.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export interface Server {
  baseUrl: string;
  pid: number;
  log(): string;
  /** Sends a signal to the server's whole process group and waits for it to exit. */
  kill(signal: NodeJS.Signals): Promise<void>;
}

/**
 * Starts the built server on the database file (or on `databaseUrl`, e.g. a PostgreSQL database,
 * with extra `env`); resolves when /api/health answers.
 */
export async function startServer(db: TempDb, opts: { databaseUrl?: string; env?: Record<string, string> } = {}): Promise<Server> {
  ensureBuild();
  const port = await freePort();
  const logPath = path.join(db.dir, `server-${port}-${randomBytes(3).toString("hex")}.log`);
  const fd = openSync(logPath, "a");
  const child: ChildProcess = spawn(process.execPath, [path.join(ROOT, "scripts", "serve.mjs")], {
    cwd: ROOT,
    env: {
      ...process.env,
      ...(opts.databaseUrl ? { DATABASE_URL: opts.databaseUrl } : { ARMSIFT_DB: db.file, DATABASE_URL: `file:${db.file}` }),
      ...opts.env,
      PORT: String(port),
      NEXT_TELEMETRY_DISABLED: "1",
      HOST: "127.0.0.1",
    },
    detached: true,
    stdio: ["ignore", fd, fd],
  });
  closeSync(fd);
  const log = () => (existsSync(logPath) ? readFileSync(logPath, "utf8") : "");
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  const baseUrl = `http://127.0.0.1:${port}`;
  const kill = async (signal: NodeJS.Signals) => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    try {
      process.kill(-child.pid!, signal);
    } catch {
      return;
    }
    await exited;
  };
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}:\n${log()}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) {
      await kill("SIGKILL");
      throw new Error(`server did not answer within 60 s:\n${log()}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return { baseUrl, pid: child.pid!, log, kill };
}
