// Analysis runs behind the runner interface, on a temporary database (both providers): claims per
// attempt (a late writer of an earlier attempt stores nothing), places in the queue, cancellation,
// the bounded local runner (at most N at once, in order), start-up recovery of runs whose server is
// gone, a shortlist and its first run in one transaction, and a run that dies with its server.
import { spawn } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { armDoc, createTestDb, requirementDoc, type TestDb } from "./helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { cancelRun, claimRun, createShortlist, finishRun, getRun, getRunResult, reportRunProgress, requestAnalysisRun } from "@/lib/db/shortlists";
import { executeRun } from "@/lib/jobs/analysis-runner";
import { LocalRunner, localConcurrency, localRunnerName } from "@/lib/jobs/local-runner";
import { STORED_FORMAT, type StoredResult } from "@/lib/analysis/stored";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";

const ROOT = path.resolve(__dirname, "..", "..");
let t: TestDb;
let arm: string;
let heavyArms: string[] = [];
let heavySet: string;
let n = 0;
/** A requirement set of its own, so each run has its own key (no reuse of an earlier result). */
const freshSet = async () => (await createRequirementSet(null, requirementDoc({ name: `Cell ${++n}` }))).id;
const freshShortlist = async (setId?: string, armIds?: string[]) =>
  createShortlist(null, { name: `Runs ${++n}`, requirementSetId: setId ?? (await freshSet()), armIds: armIds ?? [arm] });

beforeAll(async () => {
  t = createTestDb();
  arm = (await createArm(null, armDoc())).id;
  for (const a of loadSeedArms()) heavyArms.push((await createArm(null, a)).id);
  heavyArms = [...heavyArms, ...heavyArms.slice(0, 3)].slice(0, 7);
  heavySet = (await createRequirementSet(null, loadSeedRequirementSets().find((s) => s.paths.length > 0)!)).id;
}, 60_000);
afterAll(async () => t.cleanup());

