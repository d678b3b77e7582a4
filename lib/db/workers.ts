import "server-only";
import { db } from "./client";

// Queue worker processes (`npm run worker`): each keeps a row with a heartbeat, so the health
// check can list the live ones and a worker can tell when another one died mid-job.

export interface WorkerInfo {
  id: string;
  host: string;
  pid: number;
  concurrency: number;
  startedAt: Date;
  lastSeenAt: Date;
  /** The runs it is analysing now. */
  runIds: string[];
}

/** A worker whose heartbeat is older than this is taken as gone. */
export const WORKER_SILENCE_MS = 30_000;

export async function registerWorker(w: { id: string; host: string; pid: number; concurrency: number }, now: Date = new Date()): Promise<void> {
  await db().workerProcess.create({ data: { ...w, startedAt: now, lastSeenAt: now } });
}

/** Heartbeat with the runs the worker is analysing now; false when the worker was taken as gone. */
export async function heartbeatWorker(id: string, runIds: string[], now: Date = new Date()): Promise<boolean> {
  const r = await db().workerProcess.updateMany({ where: { id, stoppedAt: null }, data: { lastSeenAt: now, runIds: runIds.length ? runIds.join(",") : null } });
  return r.count === 1;
}

export async function stopWorker(id: string, now: Date = new Date()): Promise<void> {
  await db().workerProcess.updateMany({ where: { id }, data: { stoppedAt: now, runIds: null } });
}

/** Workers with a heartbeat within the silence window, newest first. */
export async function listLiveWorkers(now: Date = new Date(), silenceMs: number = WORKER_SILENCE_MS): Promise<WorkerInfo[]> {
  const rows = await db().workerProcess.findMany({
    where: { stoppedAt: null, lastSeenAt: { gte: new Date(now.getTime() - silenceMs) } },
    orderBy: [{ startedAt: "desc" }, { id: "asc" }],
    select: { id: true, host: true, pid: true, concurrency: true, startedAt: true, lastSeenAt: true, runIds: true },
  });
  return rows.map((r) => ({ ...r, runIds: r.runIds ? r.runIds.split(",") : [] }));
}

/**
 * Marks workers silent for longer than the window as stopped and returns their ids. The update
 * is conditional, so when several live workers look at once each dead one is returned to one.
 */
export async function takeSilentWorkers(now: Date = new Date(), silenceMs: number = WORKER_SILENCE_MS): Promise<string[]> {
  const silent = await db().workerProcess.findMany({
    where: { stoppedAt: null, lastSeenAt: { lt: new Date(now.getTime() - silenceMs) } },
    select: { id: true, lastSeenAt: true },
  });
  const taken: string[] = [];
  for (const w of silent) {
    const r = await db().workerProcess.updateMany({ where: { id: w.id, stoppedAt: null, lastSeenAt: w.lastSeenAt }, data: { stoppedAt: now } });
    if (r.count === 1) taken.push(w.id);
  }
  return taken;
}

/** Ids of the runs a worker has running (its runner name is the worker id). */
export async function runningRunsOf(workerId: string): Promise<string[]> {
  const rows = await db().analysisRun.findMany({ where: { status: "running", runner: workerId }, select: { id: true } });
  return rows.map((r) => r.id);
}
