// The durable analysis queue against a real PostgreSQL database, with real worker processes
// (`node dist/jobs/worker.mjs`, what `npm run worker` runs): 200 jobs drained by 2 workers with every
// run analysed and stored exactly once; a worker killed with SIGKILL in the middle of a job, whose
// job another worker then completes (after the job's expiry, and sooner through the heartbeat);
// a poison job that fails with its reason after its retries while the rest go on; cancellation
// stopping a running job. Inputs are tiny arms and cells so the machine stays usable.
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { armDoc, createTestDb, requirementDoc, type TestDb } from "../db/helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { cancelRun, getRun, getRunResult, loadPinnedInputs } from "@/lib/db/shortlists";
import { createShortlistWithRun } from "@/lib/jobs/runs";
import { analyzeShortlist } from "@/lib/analysis/shortlist";
import { compactResult } from "@/lib/analysis/compact";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { killWorkers, startWorkerProcess, waitFor, type WorkerProcess } from "./workers";

let t: TestDb;
let tinyArm: string, tinySet: string, heavySet: string;
const heavyArms: string[] = [];
beforeAll(async () => {
  t = createTestDb();
  if (t.provider !== "postgres") throw new Error("the queue tests run on PostgreSQL (ARMSIFT_TEST_PROVIDER=postgres)");
  tinyArm = (await createArm(null, armDoc())).id;
  tinySet = (await createRequirementSet(null, requirementDoc({ targets: [{ name: "pick", position: [0.4, 0.1, 0.2], rpy: [Math.PI, 0, 0], mode: "point" }] }))).id;
  // A few seconds of analysis: the invented seed arms, each twice, against the deburring cell.
  for (const [i, arm] of [...loadSeedArms(), ...loadSeedArms()].entries()) heavyArms.push((await createArm(null, { ...arm, name: `${arm.name} (${i})` })).id);
  const deburring = loadSeedRequirementSets().find((s) => s.paths.length > 0)!;
  heavySet = (await createRequirementSet(null, deburring)).id;
}, 60_000);
afterEach(() => killWorkers());
afterAll(async () => {
  killWorkers();
  await t?.cleanup();
});

interface JobRow {
  id: string;
  state: string;
  retry_count: number;
  output: { message?: string } | null;
}
const jobsOf = async (ids: string[]): Promise<JobRow[]> =>
  (await t.client.$queryRawUnsafe(
    `SELECT id::text AS id, state::text AS state, retry_count, output FROM pgboss.job WHERE name = 'analysis' AND id = ANY($1::uuid[])`,
    ids,
  )) as JobRow[];

async function shortlists(n: number, setId: string, armIds: string[], label: string): Promise<string[]> {
  const runs: string[] = [];
  for (let i = 0; i < n; i++) {
    const r = await createShortlistWithRun(null, { name: `${label} ${i}`, requirementSetId: setId, armIds });
    expect(r.run.status).toBe("queued");
    runs.push(r.run.id);
  }
  return runs;
}

const statusOf = async (runIds: string[]) => {
  const rows = await t.client.analysisRun.findMany({ where: { id: { in: runIds } }, select: { id: true, status: true, attempt: true, runner: true, resultKey: true, error: true } });
  return new Map(rows.map((r) => [r.id, r]));
};