describe("analysis runs", () => {
  it("claims a run per attempt: the writes of an earlier attempt store nothing", async () => {
    const { run } = await freshShortlist();
    const first = await claimRun(run.id, "worker-a");
    expect(first).toBe(1);
    expect(await claimRun(run.id, "worker-b")).toBeNull(); // running: only a takeover may claim it
    const second = await claimRun(run.id, "worker-b", { takeOver: true });
    expect(second).toBe(2);
    // a stand-in for a stored result (its stored form: an empty head, no arms)
    const result: StoredResult = { format: STORED_FORMAT, head: "{}", arms: [], bytes: 2, jsonBytes: 2 };
    expect(await reportRunProgress(run.id, 1, 0.5, "late")).toBe(false);
    expect(await finishRun(run.id, 1, result)).toBe(false);
    expect((await getRun(run.id))!.status).toBe("running");
    expect(await finishRun(run.id, 2, result)).toBe(true);
    expect(await finishRun(run.id, 2, result)).toBe(false); // stored once
    expect(await claimRun(run.id, "worker-c", { takeOver: true })).toBeNull(); // done is final
    expect(await t.client.analysisRun.findUnique({ where: { id: run.id }, select: { attempt: true, runner: true, status: true } })).toEqual({ attempt: 2, runner: "worker-b", status: "done" });
  });

  it("numbers queued runs by their place in the queue, oldest first", async () => {
    await t.client.analysisRun.updateMany({ where: { status: "queued" }, data: { status: "failed" } });
    const runs = [await freshShortlist(), await freshShortlist(), await freshShortlist()].map((r) => r.run);
    expect(runs.map((r) => r.queuePosition)).toEqual([1, 2, 3]);
    await claimRun(runs[0].id, "worker-a");
    expect([(await getRun(runs[1].id))!.queuePosition, (await getRun(runs[2].id))!.queuePosition]).toEqual([1, 2]);
    expect((await getRun(runs[0].id))!.queuePosition).toBeNull();
    await t.client.analysisRun.updateMany({ where: { id: { in: runs.map((r) => r.id) } }, data: { status: "failed" } });
  });

  it("stores a shortlist and its first run in one transaction", async () => {
    const before = [await t.client.shortlist.count(), await t.client.analysisRun.count()];
    const setId = await freshSet();
    const err = await createShortlist(null, { name: "Never stored", requirementSetId: setId, armIds: [arm] }, {
      enqueue: async () => {
        throw new Error("the queue is down");
      },
    }).catch((e: Error) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as Error).message).toBe("the queue is down");
    expect([await t.client.shortlist.count(), await t.client.analysisRun.count()]).toEqual(before);
    const ok = await createShortlist(null, { name: "Stored", requirementSetId: setId, armIds: [arm] });
    expect(await t.client.analysisRun.count({ where: { shortlistId: ok.id } })).toBe(1);
  });

  it("cancels a queued run (never started) and a running one (stopped at its next progress point)", async () => {
    const queued = await freshShortlist();
    expect((await cancelRun(null, queued.run.id))!.status).toBe("cancelled");
    expect(await executeRun(queued.run.id)).toBe("skipped");

    const heavy = await freshShortlist(heavySet, heavyArms);
    const outcome = executeRun(heavy.run.id);
    for (let i = 0; i < 300; i++) {
      const r = await getRun(heavy.run.id);
      if (r?.status === "running" && r.progress > 0) break;
      await new Promise((res) => setTimeout(res, 50));
    }
    const t0 = Date.now();
    expect((await cancelRun(null, heavy.run.id))!.status).toBe("cancelled");
    expect(await outcome).toBe("cancelled");
    expect(Date.now() - t0).toBeLessThan(5000);
    expect(await getRunResult(heavy.run.id)).toBeNull();
    // A new request after a cancellation starts a new run.
    expect((await requestAnalysisRun(heavy.id)).needsStart).toBe(true);
  }, 60_000);

  it("the local runner runs at most its limit at once, in order, and defaults to cores − 1 (at least 1)", async () => {
    expect(localConcurrency({}, 2)).toBe(1);
    expect(localConcurrency({}, 1)).toBe(1);
    expect(localConcurrency({}, 8)).toBe(7);
    expect(localConcurrency({ ARMSIFT_ANALYSIS_CONCURRENCY: "3" }, 2)).toBe(3);
    const runner = new LocalRunner({ concurrency: 1, name: localRunnerName() });
    const ids: string[] = [];
    for (let i = 0; i < 3; i++) ids.push((await freshShortlist()).run.id);
    for (const id of ids) runner.submit(id);
    let most = 0;
    const watch = setInterval(async () => {
      const running = await t.client.analysisRun.count({ where: { id: { in: ids }, status: "running" } });
      most = Math.max(most, running);
    }, 20);
    await runner.drained();
    clearInterval(watch);
    const rows = await t.client.analysisRun.findMany({ where: { id: { in: ids } }, select: { id: true, status: true, startedAt: true, finishedAt: true } });
    expect(rows.every((r) => r.status === "done")).toBe(true);
    expect(most).toBeLessThanOrEqual(1);
    // One after another: each started after the one before finished.
    const byId = new Map(rows.map((r) => [r.id, r]));
    for (let i = 1; i < ids.length; i++) expect(byId.get(ids[i])!.startedAt!.getTime()).toBeGreaterThanOrEqual(byId.get(ids[i - 1])!.finishedAt!.getTime());
  }, 60_000);

  it("at start-up fails the runs of a server process that is gone and takes up the queued ones", async () => {
    const host = os.hostname();
    const dead = await freshShortlist();
    const alive = await freshShortlist();
    const queued = await freshShortlist();
    await t.client.analysisRun.update({ where: { id: dead.run.id }, data: { status: "running", runner: `local:${host}:999999`, attempt: 1 } });
    await t.client.analysisRun.update({ where: { id: alive.run.id }, data: { status: "running", runner: `local:${host}:${process.pid}`, attempt: 1 } });
    const runner = new LocalRunner({ concurrency: 1, name: `local:${host}:1` });
    const r = await runner.recover({ alive: (pid) => pid === process.pid });
    expect(r.failed).toBe(1);
    expect(r.resumed).toBeGreaterThanOrEqual(1);
    await runner.drained();
    expect(await getRun(dead.run.id)).toMatchObject({ status: "failed", error: "the server stopped while this analysis was running; start it again" });
    expect((await getRun(alive.run.id))!.status).toBe("running");
    expect((await getRun(queued.run.id))!.status).toBe("done");
    await t.client.analysisRun.update({ where: { id: alive.run.id }, data: { status: "failed" } });
  }, 60_000);

  it("a run does not outlive the server process that runs it; the next start marks it failed", async () => {
    const { run } = await freshShortlist(heavySet, heavyArms.slice(1));
    // A stand-in server: the local runner in its own process, killed with SIGKILL during the run.
    // (node itself with tsx as a loader: the tsx command would start node as a further child.)
    const child = spawn(process.execPath, ["--import", "tsx", "--conditions=react-server", path.join(__dirname, "local-server.ts"), run.id], {
      cwd: ROOT,
      env: { ...process.env, DATABASE_URL: t.url },
      stdio: "ignore",
    });
    const exited = new Promise((r) => child.once("exit", r));
    try {
      let running = null;
      for (let i = 0; i < 600 && !running; i++) {
        const r = await t.client.analysisRun.findUnique({ where: { id: run.id } });
        if (r?.status === "running" && r.progress > 0) running = r;
        else await new Promise((res) => setTimeout(res, 50));
      }
      expect(running, "the stand-in server started the run").not.toBeNull();
      child.kill("SIGKILL");
      await exited;
      const at = (await t.client.analysisRun.findUnique({ where: { id: run.id } }))!;
      await new Promise((res) => setTimeout(res, 1500));
      const later = (await t.client.analysisRun.findUnique({ where: { id: run.id } }))!;
      // Nothing analyses it any more: no progress, no heartbeat since the kill.
      expect([later.status, later.progress, later.heartbeatAt?.getTime()]).toEqual([at.status, at.progress, at.heartbeatAt?.getTime()]);
      expect(later.runner).toBe(`local:${os.hostname()}:${child.pid}`);
      const restarted = new LocalRunner({ concurrency: 1 });
      const { failed } = await restarted.recover();
      await restarted.drained();
      expect(failed).toBe(1);
      expect((await getRun(run.id))!.status).toBe("failed");
    } finally {
      child.kill("SIGKILL");
    }
  }, 90_000);
});
