// Exports of a stored result through the API, written as they are sent (lib/export
// shortlistExportStream): the JSON of an invented shortlist with finely sampled paths parses back
// to the stored result, with the metadata and the ranking (re-ranked when the weights differ);
// the XLSX (streaming writer) reads back with exceljs with one task-matrix row per arm; the CSV
// has one ranking row per arm. A second shortlist with the same inputs exports the same result.
import { describe, expect, it, beforeAll } from "vitest";
import * as exportRoute from "@/app/api/shortlists/[id]/export/route";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist, getRunResult } from "@/lib/db/shortlists";
import { executeRun } from "@/lib/jobs/analysis-runner";
import { rerank } from "@/lib/analysis/shortlist";
import { PROFILE_POINTS } from "@/lib/analysis/compact";
import { armSchema } from "@/shared/schemas/arm";
import { largeShortlist } from "../../bench/large-shortlist";
import { readCsvExport, readXlsx, sheetRecords } from "../export/parse";
import { BASE, call } from "./client";
import { withAccounts } from "./setup";

const { acc } = withAccounts();
let shortlistId: string, runId: string, twinId: string;
const ARMS = 3, TARGETS = 30, PATHS = 3;

beforeAll(async () => {
  const { arms, requirementSet } = largeShortlist({ arms: ARMS, targets: TARGETS, paths: PATHS, waypoints: 12, step: 1e-4 });
  const armIds: string[] = [];
  for (const a of arms) armIds.push((await createArm(null, armSchema.parse(a))).id);
  const setId = (await createRequirementSet(null, requirementSet)).id;
  const s = await createShortlist(null, { name: "Large, exported", requirementSetId: setId, armIds });
  expect(await executeRun(s.run.id)).toBe("done");
  shortlistId = s.id;
  runId = s.run.id;
  twinId = (await createShortlist(null, { name: "Same inputs", requirementSetId: setId, armIds })).id;
}, 300_000);

const exportOf = (id: string, query: string) => call(exportRoute.GET, `/api/shortlists/${id}/export`, { cookie: acc.viewer, params: { id }, query });

describe("GET /api/shortlists/:id/export at size", () => {
  it("JSON: streamed, parses back to the stored result with its metadata and ranking", async () => {
    const r = await exportOf(shortlistId, "?format=json");
    expect(r.status).toBe(200);
    expect(r.res.headers.get("content-type")).toMatch(/^application\/json/);
    const stored = (await getRunResult(runId))!;
    expect(r.body.format).toBe("armsift-shortlist-1");
    expect(r.body.analysis).toEqual(JSON.parse(JSON.stringify(stored)));
    expect(r.body.ranking).toEqual(JSON.parse(JSON.stringify(stored.ranking)));
    expect(r.body.meta.arms.map((a: { id: string }) => a.id)).toEqual(stored.arms.map((a) => a.id));
    expect(r.body.meta.weightsAdjusted).toBe(false);
    // the stored paths keep a bounded number of samples
    for (const a of r.body.analysis.arms) for (const p of a.paths) expect(p.q.length).toBeLessThanOrEqual(PROFILE_POINTS);
    expect(r.body.analysis.arms[0].paths.some((p: { samples: number }) => p.samples > PROFILE_POINTS)).toBe(true);
    // the other shortlist with the same inputs refers to the same stored result
    const twin = await exportOf(twinId, "?format=json");
    expect(twin.body.analysis).toEqual(r.body.analysis);
  });

  it("JSON with other weights: the ranking of the stored sub-scores with those weights", async () => {
    const stored = (await getRunResult(runId))!;
    const r = await exportOf(shortlistId, `?format=json&weights=${encodeURIComponent("price:9,coverage:0")}`);
    expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBe(200);
    expect(r.body.meta.weightsAdjusted).toBe(true);
    expect(r.body.meta.weights).toMatchObject({ price: 9, coverage: 0 });
    expect(r.body.ranking).toEqual(JSON.parse(JSON.stringify(rerank(stored, r.body.meta.weights))));
  });

  it("XLSX: the streaming writer's workbook reads back, one task-matrix row per arm", async () => {
    const req = new Request(`${BASE}/api/shortlists/${shortlistId}/export?format=xlsx`, { headers: { host: "localhost:3000", cookie: acc.viewer } });
    const res = await exportRoute.GET(req, { params: Promise.resolve({ id: shortlistId }) });
    expect(res.status).toBe(200);
    const sheets = await readXlsx(Buffer.from(await res.arrayBuffer()));
    expect(Object.keys(sheets)).toEqual(["Ranking", "Task matrix", "Compliance", "Metadata"]);
    const stored = (await getRunResult(runId))!;
    const matrix = sheetRecords(sheets["Task matrix"]);
    expect(matrix.map((m) => m.Arm)).toEqual(stored.arms.map((a) => a.name));
    expect(matrix[0][`Target ${stored.requirementSet.targets[TARGETS - 1]}: verdict`]).toBe(stored.arms[0].targets[TARGETS - 1].verdict);
    expect(sheetRecords(sheets.Ranking).map((x) => x.Arm)).toEqual(stored.ranking.map((k) => stored.arms.find((a) => a.id === k.armId)!.name));
  });

  it("CSV: one ranking row per arm", async () => {
    const r = await exportOf(shortlistId, "?format=csv");
    expect(r.status).toBe(200);
    const { records } = readCsvExport(r.body as string);
    expect(records).toHaveLength(ARMS);
  });
});
