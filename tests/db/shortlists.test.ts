// Shortlists and analysis runs on a temporary database: pinning, the result cache, stale runs,
// re-pinning that keeps earlier results readable, and the runner's progress and failure paths.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb, armDoc, requirementDoc } from "./helpers";
import { createArm, updateArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { ValidationError } from "@/lib/db/errors";
import { toFieldErrors } from "@/shared/schemas";
import { createShortlistInput } from "@/shared/schemas/shortlists";
import {
  createShortlist, getRun, getRunArmView, getRunResult, getShortlist, listRuns, listShortlists, loadPinnedInputs, repinShortlist, requestAnalysisRun, STALE_RUN_MS,
} from "@/lib/db/shortlists";
import { NotFoundError } from "@/lib/db/errors";
import { executeRun } from "@/lib/jobs/analysis-runner";
import { analyzeShortlist } from "@/lib/analysis/shortlist";
import { compactResult } from "@/lib/analysis/compact";
import { analysisKey } from "@/lib/analysis/key";

let t: TestDb;
let armA: string, armB: string, setId: string;
beforeAll(async () => {
  t = createTestDb();
  armA = (await createArm(null, armDoc())).id;
  armB = (await createArm(null, armDoc({ name: "Test arm TB-3", modelCode: "TB-3", specs: { ratedPayload: 2, reach: 0.7, price: 18000, currency: "EUR" } }))).id;
  setId = (await createRequirementSet(null, requirementDoc())).id;
});
afterAll(async () => t.cleanup());

describe("shortlists and analysis runs", () => {
  it("refuses bad input naming the field", async () => {
    // The shape is the schema's, parsed at the edge; what exists is the data layer's to say.
    const e1 = createShortlistInput.safeParse({ name: "", requirementSetId: setId, armIds: [armA] });
    expect(toFieldErrors(e1.error!)[0].path).toBe("name");
    const e3 = createShortlistInput.safeParse({ name: "x", requirementSetId: setId, armIds: [] });
    expect(toFieldErrors(e3.error!)[0].path).toBe("armIds");
    const e2 = await createShortlist(null, { name: "x", requirementSetId: setId, armIds: [armA, "nope"] }).catch((e) => e);
    expect(e2).toBeInstanceOf(ValidationError);
    expect(e2.fieldErrors).toEqual([{ path: "armIds.1", message: "arm nope does not exist" }]);
  });

  it("pins revisions, analyses out of band, reuses a finished run with the same key, and keeps old results after a re-pin", async () => {
    // The shortlist comes with its first run, stored in the same transaction.
    const first = await createShortlist(null, { name: "Pick and place", requirementSetId: setId, armIds: [armB, armA] });
    const { id, pins } = first;
    expect(pins).toEqual({ requirement: { setId, revision: 1 }, arms: [{ armId: armB, revision: 1 }, { armId: armA, revision: 1 }] });
    expect(first).toMatchObject({ cached: false, needsStart: true, run: { status: "queued", progress: 0, queuePosition: 1, attempt: 0 } });
    // Asking again while it is queued returns the same run.
    expect((await requestAnalysisRun(id)).run.id).toBe(first.run.id);

    expect(await executeRun(first.run.id)).toBe("done");
    expect(await executeRun(first.run.id)).toBe("skipped"); // a run is executed once
    const done = await getRun(first.run.id);
    expect(done).toMatchObject({ status: "done", progress: 1, error: null, pins });
    expect(done!.finishedAt!.getTime()).toBeGreaterThanOrEqual(done!.startedAt!.getTime());

    // The stored result is the stored form of the analysis library's result for the pinned documents.
    const inputs = await loadPinnedInputs(pins);
    expect(done!.key).toBe(analysisKey(inputs.arms, inputs.requirementSet));
    const stored = await getRunResult(first.run.id);
    expect(JSON.parse(JSON.stringify(stored))).toEqual(JSON.parse(JSON.stringify(compactResult(analyzeShortlist(inputs.arms, inputs.requirementSet)))));
    expect(stored!.arms.map((a) => a.id)).toEqual([armB, armA]);

    // Same inputs: a cache hit, no new run.
    const again = await requestAnalysisRun(id);
    expect(again).toMatchObject({ cached: true, needsStart: false, run: { id: first.run.id } });

    // Another shortlist with the same inputs reuses the finished result.
    const reused = await createShortlist(null, { name: "Same inputs", requirementSetId: setId, armIds: [armB, armA] });
    expect(reused).toMatchObject({ cached: true, needsStart: false, run: { status: "done", reusedFromId: first.run.id, queuePosition: null } });
    expect(await getRunResult(reused.run.id)).toEqual(stored);
    // ...by referring to the one stored result of that key: nothing is copied.
    const rows = await t.client.analysisRun.findMany({ where: { id: { in: [first.run.id, reused.run.id] } }, select: { resultKey: true } });
    expect(rows.map((r) => r.resultKey)).toEqual([done!.key, done!.key]);
    expect(await t.client.analysisResult.count({ where: { key: done!.key } })).toBe(1);
    expect(await t.client.analysisResultArm.count({ where: { resultKey: done!.key } })).toBe(2);

    // An arm edit makes the pins stale; the shortlist says which and from which revision.
    await updateArm(null, armA, 1, armDoc({ specs: { ratedPayload: 6, reach: 0.7, price: 21000, currency: "EUR" } }));
    const s = await getShortlist(id);
    expect(s!.stale).toEqual(["arm Test arm TA-3: revision 1 → 2"]);
    expect(s!.arms.find((a) => a.armId === armA)).toMatchObject({ revision: 1, currentRevision: 2 });

    // Re-pin: new pins, new run; the old run and its result stay as they were.
    const newPins = await repinShortlist(null, id);
    expect(newPins.arms).toEqual([{ armId: armB, revision: 1 }, { armId: armA, revision: 2 }]);
    expect((await getShortlist(id))!.stale).toEqual([]);
    const second = await requestAnalysisRun(id);
    expect(second).toMatchObject({ cached: false, needsStart: true });
    expect(second.run.key).not.toBe(first.run.key);
    expect(await executeRun(second.run.id)).toBe("done");
    const runs = await listRuns(id);
    expect(runs.map((r) => r.id)).toEqual([second.run.id, first.run.id]);
    expect(runs[1].pins).toEqual(pins);
    expect(runs[0].pins).toEqual(newPins);
    expect((await getRunResult(first.run.id))!.arms.find((a) => a.id === armA)!.revision).toBe(1);
    expect((await getRunResult(second.run.id))!.arms.find((a) => a.id === armA)!.revision).toBe(2);

    const list = await listShortlists();
    expect(list.find((x) => x.id === id)).toMatchObject({ arms: 2, requirementRevision: 1, latestRun: { id: second.run.id, status: "done" } });
  });

  it("gives the 3-D view one arm of a run with the revisions that run was pinned to, not the current ones", async () => {
    const arm = (await createArm(null, armDoc({ name: "Test arm TV-3", modelCode: "TV-3" }))).id;
    const { id, pins } = await createShortlist(null, { name: "View pins", requirementSetId: setId, armIds: [armB, arm] });
    const run = await requestAnalysisRun(id);
    expect(await executeRun(run.run.id)).toBe("done");
    await updateArm(null, arm, 1, armDoc({ name: "Test arm TV-3 (edited)", modelCode: "TV-3" }));
    const view = await getRunArmView(id, run.run.id, arm);
    const inputs = await loadPinnedInputs(pins);
    expect(view.revision).toBe(1);
    expect(view.arm).toEqual(inputs.arms[1].arm);
    expect(view.arm.name).toBe("Test arm TV-3");
    expect(view.requirementSet).toEqual(inputs.requirementSet);
    expect(view.analysis).toEqual((await getRunResult(run.run.id))!.arms[1]);
    // Another shortlist's run, an arm not in the run, an unknown run: not found, with the reason.
    const other = await createShortlist(null, { name: "Other", requirementSetId: setId, armIds: [armB] });
    for (const [sl, r, a, why] of [
      [other.id, run.run.id, arm, /has no analysis run/],
      [id, run.run.id, armA, /does not include arm/],
      [id, "no-such-run", arm, /has no analysis run/],
    ] as const) {
      const e = await getRunArmView(sl, r, a).catch((x: unknown) => x);
      expect(e).toBeInstanceOf(NotFoundError);
      expect((e as Error).message).toMatch(why);
    }
  });

  it("fails a web server's run that stopped reporting, and a run whose inputs cannot be loaded", async () => {
    const r = await createShortlist(null, { name: "Stale", requirementSetId: setId, armIds: [armA] });
    const id = r.id;
    const old = new Date(Date.now() - STALE_RUN_MS - 1000);
    await t.client.analysisRun.update({ where: { id: r.run.id }, data: { status: "running", runner: "local:elsewhere:1", heartbeatAt: old } });
    const stale = await getRun(r.run.id);
    expect(stale!.status).toBe("failed");
    expect(stale!.error).toMatch(/stopped reporting progress/);
    // A heartbeat inside the window keeps it alive.
    const r2 = await requestAnalysisRun(id);
    expect(r2.needsStart).toBe(true);
    await t.client.analysisRun.update({ where: { id: r2.run.id }, data: { status: "running", runner: "local:elsewhere:1", heartbeatAt: new Date(Date.now() - 1000) } });
    expect((await getRun(r2.run.id))!.status).toBe("running");
    // A queue worker's silent run is not failed on read: the queue hands it to another worker.
    await t.client.analysisRun.update({ where: { id: r2.run.id }, data: { runner: "worker-host:77:abc", heartbeatAt: old } });
    expect((await getRun(r2.run.id))!.status).toBe("running");
    await t.client.analysisRun.update({ where: { id: r2.run.id }, data: { status: "failed" } });

    const r3 = await requestAnalysisRun(id);
    await t.client.analysisRun.update({ where: { id: r3.run.id }, data: { pins: JSON.stringify({ requirement: { setId, revision: 99 }, arms: [] }) } });
    expect(await executeRun(r3.run.id)).toBe("failed");
    const failed = await getRun(r3.run.id);
    expect(failed!.error).toMatch(/requirement set .* has no revision 99/);
    expect(await getRunResult(r3.run.id)).toBeNull();
  });
});
