// Real worker processes for the queue tests: `node dist/jobs/worker.mjs` (the compiled worker of
// `npm run worker`) on the test database, each in its own process group so a test can kill -9 it.
// Every process started here is killed when the test file ends, passed or not.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";

const ROOT = path.resolve(__dirname, "..", "..");

export interface WorkerProcess {
  name: string;
  pid: number;
  /** The worker id it registered ("host:pid:random"), once it logged it. */
  id(): string | null;
  log(): string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  kill(signal: NodeJS.Signals): Promise<void>;
}

const started = new Set<ChildProcess>();
const killAll = () => {
  for (const child of started) {
    try {
      if (child.pid && child.exitCode === null && child.signalCode === null) process.kill(-child.pid, "SIGKILL");
    } catch {
      // already gone
    }
  }
};
process.once("exit", killAll);

/** Kills (SIGKILL) every worker still running; call in afterEach/afterAll. */
export function killWorkers(): void {
  killAll();
  started.clear();
}

/** Fast settings for tests: short heartbeat, polling and maintenance periods. */
export const FAST = {
  ARMSIFT_WORKER_CONCURRENCY: "1",
  ARMSIFT_WORKER_HEARTBEAT_SECONDS: "1",
  ARMSIFT_WORKER_POLL_SECONDS: "0.5",
  ARMSIFT_QUEUE_MAINTENANCE_SECONDS: "1",
  ARMSIFT_JOB_RETRY_DELAY_SECONDS: "0",
};

export function startWorkerProcess(name: string, databaseUrl: string, env: Record<string, string> = {}): WorkerProcess {
  let out = "";
  const child = spawn(process.execPath, [path.join(ROOT, "dist", "jobs", "worker.mjs")], {
    cwd: ROOT,
    env: { ...process.env, ...FAST, ...env, DATABASE_URL: databaseUrl, NODE_ENV: "production" },
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
  });
  started.add(child);
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once("exit", (code, signal) => resolve({ code, signal })));
  return {
    name,
    pid: child.pid!,
    id: () => /worker (\S+): \d+ at a time/.exec(out)?.[1] ?? null,
    log: () => out,
    exited,
    async kill(signal) {
      if (child.exitCode !== null || child.signalCode !== null) return;
      process.kill(-child.pid!, signal);
      await exited;
    },
  };
}

/** Polls until `check` returns a value other than undefined, or fails after the timeout with `what`. */
export async function waitFor<T>(what: string, check: () => Promise<T | undefined>, timeoutMs: number, everyMs = 200): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v !== undefined) return v;
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
