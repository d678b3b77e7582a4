import { createShortlistInput, exportQuery, runViewQuery, weightsParam } from "@/shared/schemas/shortlists";
import { getRun, getRunArmView, getRunResultKey, getShortlist, listRuns, listShortlists, readResultArms, readResultHead, type RunInfo } from "@/lib/db";
import { cancelRun, createShortlistWithRun, repinAndRun, requestRun } from "@/lib/jobs/runs";
import { shortlistExportStream } from "@/lib/export";
import { notFound } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { download, json, parseWith, requireUser, route } from "@/lib/http/route";

export const list = route(async (req) => {
  await requireUser(req, "shortlist:read");
  return json({ shortlists: await listShortlists() });
});

export const create = route(async (req) => {
  const user = await requireUser(req, "shortlist:write");
  const { id, pins, run, cached } = await createShortlistWithRun(user.id, parseWith(createShortlistInput, await readJsonObject(req)));
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
  const { run, cached } = await requestRun(id);
  return json({ run, cached }, cached ? 200 : 201);
});

export const repin = route<{ id: string }>(async (req, ctx) => {
  const user = await requireUser(req, "shortlist:write");
  const { id } = await ctx.params;
  const { pins, run, cached } = await repinAndRun(user.id, id);
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

/** Stops a queued or running analysis (at its next progress point); a finished run is returned unchanged. */
export const cancel = route<{ id: string; runId: string }>(async (req, ctx) => {
  const user = await requireUser(req, "shortlist:write");
  const { id, runId } = await ctx.params;
  await runOf(id, runId);
  return json({ run: await cancelRun(user.id, runId) });
});

/** One arm of a finished run with the pinned documents: what the 3-D view of the shortlist page draws. */
export const runArmView = route<{ id: string; runId: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:read");
  const { id, runId } = await ctx.params;
  const q = parseWith(runViewQuery, Object.fromEntries(new URL(req.url).searchParams));
  return json(await getRunArmView(id, runId, q.arm));
});

/**
 * A shortlist's export, written as it is sent (lib/export shortlistExportStream): the stored
 * result is read arm by arm, never parsed or serialised in one piece on this thread.
 */
export const exportResult = route<{ id: string }>(async (req, ctx) => {
  await requireUser(req, "shortlist:read");
  const { id } = await ctx.params;
  const q = parseWith(exportQuery, Object.fromEntries(new URL(req.url).searchParams));
  const shortlist = await getShortlist(id);
  if (!shortlist) throw notFound(`shortlist ${id} does not exist`);
  const runs = await listRuns(id);
  const run = q.run ? await runOf(id, q.run) : runs.find((r) => r.status === "done");
  if (!run) throw notFound(`shortlist ${id} has no finished analysis yet`);
  const key = await getRunResultKey(run.id);
  const head = key ? await readResultHead(key) : null;
  if (!key || !head || !run.pins) throw notFound(`analysis run ${run.id} has no result (status ${run.status})`);
  const file = await shortlistExportStream({
    shortlist: { id, name: shortlist.name },
    run: { id: run.id, finishedAt: run.finishedAt, requirement: run.pins.requirement },
    source: { head, arms: () => readResultArms(key) },
    format: q.format,
    table: q.table,
    weights: q.weights ? parseWith(weightsParam(head.weights), q.weights, "weights") : undefined,
    exportedAt: new Date(),
  });
  return download(file);
});
