/**
 * The one interface pages and route handlers use for analysis runs; they do not know which runner
 * analyses them:
 * - "queue" (PostgreSQL): the run's job goes on the durable queue in the transaction that stores
 *   the run; `npm run worker` processes, anywhere, analyse it. The web server only enqueues and reads.
 * - "local" (SQLite, the embedded default): the web server's bounded runner analyses it in a
 *   worker thread (lib/jobs/local-runner.ts).
 * ARMSIFT_RUNNER=local|queue overrides the choice (queue needs PostgreSQL).
 */
import type PgBoss from "pg-boss";
import {
  pingDatabase, databaseUrl, dbProvider, cancelRun as cancelRunRow, countRunsByStatus, createShortlist, repinShortlist, requestAnalysisRun, type EnqueueInTx, type Pins, type RunInfo, type RunStatus, listLiveWorkers, type WorkerInfo,
} from "@/lib/db";
import type { CreateShortlistInput } from "@/shared/schemas/shortlists";
import { LocalRunner } from "./local-runner";
import { createBoss, enqueueRun, queueDepth, queueSettings, startQueue, type QueueDepth } from "./queue";

type RunnerKind = "local" | "queue";

/** The runner of this process: ARMSIFT_RUNNER, else "queue" on PostgreSQL and "local" on SQLite. */
function runnerKind(env: NodeJS.ProcessEnv = process.env): RunnerKind {
  if (env.ARMSIFT_RUNNER === "local") return "local";
  if (env.ARMSIFT_RUNNER === "queue") {
    if (dbProvider(env) !== "postgres") throw new Error("ARMSIFT_RUNNER=queue needs DATABASE_URL=postgresql://…");
    return "queue";
  }
  return dbProvider(env) === "postgres" ? "queue" : "local";
}

interface State {
  local?: LocalRunner;
  queue?: { url: string; boss: PgBoss; ready: Promise<void> };
}
// One state per process (cached on globalThis so development reloads do not start a second runner).
const state = ((globalThis as unknown as { __armsiftRuns?: State }).__armsiftRuns ??= {});

/** The web server's own runner (created on first use). */
function localRunner(): LocalRunner {
  state.local ??= new LocalRunner();
  return state.local;
}

/** The queue, started on first use (pg-boss creates its schema and the analysis queue if missing). */
async function queue(): Promise<PgBoss> {
  const url = databaseUrl();
  if (!state.queue || state.queue.url !== url) {
    const boss = createBoss(url, { supervise: false, max: 3 });
    boss.on("error", (err: Error) => console.error(`queue: ${err.message}`));
    const ready = startQueue(boss, queueSettings());
    state.queue = { url, boss, ready };
    ready.catch(() => {
      if (state.queue?.boss === boss) state.queue = undefined;
    });
  }
  await state.queue.ready;
  return state.queue.boss;
}

/** The hook that puts a new queued run on the runner, inside its transaction (queue) or not (local). */
async function enqueueHook(): Promise<EnqueueInTx | undefined> {
  if (runnerKind() !== "queue") return undefined;
  const boss = await queue();
  return (tx, runId) => enqueueRun(boss, tx, runId);
}

function started(r: { run: RunInfo; needsStart: boolean }): void {
  if (r.needsStart && runnerKind() === "local") localRunner().submit(r.run.id);
}

/** Asks for a run of the shortlist's current pins (a cached result, the unfinished run, or a new queued one). */
export async function requestRun(shortlistId: string): Promise<{ run: RunInfo; cached: boolean }> {
  const r = await requestAnalysisRun(shortlistId, { enqueue: await enqueueHook() });
  started(r);
  return { run: r.run, cached: r.cached };
}

/** Creates a shortlist and its first run in one transaction. */
export async function createShortlistWithRun(userId: string | null, body: CreateShortlistInput): Promise<{ id: string; pins: Pins; run: RunInfo; cached: boolean }> {
  const r = await createShortlist(userId, body, { enqueue: await enqueueHook() });
  started(r);
  return { id: r.id, pins: r.pins, run: r.run, cached: r.cached };
}

