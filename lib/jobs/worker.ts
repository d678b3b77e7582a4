/**
 * A queue worker (`npm run worker`, PostgreSQL only): takes analysis jobs from the queue and runs
 * each in a worker thread, `concurrency` at a time. Any number of workers, on any machines that
 * reach the database, share the queue; the web server only enqueues and reads.
 *
 * - Heartbeat: every few seconds the worker stamps its row (lib/db/workers.ts) with the runs it has.
 *   A worker that finds another one silent for longer than the silence window fails that worker's
 *   jobs back into the queue at once (without waiting for the job expiry), and another worker takes
 *   the run over as its next attempt.
 * - Retries: a failed attempt goes back to the queue until its retries are used up; then the run
 *   and the job end failed, with the reason.
 * - Stopping (SIGINT/SIGTERM): the worker takes no new jobs, stops its analyses, puts their runs
 *   back in the queue and leaves.
 */
import os from "node:os";
import { randomBytes } from "node:crypto";
import type PgBoss from "pg-boss";
import {
  failRun, getRun, listUnfinishedRunIds, heartbeatWorker, registerWorker, runningRunsOf, stopWorker, takeSilentWorkers, WORKER_SILENCE_MS,
} from "@/lib/db";
import { executeRun } from "./analysis-runner";
import { ANALYSIS_QUEUE, createBoss, endedJobs, queueSettings, startQueue } from "./queue";

interface WorkerOptions {
  url: string;
  /** Analyses at once in this process (default: cores − 1, at least 1). */
  concurrency?: number;
  /** Heartbeat period (ms). */
  heartbeatMs?: number;
  /** A worker silent this long is taken as gone (ms). */
  silenceMs?: number;
  /** pg-boss maintenance period (s): expiry of jobs whose worker went silent. */
  maintenanceIntervalSeconds?: number;
  /** Queue polling period of each of the `concurrency` loops (s, at least 0.5). */
  pollingIntervalSeconds?: number;
  log?: (line: string) => void;
}

interface RunningWorker {
  id: string;
  /** Stops taking jobs, puts the runs in progress back in the queue, and closes. */
  stop(reason?: string): Promise<void>;
}

const envNumber = (v: string | undefined): number | undefined => (v !== undefined && v !== "" && Number.isFinite(Number(v)) ? Number(v) : undefined);

/** Worker options from the environment (ARMSIFT_WORKER_CONCURRENCY, ARMSIFT_WORKER_SILENCE_SECONDS, …). */
export function workerOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): WorkerOptions {
  const url = env.DATABASE_URL ?? "";
  if (!/^postgres(ql)?:\/\//.test(url)) {
    throw new Error("npm run worker needs DATABASE_URL=postgresql://… (the queue lives in PostgreSQL; with SQLite the web server runs analyses itself)");
  }
  const silence = envNumber(env.ARMSIFT_WORKER_SILENCE_SECONDS);
  const heartbeat = envNumber(env.ARMSIFT_WORKER_HEARTBEAT_SECONDS);
  return {
    url,
    concurrency: envNumber(env.ARMSIFT_WORKER_CONCURRENCY),
    silenceMs: silence !== undefined ? silence * 1000 : undefined,
    heartbeatMs: heartbeat !== undefined ? heartbeat * 1000 : undefined,
    maintenanceIntervalSeconds: envNumber(env.ARMSIFT_QUEUE_MAINTENANCE_SECONDS),
    pollingIntervalSeconds: envNumber(env.ARMSIFT_WORKER_POLL_SECONDS),
  };
}

