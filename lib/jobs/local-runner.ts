/**
 * The web server's own runner (the embedded SQLite set-up): analyses run in worker threads of the
 * server process, at most `concurrency` at once (ARMSIFT_ANALYSIS_CONCURRENCY, default: cores − 1,
 * at least 1); the rest wait in order of arrival, and the page shows their place in the queue.
 * Threads die with the server, so no analysis outlives it: at the next start the runs it had
 * running are marked failed and the ones still queued are taken up again.
 */
import os from "node:os";
import { failRunsOfRunner, LOCAL_RUNNER_PREFIX, listQueuedRunIds, listRunners } from "@/lib/db";
import { executeRun, type RunOutcome } from "./analysis-runner";

/** Analyses at once: ARMSIFT_ANALYSIS_CONCURRENCY, else cores − 1, at least 1. */
export function localConcurrency(env: Record<string, string | undefined> = process.env, cores: number = os.availableParallelism?.() ?? os.cpus().length): number {
  const n = Number(env.ARMSIFT_ANALYSIS_CONCURRENCY);
  if (Number.isInteger(n) && n >= 1) return n;
  return Math.max(1, cores - 1);
}

/** This process's runner name: "local:<host>:<pid>". */
export const localRunnerName = (pid: number = process.pid, host: string = os.hostname()): string => `${LOCAL_RUNNER_PREFIX}${host}:${pid}`;

/** Whether a process with this id exists on this machine. */
function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

export class LocalRunner {
  readonly name: string;
  readonly concurrency: number;
  private readonly waiting: string[] = [];
  private readonly active = new Set<string>();
  private idle: Array<() => void> = [];

  constructor(opts: { concurrency?: number; name?: string } = {}) {
    this.concurrency = opts.concurrency ?? localConcurrency();
    this.name = opts.name ?? localRunnerName();
  }

  /** Adds a queued run (after the transaction that stored it committed). */
  submit(runId: string): void {
    if (this.active.has(runId) || this.waiting.includes(runId)) return;
    this.waiting.push(runId);
    this.pump();
  }

  get running(): number {
    return this.active.size;
  }

  get queued(): number {
    return this.waiting.length;
  }

  /** Resolves when nothing is running or waiting (tests, shutdown). */
  drained(): Promise<void> {
    if (this.active.size === 0 && this.waiting.length === 0) return Promise.resolve();
    return new Promise((resolve) => this.idle.push(resolve));
  }

  private pump(): void {
    while (this.active.size < this.concurrency && this.waiting.length > 0) {
      const runId = this.waiting.shift()!;
      this.active.add(runId);
      void executeRun(runId, { runner: this.name })
        .catch((): RunOutcome => "failed")
        .finally(() => {
          this.active.delete(runId);
          this.pump();
          if (this.active.size === 0 && this.waiting.length === 0) {
            const waiters = this.idle;
            this.idle = [];
            for (const w of waiters) w();
          }
        });
    }
  }

  /**
   * Start-up: runs left "running" by a web server process that is gone (this machine's, by its
   * process id) are marked failed with the reason; queued runs are taken up again, oldest first.
   */
  async recover(opts: { alive?: (pid: number) => boolean; host?: string } = {}): Promise<{ failed: number; resumed: number }> {
    const alive = opts.alive ?? processAlive;
    const host = opts.host ?? os.hostname();
    let failed = 0;
    for (const runner of await listRunners(LOCAL_RUNNER_PREFIX)) {
      const [runnerHost, pidText] = runner.slice(LOCAL_RUNNER_PREFIX.length).split(":");
      const pid = Number(pidText);
      if (runner === this.name || runnerHost !== host || !Number.isInteger(pid)) continue;
      if (!alive(pid)) {
        failed += await failRunsOfRunner(runner, "the server stopped while this analysis was running; start it again");
      }
    }
    const queued = await listQueuedRunIds();
    for (const id of queued) this.submit(id);
    return { failed, resumed: queued.length };
  }
}