/** Moves the pins to the current revisions and asks for a run of them. */
export async function repinAndRun(userId: string | null, shortlistId: string): Promise<{ pins: Pins; run: RunInfo; cached: boolean }> {
  const pins = await repinShortlist(userId, shortlistId);
  return { pins, ...(await requestRun(shortlistId)) };
}

/** Cancels a queued or running run; its runner stops it at the next progress report. */
export async function cancelRun(userId: string | null, runId: string): Promise<RunInfo | null> {
  return cancelRunRow(userId, runId);
}

type RunnerStatus =
  | { kind: "local"; concurrency: number; running: number; waiting: number; runs: Record<RunStatus, number> }
  | { kind: "queue"; depth: QueueDepth; workers: WorkerInfo[]; runs: Record<RunStatus, number> };

/** What the health check and the admin page show about the runner. */
async function runnerStatus(): Promise<RunnerStatus> {
  const runs = await countRunsByStatus();
  if (runnerKind() === "local") {
    const r = localRunner();
    return { kind: "local", concurrency: r.concurrency, running: r.running, waiting: r.queued, runs };
  }
  const [depth, workers] = await Promise.all([queue().then(queueDepth), listLiveWorkers()]);
  return { kind: "queue", depth, workers, runs };
}

/**
 * Web server start-up. Local runner: runs a stopped server left running are marked failed and
 * queued ones are taken up again. Queue: the queue exists (workers own the runs).
 */
export async function startUp(log: (line: string) => void = console.log): Promise<void> {
  if (runnerKind() === "local") {
    const { failed, resumed } = await localRunner().recover();
    if (failed || resumed) log(`analysis runs: ${failed} left running by a stopped server marked failed, ${resumed} queued taken up again`);
    return;
  }
  await queue();
  log("analysis runs go to the queue; start `npm run worker` on each worker machine");
}

export interface HealthReport {
  ok: boolean;
  database: { provider: "sqlite" | "postgres"; ok: boolean; latencyMs: number | null; error?: string };
  runner:
    | { kind: "local"; concurrency: number; running: number; waiting: number }
    | { kind: "queue"; depth: QueueDepth; liveWorkers: number; workers?: WorkerInfo[] }
    | { kind: RunnerKind; error: string };
  runs: Record<RunStatus, number> | null;
}

/**
 * The health check's report: the database (does it answer, how fast), the runner (the local
 * runner's load, or the queue depth and the live workers) and the runs by state. The list of
 * workers (host names, process ids) only with `detail` (administrators).
 */
export async function healthReport(opts: { detail?: boolean } = {}): Promise<HealthReport> {
  const provider = dbProvider();
  const t0 = performance.now();
  const database: HealthReport["database"] = await pingDatabase().then(
    () => ({ provider, ok: true, latencyMs: Math.round((performance.now() - t0) * 10) / 10 }),
    (err: unknown) => ({ provider, ok: false, latencyMs: null, error: err instanceof Error ? err.message.split("\n")[0] : String(err) }),
  );
  if (!database.ok) return { ok: false, database, runner: { kind: runnerKind(), error: "the database does not answer" }, runs: null };
  try {
    const status = await runnerStatus();
    const runner: HealthReport["runner"] = status.kind === "local"
      ? { kind: "local", concurrency: status.concurrency, running: status.running, waiting: status.waiting }
      : { kind: "queue", depth: status.depth, liveWorkers: status.workers.length, ...(opts.detail ? { workers: status.workers } : {}) };
    return { ok: true, database, runner, runs: status.runs };
  } catch (err) {
    return { ok: false, database, runner: { kind: runnerKind(), error: err instanceof Error ? err.message.split("\n")[0] : String(err) }, runs: null };
  }
}