describe("analysis jobs on the queue with worker processes", () => {
  it("drains 200 jobs with 2 workers, every run analysed and stored exactly once", async () => {
    const runIds = await shortlists(200, tinySet, [tinyArm], "Drain");
    // Enqueued in the same transaction as the run rows: 200 jobs wait, with the runs' ids.
    expect((await jobsOf(runIds)).filter((j) => j.state === "created")).toHaveLength(200);

    const workers = [startWorkerProcess("A", t.url), startWorkerProcess("B", t.url)];
    const done = await waitFor(
      "200 finished runs",
      async () => {
        const rows = await statusOf(runIds);
        const finished = [...rows.values()].filter((r) => r.status !== "queued" && r.status !== "running");
        return finished.length === 200 ? rows : undefined;
      },
      240_000,
      500,
    );
    const runs = [...done.values()];
    expect(runs.filter((r) => r.status === "done")).toHaveLength(200);
    expect(runs.every((r) => r.resultKey !== null)).toBe(true);
    // Exactly once: one claim per run, 200 claims in all, and every job completed once.
    expect(runs.map((r) => r.attempt)).toEqual(runIds.map(() => 1));
    const jobs = await jobsOf(runIds);
    expect(jobs.filter((j) => j.state === "completed" && j.retry_count === 0)).toHaveLength(200);
    // Both workers took part.
    const ids = workers.map((w) => w.id());
    const byWorker = ids.map((id) => runs.filter((r) => r.runner === id).length);
    expect(byWorker.reduce((a, b) => a + b, 0)).toBe(200);
    expect(Math.min(...byWorker)).toBeGreaterThan(0);
    console.log(`[queue] 200 jobs: worker A ran ${byWorker[0]}, worker B ${byWorker[1]}`);
    // The stored result is the stored form of the analysis of the pinned inputs, as computed here.
    const first = await getRun(runIds[0]);
    const inputs = await loadPinnedInputs(first!.pins!);
    expect(JSON.parse(JSON.stringify(await getRunResult(runIds[0])))).toEqual(JSON.parse(JSON.stringify(compactResult(analyzeShortlist(inputs.arms, inputs.requirementSet)))));

    // A stopped worker leaves its row stopped.
    await Promise.all(workers.map((w) => w.kill("SIGTERM")));
    const rows = await t.client.workerProcess.findMany({ where: { id: { in: ids.filter((x): x is string => !!x) } } });
    expect(rows.map((r) => r.stoppedAt !== null)).toEqual([true, true]);
  }, 300_000);

  // Each test analyses inputs of its own (the same inputs would reuse an earlier result).
  async function killDuringJob(armIds: string[], env: Record<string, string>): Promise<{ run: Awaited<ReturnType<typeof statusOf>> extends Map<string, infer R> ? R : never; a: WorkerProcess; b: WorkerProcess; job: JobRow }> {
    // The job takes its expiry from the settings of the process that enqueues it (here: this one).
    process.env.ARMSIFT_JOB_EXPIRE_SECONDS = env.ARMSIFT_JOB_EXPIRE_SECONDS;
    const [runId] = await shortlists(1, heavySet, armIds, `Kill ${Object.values(env).join("-")}`);
    delete process.env.ARMSIFT_JOB_EXPIRE_SECONDS;
    const a = startWorkerProcess("A", t.url, env);
    await waitFor("worker A analysing the run", async () => {
      const r = await t.client.analysisRun.findUnique({ where: { id: runId } });
      return r?.status === "running" && r.runner === a.id() && r.progress > 0 ? true : undefined;
    }, 60_000, 100);
    const b = startWorkerProcess("B", t.url, env);
    await waitFor("worker B started", async () => (b.id() ? true : undefined), 30_000);
    await a.kill("SIGKILL");
    const killed = await a.exited;
    expect(killed.signal).toBe("SIGKILL");
    const run = await waitFor("the run finished", async () => {
      const r = (await statusOf([runId])).get(runId)!;
      return r.status === "done" || r.status === "failed" ? r : undefined;
    }, 120_000, 250);
    const [job] = await jobsOf([runId]);
    return { run, a, b, job };
  }

  it("a worker killed with SIGKILL during a job: the other worker completes it after the job's expiry, one result stored", async () => {
    // The silence watch is turned off here, so only pg-boss's expiry gives the job back.
    const { run, b, job } = await killDuringJob(heavyArms, { ARMSIFT_JOB_EXPIRE_SECONDS: "20", ARMSIFT_WORKER_SILENCE_SECONDS: "3600" });
    expect(run.status).toBe("done");
    expect(run.runner).toBe(b.id());
    expect(run.attempt).toBe(2);
    expect(run.resultKey).not.toBeNull();
    expect(job).toMatchObject({ state: "completed", retry_count: 1 });
  }, 180_000);

  it("a worker killed with SIGKILL during a job: its silent heartbeat gives the job back sooner", async () => {
    const t0 = Date.now();
    const { run, b, job } = await killDuringJob(heavyArms.slice(1), { ARMSIFT_JOB_EXPIRE_SECONDS: "3600", ARMSIFT_WORKER_SILENCE_SECONDS: "3" });
    expect(run.status).toBe("done");
    expect(run.runner).toBe(b.id());
    expect(run.attempt).toBe(2);
    expect(job).toMatchObject({ state: "completed", retry_count: 1 });
    expect(b.log()).toMatch(/is silent; its runs go back to the queue/);
    console.log(`[queue] killed worker's run finished by the other worker ${((Date.now() - t0) / 1000).toFixed(1)} s after the test started`);
  }, 180_000);

  it("a poison job ends failed with its reason after its retries; the other jobs go on", async () => {
    const set = (await createRequirementSet(null, requirementDoc({ name: "Poison cell" }))).id;
    const runIds = await shortlists(4, set, [tinyArm], "Poison");
    const poison = runIds[1];
    // Pins that point at a revision that does not exist: every attempt throws.
    await t.client.analysisRun.update({ where: { id: poison }, data: { pins: JSON.stringify({ requirement: { setId: set, revision: 99 }, arms: [] }) } });
    startWorkerProcess("A", t.url, { ARMSIFT_JOB_RETRIES: "2" });
    const rows = await waitFor("all four finished", async () => {
      const r = await statusOf(runIds);
      return [...r.values()].every((x) => x.status === "done" || x.status === "failed") ? r : undefined;
    }, 120_000, 250);
    expect(runIds.filter((id) => id !== poison).map((id) => rows.get(id)!.status)).toEqual(["done", "done", "done"]);
    const p = rows.get(poison)!;
    expect(p.status).toBe("failed");
    expect(p.error).toMatch(/requirement set .* has no revision 99/);
    expect(p.attempt).toBe(3); // the first try and two retries
    const [job] = await jobsOf([poison]);
    expect(job.state).toBe("failed");
    expect(job.retry_count).toBe(2);
    expect(job.output?.message).toMatch(/has no revision 99/);
  }, 180_000);

  it("cancelling a running job stops it at its next progress point; the worker takes the next job", async () => {
    const [heavy] = await shortlists(1, heavySet, heavyArms.slice(2), "Cancel");
    const set = (await createRequirementSet(null, requirementDoc({ name: "After the cancelled one" }))).id;
    const [after] = await shortlists(1, set, [tinyArm], "After cancel");
    const a = startWorkerProcess("A", t.url);
    await waitFor("the heavy run in progress", async () => {
      const r = await getRun(heavy);
      return r?.status === "running" && r.progress > 0 ? true : undefined;
    }, 60_000, 100);
    const cancelled = await cancelRun(null, heavy);
    expect(cancelled!.status).toBe("cancelled");
    await waitFor("the next run done", async () => ((await getRun(after))?.status === "done" ? true : undefined), 60_000, 250);
    const r = await getRun(heavy);
    expect(r).toMatchObject({ status: "cancelled", error: "cancelled" });
    expect(await getRunResult(heavy)).toBeNull();
    expect(a.log()).toMatch(new RegExp(`run ${heavy}: cancelled`));
    const [job] = await jobsOf([heavy]);
    expect(job.state).toBe("completed");
  }, 120_000);
});
