import { weightsSchema, type Weights } from "@/shared/schemas/requirements";
import { exportQuery } from "@/shared/schemas/shortlists";
import { rankArms, SUB_SCORE_KEYS } from "@/lib/analysis/ranking";
import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import {
  createShortlist, getRun, getRunResult, getShortlist, listRuns, listShortlists, repinShortlist, requestAnalysisRun, type RunInfo,
} from "@/lib/db";
import { startRunProcess } from "@/lib/jobs/analysis-runner";
import { complianceTable, rankingTable, taskMatrixTable, toCsv, toShortlistJson, toXlsx, type ExportMeta } from "@/lib/export";
import { badRequest, notFound } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route } from "@/lib/http/route";

/** Asks for a run of the current pins and starts the process when a new one was queued. */
async function runNow(shortlistId: string): Promise<{ run: RunInfo; cached: boolean }> {
  const r = await requestAnalysisRun(shortlistId);
  if (r.needsStart) await startRunProcess(r.run.id);
  return { run: r.run, cached: r.cached };
}

export const list = route(async (req) => {
  await requireUser(req, "shortlist:read");
  return json({ shortlists: await listShortlists() });
});

export const create = route(async (req) => {
  const user = await requireUser(req, "shortlist:write");
  const { id, pins } = await createShortlist(user.id, await readJsonObject(req));
  const { run, cached } = await runNow(id);
  return json({ id, pins, run, cached }, 201);
});

export const get = route<{ id: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:read");
  const { id } = await ctx.params;
  const shortlist = await getShortlist(id);
  if (!shortlist) throw notFound(`shortlist ${id} does not exist`);
  return json({ shortlist, runs: await listRuns(id) });
});

export const startRun = route<{ id: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:write");
  const { id } = await ctx.params;
  const { run, cached } = await runNow(id);
  return json({ run, cached }, cached ? 200 : 201);
});

export const repin = route<{ id: string }>(async (req, ctx) => {
  const user = await requireUser(req, "shortlist:write");
  const { id } = await ctx.params;
  const pins = await repinShortlist(user.id, id);
  const { run, cached } = await runNow(id);
  return json({ pins, run, cached });
});

async function runOf(shortlistId: string, runId: string): Promise<RunInfo> {
  const run = await getRun(runId);
  if (!run || run.shortlistId !== shortlistId) throw notFound(`shortlist ${shortlistId} has no analysis run ${runId}`);
  return run;
}

export const runStatus = route<{ id: string; runId: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:read");
  const { id, runId } = await ctx.params;
  return json({ run: await runOf(id, runId) });
});

/** `coverage:4,dexterity:2,…` → weights (missing keys keep the stored ones). */
export function parseWeightsParam(text: string, base: Weights): Weights {
  const out: Record<string, unknown> = { ...base };
  for (const part of text.split(",").filter(Boolean)) {
    const [k, v] = part.split(":");
    if (!(SUB_SCORE_KEYS as readonly string[]).includes(k)) {
      throw badRequest([{ path: "weights", message: `unknown weight ${JSON.stringify(k.slice(0, 40))}; use ${SUB_SCORE_KEYS.join(", ")}` }]);
    }
    out[k] = v !== undefined && v.trim() !== "" ? Number(v) : NaN;
  }
  return parseWith(weightsSchema, out, "weights");
}


const slug = (s: string) => s.normalize("NFKD").replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "shortlist";

export const exportResult = route<{ id: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:read");
  const { id } = await ctx.params;
  const q = parseWith(exportQuery, Object.fromEntries(new URL(req.url).searchParams));
  const shortlist = await getShortlist(id);
  if (!shortlist) throw notFound(`shortlist ${id} does not exist`);
  const runs = await listRuns(id);
  const run = q.run ? await runOf(id, q.run) : runs.find((r) => r.status === "done");
  if (!run) throw notFound(`shortlist ${id} has no finished analysis yet`);
  const analysis: ShortlistAnalysis | null = await getRunResult(run.id);
  if (!analysis || !run.pins) throw notFound(`analysis run ${run.id} has no result (status ${run.status})`);
  const weights = q.weights ? parseWeightsParam(q.weights, analysis.weights) : analysis.weights;
  const adjusted = SUB_SCORE_KEYS.some((k) => weights[k] !== analysis.weights[k]);
  const ranking = adjusted
    ? rankArms(analysis.arms.map((a) => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), weights)
    : analysis.ranking;
  const meta: ExportMeta = {
    shortlist: { id, name: shortlist.name },
    run: { id: run.id, finishedAt: run.finishedAt ? run.finishedAt.toISOString() : null },
    analysisVersion: analysis.version,
    requirement: { id: run.pins.requirement.setId, name: analysis.requirementSet.name, revision: run.pins.requirement.revision },
    arms: analysis.arms.map((a) => ({ id: a.id, name: a.name, revision: a.revision })),
    weights,
    weightsAdjusted: adjusted,
    caution: analysis.caution,
    exportedAt: new Date().toISOString(),
  };
  const base = `${slug(shortlist.name)}.run-${run.id.slice(0, 8)}`;
  const attach = (file: string, type: string, body: BodyInit) =>
    new Response(body, { status: 200, headers: { "content-type": type, "content-disposition": `attachment; filename="${file}"` } });
  if (q.format === "json") return attach(`${base}.json`, "application/json; charset=utf-8", toShortlistJson(meta, analysis, ranking));
  if (q.format === "xlsx") {
    const bytes = await toXlsx([rankingTable(analysis, ranking), taskMatrixTable(analysis), complianceTable(analysis)], meta);
    return attach(`${base}.xlsx`, "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", new Uint8Array(bytes));
  }
  const table = q.table === "compliance" ? complianceTable(analysis) : rankingTable(analysis, ranking);
  return attach(`${base}.${q.table ?? "ranking"}.csv`, "text/csv; charset=utf-8", "\uFEFF" + toCsv(table, meta));
});