export async function startWorker(opts: WorkerOptions): Promise<RunningWorker> {
  const log = opts.log ?? ((line: string) => console.log(line));
  const concurrency = Math.max(1, Math.floor(opts.concurrency ?? Math.max(1, (os.availableParallelism?.() ?? os.cpus().length) - 1)));
  const heartbeatMs = opts.heartbeatMs ?? 5000;
  const silenceMs = opts.silenceMs ?? WORKER_SILENCE_MS;
  const id = `${os.hostname()}:${process.pid}:${randomBytes(3).toString("hex")}`;
  const settings = queueSettings();
  const boss: PgBoss = createBoss(opts.url, { supervise: true, max: concurrency + 3, maintenanceIntervalSeconds: opts.maintenanceIntervalSeconds ?? 30 });
  boss.on("error", (err: Error) => log(`queue error: ${err.message}`));
  await startQueue(boss, settings);
  await registerWorker({ id, host: os.hostname(), pid: process.pid, concurrency });

  const active = new Map<string, (reason: string) => void>();
  let stopping = false;

  const handler = async ([job]: PgBoss.JobWithMetadata<{ runId: string }>[]) => {
    const runId = job.data.runId;
    const last = job.retryCount >= job.retryLimit;
    log(`run ${runId}: taken (delivery ${job.retryCount + 1} of at most ${job.retryLimit + 1})`);
    const outcome = await executeRun(runId, {
      runner: id,
      takeOver: true,
      retryAfterFailure: () => !last,
      onStart: (stop) => active.set(runId, stop),
    }).finally(() => active.delete(runId));
    log(`run ${runId}: ${outcome}`);
    if (outcome === "failed" || outcome === "retry") {
      // Thrown so that pg-boss records the attempt as failed and retries it (or ends it failed).
      const run = await getRun(runId);
      throw new Error(run?.error ?? run?.stage ?? `run ${runId} ${outcome}`);
    }
    return { outcome };
  };
  for (let i = 0; i < concurrency; i++) {
    let loop = "";
    // After a job the loop looks for the next one at once instead of waiting out its polling period.
    loop = await boss.work(ANALYSIS_QUEUE, { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 1 }, (jobs: PgBoss.JobWithMetadata<{ runId: string }>[]) =>
      handler(jobs).finally(() => {
        if (loop && !stopping) boss.notifyWorker(loop);
      }),
    );
  }

  const beat = async () => {
    if (stopping) return;
    try {
      if (!(await heartbeatWorker(id, [...active.keys()]))) {
        // Another worker took this one as gone (a long pause): its runs are being retried elsewhere.
        for (const stop of active.values()) stop("this worker was silent too long; the run is retried by another worker");
        await registerWorker({ id, host: os.hostname(), pid: process.pid, concurrency }).catch(() => undefined);
      }
      for (const dead of await takeSilentWorkers(new Date(), silenceMs)) {
        const runs = await runningRunsOf(dead);
        if (runs.length) {
          for (const runId of runs) await boss.fail(ANALYSIS_QUEUE, runId, { message: `worker ${dead} stopped answering during the analysis` });
          log(`worker ${dead} is silent; its runs go back to the queue: ${runs.join(", ")}`);
        }
      }
      // A job that ended failed in the queue (retries used up after its worker died, or expired)
      // ends its run too, with the reason.
      for (const job of await endedJobs(boss, await listUnfinishedRunIds())) {
        if (await failRun(job.id, `the analysis failed: ${job.reason}`)) log(`run ${job.id}: failed in the queue (${job.reason})`);
      }
    } catch (err) {
      log(`heartbeat failed: ${err instanceof Error ? err.message : String(err)}`);
    }
  };
  const timer = setInterval(() => void beat(), heartbeatMs);
  timer.unref();
  log(`worker ${id}: ${concurrency} at a time on queue "${ANALYSIS_QUEUE}" (jobs expire after ${settings.expireInSeconds} s, ${settings.retryLimit} retries)`);

  return {
    id,
    async stop(reason = "the worker was stopped") {
      if (stopping) return;
      stopping = true;
      clearInterval(timer);
      for (const stop of active.values()) stop(reason);
      await boss.stop({ graceful: true, wait: true, timeout: 10_000 });
      await stopWorker(id).catch(() => undefined);
    },
  };
}
