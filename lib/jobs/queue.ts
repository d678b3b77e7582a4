/**
 * The durable analysis queue of the team set-up: pg-boss in the same PostgreSQL database (schema
 * `pgboss`, made by pg-boss itself, which Prisma leaves alone). A run's job has the run's id and
 * carries only that id; it is inserted in the transaction that stores the run. Delivery is at
 * least once: the handler claims the run for one attempt (lib/db/shortlists.ts, claimRun), so a job
 * delivered twice stores one result.
 */
import PgBoss from "pg-boss";
import type { Tx } from "@/lib/db";

export const ANALYSIS_QUEUE = "analysis";

interface QueueSettings {
  /** A job still active this long after it started is given up and retried (must exceed the longest run). */
  expireInSeconds: number;
  /** Attempts after the first. */
  retryLimit: number;
  /** Seconds before a failed attempt is tried again. */
  retryDelay: number;
  /** How long a job may wait in the queue before it is dropped (minutes). */
  retentionMinutes: number;
}

const envInt = (v: string | undefined, fallback: number, min: number): number => {
  const n = Number(v);
  return Number.isInteger(n) && n >= min ? n : fallback;
};

/**
 * From the environment: ARMSIFT_JOB_EXPIRE_SECONDS (default 3600: one hour, well above the
 * longest analysis), ARMSIFT_JOB_RETRIES (2), ARMSIFT_JOB_RETRY_DELAY_SECONDS (5); jobs wait at
 * most 7 days.
 */
export function queueSettings(env: NodeJS.ProcessEnv = process.env): QueueSettings {
  return {
    expireInSeconds: envInt(env.ARMSIFT_JOB_EXPIRE_SECONDS, 3600, 1),
    retryLimit: envInt(env.ARMSIFT_JOB_RETRIES, 2, 0),
    retryDelay: envInt(env.ARMSIFT_JOB_RETRY_DELAY_SECONDS, 5, 0),
    retentionMinutes: 7 * 24 * 60,
  };
}

/**
 * A pg-boss instance on the database. `supervise` (workers) runs pg-boss's maintenance: expiring
 * jobs whose worker went silent, so at least one live process must supervise.
 */
export function createBoss(url: string, opts: { supervise: boolean; max?: number; maintenanceIntervalSeconds?: number }): PgBoss {
  return new PgBoss({
    connectionString: url,
    supervise: opts.supervise,
    schedule: false,
    max: opts.max ?? 4,
    maintenanceIntervalSeconds: opts.maintenanceIntervalSeconds ?? 30,
    application_name: "armsift-queue",
  });
}

/** Starts the instance (pg-boss creates or upgrades its schema) and creates or updates the queue. */
export async function startQueue(boss: PgBoss, settings: QueueSettings = queueSettings()): Promise<void> {
  await boss.start();
  const queue = { name: ANALYSIS_QUEUE, policy: "standard" as const, ...settings };
  if (await boss.getQueue(ANALYSIS_QUEUE)) await boss.updateQueue(ANALYSIS_QUEUE, queue);
  else await boss.createQueue(ANALYSIS_QUEUE, queue);
}

/** pg-boss's database interface on a Prisma transaction: its SQL runs inside that transaction. */
function transactionDb(tx: Tx): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      // pg would send objects as JSON; Prisma's raw parameters need them as text.
      const args = values.map((v) => (v !== null && typeof v === "object" && !(v instanceof Date) ? JSON.stringify(v) : v));
      const rows = (await tx.$queryRawUnsafe(text, ...args)) as unknown[];
      return { rows };
    },
  };
}

/**
 * Inserts the job of a queued run inside the transaction that stores the run. The job carries the
 * expiry and retries of the enqueuing process's settings (web servers and workers share them).
 */
export async function enqueueRun(boss: PgBoss, tx: Tx, runId: string, settings: QueueSettings = queueSettings()): Promise<void> {
  const { expireInSeconds, retryLimit, retryDelay } = settings;
  const id = await boss.send(ANALYSIS_QUEUE, { runId }, { id: runId, expireInSeconds, retryLimit, retryDelay, db: transactionDb(tx) });
  if (id !== runId) throw new Error(`the queue did not take the job of run ${runId}`);
}

export interface QueueDepth {
  /** Waiting to be taken (new, or waiting out the delay before a retry). */
  waiting: number;
  /** Taken by a worker now. */
  active: number;
  /** Ended failed after their retries (kept for the retention time). */
  failed: number;
}

/** Jobs of the analysis queue by state (pg-boss keeps them in `pgboss.job`, one partition per queue). */
export async function queueDepth(boss: PgBoss): Promise<QueueDepth> {
  const { rows } = await boss.getDb().executeSql(
    "SELECT state::text AS state, count(*)::int AS n FROM pgboss.job WHERE name = $1 GROUP BY state",
    [ANALYSIS_QUEUE],
  );
  const n = (state: string) => Number((rows as { state: string; n: number }[]).find((r) => r.state === state)?.n ?? 0);
  return { waiting: n("created") + n("retry"), active: n("active"), failed: n("failed") };
}

/** Of the given runs' jobs, those that ended failed or cancelled in the queue, with the reason. */
export async function endedJobs(boss: PgBoss, runIds: string[]): Promise<{ id: string; state: string; reason: string }[]> {
  if (!runIds.length) return [];
  const { rows } = await boss.getDb().executeSql(
    "SELECT id::text AS id, state::text AS state, output FROM pgboss.job WHERE name = $1 AND id = ANY($2::uuid[]) AND state IN ('failed', 'cancelled')",
    [ANALYSIS_QUEUE, runIds],
  );
  return (rows as { id: string; state: string; output: { message?: string } | null }[]).map((r) => ({
    id: r.id,
    state: r.state,
    reason: typeof r.output?.message === "string" ? r.output.message : `the queue job ended ${r.state}`,
  }));
}
