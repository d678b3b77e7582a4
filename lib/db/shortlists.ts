import "server-only";
import { randomUUID } from "node:crypto";
import { z } from "zod";
import { armSchema, requirementSetSchema, type ArmDocument, type ArmSpecs, type RequirementSet } from "@/shared/schemas";
import type { CreateShortlistInput } from "@/shared/schemas/shortlists";
import { analysisKey } from "@/lib/analysis/key";
import { ANALYSIS_VERSION, type RunArmView, type ShortlistAnalysis, type ShortlistArm } from "@/lib/analysis/shortlist";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { NotFoundError, ValidationError } from "./errors";
import { readStoredDocument, userRef, type UserRef } from "./documents";
import { listArms, type ArmSummary } from "./arms";
import { listRequirementSets, type RequirementSummary } from "./requirements";
import { unreadCounts, type UnreadCount } from "./comments";
import { hasStoredResult, readResult, readResultArm, storedForm, storeResultInTx, type ResultToStore } from "./results";

/**
 * A run analysed by a web server's own runner that has not reported progress for this long is
 * taken as dead (its server stopped; a restarted server also fails such runs at once). Runs on
 * the queue are never failed for silence: the queue gives a dead worker's job to another worker.
 */
export const STALE_RUN_MS = 2 * 60 * 1000;

/** Prefix of the runner name of runs analysed inside a web server ("local:<host>:<pid>"). */
export const LOCAL_RUNNER_PREFIX = "local:";

/**
 * Called inside the transaction that stores a new queued run, so the run and its queue job are
 * committed together (or neither is).
 */
export type EnqueueInTx = (tx: Tx, runId: string) => Promise<void>;

/** The revisions a shortlist (or one of its runs) is pinned to. */
export interface Pins {
  requirement: { setId: string; revision: number };
  arms: { armId: string; revision: number }[];
}

const pinsSchema = z.object({
  requirement: z.object({ setId: z.string(), revision: z.number().int() }),
  arms: z.array(z.object({ armId: z.string(), revision: z.number().int() })),
});

export type RunStatus = "queued" | "running" | "done" | "failed" | "cancelled";

/** One analysis run without its result. */
export interface RunInfo {
  id: string;
  shortlistId: string;
  key: string;
  analysisVersion: string;
  status: RunStatus;
  progress: number;
  stage: string | null;
  error: string | null;
  pins: Pins | null;
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
  reusedFromId: string | null;
  /** Claims of the run so far (a queue job taken over after its worker died counts again). */
  attempt: number;
  /** For a queued run: its place in the queue of all queued runs (1 = next), else null. */
  queuePosition: number | null;
}

/** A pinned item next to the current revision of what it pins. */
interface PinnedArm {
  armId: string;
  name: string;
  revision: number;
  currentRevision: number;
  deleted: boolean;
}

interface ShortlistRecord {
  id: string;
  name: string;
  createdAt: Date;
  updatedAt: Date;
  createdBy: UserRef | null;
  requirement: { setId: string; name: string; revision: number; currentRevision: number; deleted: boolean };
  arms: PinnedArm[];
  /** Human lines for every pin that has a newer revision ("arm X: rev 1 → 2"). */
  stale: string[];
}

interface ShortlistSummary {
  id: string;
  name: string;
  requirementName: string;
  requirementRevision: number;
  arms: number;
  createdAt: Date;
  createdBy: UserRef | null;
  latestRun: { id: string; status: RunStatus; finishedAt: Date | null } | null;
}


type RunRow = {
  id: string; shortlistId: string; key: string; analysisVersion: string; status: string; progress: number; stage: string | null;
  error: string | null; pins: string | null; createdAt: Date; startedAt: Date | null; finishedAt: Date | null; reusedFromId: string | null;
  attempt: number;
};

function toRunInfo(r: RunRow, queuePosition: number | null = null): RunInfo {
  let pins: Pins | null = null;
  if (r.pins) {
    const p = pinsSchema.safeParse(JSON.parse(r.pins));
    pins = p.success ? p.data : null;
  }
  return {
    id: r.id, shortlistId: r.shortlistId, key: r.key, analysisVersion: r.analysisVersion, status: r.status as RunStatus,
    progress: r.progress, stage: r.stage, error: r.error, pins, createdAt: r.createdAt, startedAt: r.startedAt,
    finishedAt: r.finishedAt, reusedFromId: r.reusedFromId, attempt: r.attempt,
    queuePosition: r.status === "queued" ? queuePosition : null,
  };
}

const runSelect = {
  id: true, shortlistId: true, key: true, analysisVersion: true, status: true, progress: true, stage: true, error: true,
  pins: true, createdAt: true, startedAt: true, finishedAt: true, reusedFromId: true, attempt: true,
} as const;

/** Place in the queue of a queued run: queued runs are taken oldest first (then by id). */
async function queuePosition(c: Tx, r: { id: string; createdAt: Date }): Promise<number> {
  const ahead = await c.analysisRun.count({
    where: { status: "queued", OR: [{ createdAt: { lt: r.createdAt } }, { createdAt: r.createdAt, id: { lt: r.id } }] },
  });
  return ahead + 1;
}

async function withPosition(c: Tx, r: RunRow): Promise<RunInfo> {
  return toRunInfo(r, r.status === "queued" ? await queuePosition(c, r) : null);
}

/**
 * Creates a shortlist pinned to the current revisions of the requirement set and the arms, and in
 * the same transaction its first analysis run (so no shortlist is ever left without one).
 */
export async function createShortlist(
  userId: string | null,
  body: CreateShortlistInput,
  opts: { enqueue?: EnqueueInTx } = {},
): Promise<{ id: string; pins: Pins; run: RunInfo; cached: boolean; needsStart: boolean }> {
  const id = randomUUID();
  return db().$transaction(async (tx) => {
    const set = await tx.requirementSet.findUnique({ where: { id: body.requirementSetId } });
    if (!set || set.deletedAt) throw new ValidationError([{ path: "requirementSetId", message: `requirement set ${body.requirementSetId} does not exist` }]);
    const arms = await tx.arm.findMany({ where: { id: { in: body.armIds }, deletedAt: null } });
    const byId = new Map(arms.map((a) => [a.id, a]));
    const missing = body.armIds.map((a, i) => ({ a, i })).filter((x) => !byId.has(x.a));
    if (missing.length) throw new ValidationError(missing.map((m) => ({ path: `armIds.${m.i}`, message: `arm ${m.a} does not exist` })));
    await tx.shortlist.create({ data: { id, name: body.name, requirementSetId: set.id, requirementRevision: set.currentRevision, createdById: userId } });
    const pins: Pins = {
      requirement: { setId: set.id, revision: set.currentRevision },
      arms: body.armIds.map((armId) => ({ armId, revision: byId.get(armId)!.currentRevision })),
    };
    await tx.shortlistArm.createMany({
      data: pins.arms.map((p, position) => ({ shortlistId: id, armId: p.armId, armRevision: p.revision, position })),
    });
    await recordAudit(tx, { actorId: userId, action: "shortlist.create", entityType: "shortlist", entityId: id, detail: pins });
    const inputs = await loadPinnedInputs(pins, tx);
    const first = await newRun(tx, id, pins, analysisKey(inputs.arms, inputs.requirementSet), opts.enqueue);
    return { id, pins, ...first };
  });
}

/** The pins a shortlist has now (arm order as chosen). */
async function getPins(shortlistId: string): Promise<Pins | null> {
  const s = await db().shortlist.findUnique({
    where: { id: shortlistId },
    select: { requirementSetId: true, requirementRevision: true, deletedAt: true, arms: { orderBy: { position: "asc" }, select: { armId: true, armRevision: true } } },
  });
  if (!s || s.deletedAt) return null;
  return { requirement: { setId: s.requirementSetId, revision: s.requirementRevision }, arms: s.arms.map((a) => ({ armId: a.armId, revision: a.armRevision })) };
}

/** A shortlist with its pins, the current revisions beside them, and what is out of date. */
export async function getShortlist(id: string): Promise<ShortlistRecord | null> {
  const s = await db().shortlist.findUnique({
    where: { id },
    include: {
      createdBy: { select: { id: true, name: true } },
      requirement: { select: { set: { select: { name: true, currentRevision: true, deletedAt: true } } } },
      arms: { orderBy: { position: "asc" }, include: { arm: { select: { arm: { select: { name: true, currentRevision: true, deletedAt: true } } } } } },
    },
  });
  if (!s || s.deletedAt) return null;
  const set = s.requirement.set;
  const arms: PinnedArm[] = s.arms.map((a) => ({
    armId: a.armId, name: a.arm.arm.name, revision: a.armRevision, currentRevision: a.arm.arm.currentRevision, deleted: a.arm.arm.deletedAt !== null,
  }));
  const stale: string[] = [];
  if (set.currentRevision !== s.requirementRevision) stale.push(`requirement set ${set.name}: revision ${s.requirementRevision} → ${set.currentRevision}`);
  for (const a of arms) if (a.currentRevision !== a.revision) stale.push(`arm ${a.name}: revision ${a.revision} → ${a.currentRevision}`);
  return {
    id: s.id, name: s.name, createdAt: s.createdAt, updatedAt: s.updatedAt, createdBy: userRef(s.createdBy),
    requirement: { setId: s.requirementSetId, name: set.name, revision: s.requirementRevision, currentRevision: set.currentRevision, deleted: set.deletedAt !== null },
    arms, stale,
  };
}

export async function listShortlists(): Promise<ShortlistSummary[]> {
  const rows = await db().shortlist.findMany({
    where: { deletedAt: null },
    orderBy: [{ createdAt: "desc" }, { id: "asc" }],
    include: {
      createdBy: { select: { id: true, name: true } },
      requirement: { select: { set: { select: { name: true } } } },
      _count: { select: { arms: true } },
      runs: { orderBy: { createdAt: "desc" }, take: 1, select: { id: true, status: true, finishedAt: true } },
    },
  });
  return rows.map((r) => ({
    id: r.id, name: r.name, requirementName: r.requirement.set.name, requirementRevision: r.requirementRevision, arms: r._count.arms,
    createdAt: r.createdAt, createdBy: userRef(r.createdBy),
    latestRun: r.runs[0] ? { id: r.runs[0].id, status: r.runs[0].status as RunStatus, finishedAt: r.runs[0].finishedAt } : null,
  }));
}

/** The shortlists list page: every shortlist with the member's unread comment counts. */
export async function listShortlistsFor(userId: string): Promise<(ShortlistSummary & { unread: UnreadCount })[]> {
  const rows = await listShortlists();
  // Comments by others since the member last read each shortlist's discussion.
  const unread = await unreadCounts(userId, rows.map((r) => r.id));
  return rows.map((r) => ({ ...r, unread: unread.get(r.id) ?? { unread: 0, mentions: 0 } }));
}

/** What a new shortlist is chosen from: the current arms and requirement sets. */
export async function getShortlistCatalog(): Promise<{ arms: ArmSummary[]; sets: RequirementSummary[] }> {
  const [arms, sets] = await Promise.all([listArms(), listRequirementSets()]);
  return { arms, sets };
}

/**
 * Moves every pin to the current revision (arms deleted since stay at their pinned revision).
 * Runs and their results are kept: each run records its own pins.
 */
export async function repinShortlist(userId: string | null, id: string): Promise<Pins> {
  return db().$transaction(async (tx) => {
    const s = await tx.shortlist.findUnique({ where: { id }, include: { arms: true } });
    if (!s || s.deletedAt) throw new NotFoundError(`shortlist ${id} does not exist`);
    const set = await tx.requirementSet.findUniqueOrThrow({ where: { id: s.requirementSetId } });
    const current = await tx.arm.findMany({ where: { id: { in: s.arms.map((a) => a.armId) } } });
    const byId = new Map(current.map((a) => [a.id, a]));
    const changed: string[] = [];
    if (set.currentRevision !== s.requirementRevision) {
      await tx.shortlist.update({ where: { id }, data: { requirementRevision: set.currentRevision } });
      changed.push(`requirement ${s.requirementRevision}→${set.currentRevision}`);
    }
    for (const a of s.arms) {
      const arm = byId.get(a.armId);
      if (arm && !arm.deletedAt && arm.currentRevision !== a.armRevision) {
        await tx.shortlistArm.update({ where: { shortlistId_armId: { shortlistId: id, armId: a.armId } }, data: { armRevision: arm.currentRevision } });
        changed.push(`${arm.name} ${a.armRevision}→${arm.currentRevision}`);
      }
    }
    if (changed.length) await tx.shortlist.update({ where: { id }, data: { updatedAt: new Date() } });
    await recordAudit(tx, { actorId: userId, action: "shortlist.repin", entityType: "shortlist", entityId: id, detail: { changed } });
    const arms = [...s.arms].sort((x, y) => x.position - y.position);
    return {
      requirement: { setId: s.requirementSetId, revision: set.currentRevision },
      arms: arms.map((a) => {
        const arm = byId.get(a.armId);
        return { armId: a.armId, revision: arm && !arm.deletedAt ? arm.currentRevision : a.armRevision };
      }),
    };
  });
}

/** Loads the pinned documents: the analysis input. */
export async function loadPinnedInputs(pins: Pins, c: Tx = db()): Promise<{ arms: ShortlistArm[]; requirementSet: RequirementSet }> {
  const req = await c.requirementRevision.findUnique({ where: { setId_revision: { setId: pins.requirement.setId, revision: pins.requirement.revision } } });
  if (!req) throw new NotFoundError(`requirement set ${pins.requirement.setId} has no revision ${pins.requirement.revision}`);
  const requirementSet = readStoredDocument(requirementSetSchema, req.document, `requirement set ${pins.requirement.setId} revision ${pins.requirement.revision}`);
  const revs = pins.arms.length
    ? await c.armRevision.findMany({ where: { OR: pins.arms.map((a) => ({ armId: a.armId, revision: a.revision })) } })
    : [];
  const byKey = new Map(revs.map((r) => [`${r.armId}@${r.revision}`, r]));
  const arms = pins.arms.map((p): ShortlistArm => {
    const r = byKey.get(`${p.armId}@${p.revision}`);
    if (!r) throw new NotFoundError(`arm ${p.armId} has no revision ${p.revision}`);
    const arm: ArmDocument = readStoredDocument(armSchema, r.document, `arm ${p.armId} revision ${p.revision}`);
    return { id: p.armId, revision: p.revision, arm };
  });
  return { arms, requirementSet };
}

/**
 * A new run of the pins in the transaction: a `done` copy of a finished run with the same key
 * (analysis version + content hash: a cache hit), else a `queued` run handed to `enqueue`.
 */
async function newRun(tx: Tx, shortlistId: string, pins: Pins, key: string, enqueue?: EnqueueInTx): Promise<{ run: RunInfo; cached: boolean; needsStart: boolean }> {
  const now = new Date();
  const done = await tx.analysisRun.findFirst({ where: { key, status: "done", resultKey: key, reusedFromId: null }, orderBy: { finishedAt: "desc" }, select: { id: true } })
    ?? await tx.analysisRun.findFirst({ where: { key, status: "done", resultKey: key }, orderBy: { finishedAt: "asc" }, select: { id: true } });
  const id = randomUUID();
  if (done && (await hasStoredResult(key, tx))) {
    // the new run refers to the stored result of the same key: nothing is copied
    const row = await tx.analysisRun.create({
      data: {
        id, shortlistId, key, analysisVersion: ANALYSIS_VERSION, status: "done", progress: 1, stage: "reused an earlier result with the same inputs",
        resultKey: key, pins: JSON.stringify(pins), createdAt: now, startedAt: now, finishedAt: now, reusedFromId: done.id,
      },
      select: runSelect,
    });
    return { run: toRunInfo(row), cached: true, needsStart: false };
  }
  const row = await tx.analysisRun.create({
    data: { id, shortlistId, key, analysisVersion: ANALYSIS_VERSION, status: "queued", progress: 0, stage: "queued", pins: JSON.stringify(pins), createdAt: now, heartbeatAt: now },
    select: runSelect,
  });
  await enqueue?.(tx, id);
  return { run: await withPosition(tx, row), cached: false, needsStart: true };
}

/**
 * Asks for an analysis of the shortlist's current pins. Returns, in this order of preference:
 * - this shortlist's unfinished run with the same key: nothing new starts;
 * - a finished run with the same key (analysis version + content hash): a `done` row is made for
 *   this shortlist that reuses the result (cache hit), unless the latest run of this shortlist is it;
 * - otherwise a new `queued` run, handed to `enqueue` in the same transaction; the caller starts
 *   it after the commit when it is not on a queue (`needsStart`).
 */
export async function requestAnalysisRun(shortlistId: string, opts: { enqueue?: EnqueueInTx } = {}): Promise<{ run: RunInfo; cached: boolean; needsStart: boolean }> {
  await failStaleRuns(shortlistId);
  const pins = await getPins(shortlistId);
  if (!pins) throw new NotFoundError(`shortlist ${shortlistId} does not exist`);
  const inputs = await loadPinnedInputs(pins);
  const key = analysisKey(inputs.arms, inputs.requirementSet);
  return db().$transaction(async (tx) => {
    const own = await tx.analysisRun.findFirst({ where: { shortlistId, key }, orderBy: { createdAt: "desc" }, select: runSelect });
    if (own && (own.status === "queued" || own.status === "running" || own.status === "done")) {
      const latest = await tx.analysisRun.findFirst({ where: { shortlistId }, orderBy: [{ createdAt: "desc" }, { id: "desc" }], select: { id: true } });
      if (own.status !== "done" || latest?.id === own.id) return { run: await withPosition(tx, own), cached: own.status === "done", needsStart: false };
    }
    return newRun(tx, shortlistId, pins, key, opts.enqueue);
  });
}

/** Marks runs of a web server's runner without a sign of life for STALE_RUN_MS as failed. */
async function failStaleRuns(shortlistId?: string, now: Date = new Date()): Promise<number> {
  const cutoff = new Date(now.getTime() - STALE_RUN_MS);
  const r = await db().analysisRun.updateMany({
    where: {
      ...(shortlistId ? { shortlistId } : {}), status: "running", runner: { startsWith: LOCAL_RUNNER_PREFIX },
      OR: [{ heartbeatAt: { lt: cutoff } }, { heartbeatAt: null, createdAt: { lt: cutoff } }],
    },
    data: { status: "failed", error: `the analysis stopped reporting progress for more than ${STALE_RUN_MS / 60000} minutes and was given up`, finishedAt: now },
  });
  return r.count;
}

/** One run (stale ones failed first), or null. */
export async function getRun(runId: string): Promise<RunInfo | null> {
  const row = await db().analysisRun.findUnique({ where: { id: runId }, select: runSelect });
  if (!row) return null;
  if (row.status === "running") {
    if (await failStaleRuns(row.shortlistId)) return getRun(runId);
  }
  return withPosition(db(), row);
}

/** Runs of a shortlist, newest first (stale ones failed first). */
export async function listRuns(shortlistId: string): Promise<RunInfo[]> {
  await failStaleRuns(shortlistId);
  const rows = await db().analysisRun.findMany({ where: { shortlistId }, orderBy: [{ createdAt: "desc" }, { id: "desc" }], select: runSelect });
  return Promise.all(rows.map((r) => withPosition(db(), r)));
}

/** The stored result of a finished run (assembled arm by arm, see ./results), or null. */
export async function getRunResult(runId: string): Promise<ShortlistAnalysis | null> {
  const row = await db().analysisRun.findUnique({ where: { id: runId }, select: { status: true, resultKey: true } });
  if (!row || row.status !== "done" || !row.resultKey) return null;
  return readResult(row.resultKey);
}

/** The analysis key of a finished run's stored result, or null (not finished, or nothing stored). */
export async function getRunResultKey(runId: string): Promise<string | null> {
  const row = await db().analysisRun.findUnique({ where: { id: runId }, select: { status: true, resultKey: true } });
  return row && row.status === "done" ? row.resultKey : null;
}

/**
 * The analysis of one arm in a finished run, with the arm and requirement-set revisions the run
 * was pinned to. Throws NotFoundError (with the reason) when the run is not this shortlist's, has
 * no result, or does not include the arm.
 */
export async function getRunArmView(shortlistId: string, runId: string, armId: string): Promise<RunArmView> {
  const run = await getRun(runId);
  if (!run || run.shortlistId !== shortlistId) throw new NotFoundError(`shortlist ${shortlistId} has no analysis run ${runId}`);
  const key = run.status === "done" ? await getRunResultKey(runId) : null;
  if (!key || !run.pins) throw new NotFoundError(`analysis run ${runId} has no result (status ${run.status})`);
  const position = run.pins.arms.findIndex((a) => a.armId === armId);
  const pin = run.pins.arms[position];
  // the result's arms are in the pins' order: read that one arm alone
  const stored = position >= 0 ? await readResultArm(key, position) : null;
  const analysis = stored?.id === armId ? stored : position >= 0 ? (await getRunResult(runId))?.arms.find((a) => a.id === armId) : undefined;
  if (!pin || !analysis) throw new NotFoundError(`analysis run ${runId} does not include arm ${armId}`);
  const inputs = await loadPinnedInputs({ requirement: run.pins.requirement, arms: [pin] });
  return { runId, armId, revision: pin.revision, arm: inputs.arms[0].arm, requirementSet: inputs.requirementSet, analysis };
}

/**
 * Claims a run for one attempt: queued → running with the attempt count raised by one; with
 * `takeOver` also a running run (its queue job came back after the worker running it died).
 * Returns the attempt number that owns the run now, or null when it is finished, cancelled or
 * claimed by someone else meanwhile. Every later write names the attempt, so the writes of an
 * earlier attempt that is still alive somewhere change nothing.
 */
export async function claimRun(runId: string, runner: string, opts: { takeOver?: boolean } = {}): Promise<number | null> {
  const row = await db().analysisRun.findUnique({ where: { id: runId }, select: { status: true, attempt: true } });
  if (!row || !(row.status === "queued" || (opts.takeOver && row.status === "running"))) return null;
  const now = new Date();
  const r = await db().analysisRun.updateMany({
    where: { id: runId, attempt: row.attempt, status: row.status },
    data: { status: "running", attempt: row.attempt + 1, runner, startedAt: now, heartbeatAt: now, progress: 0, stage: "starting", error: null },
  });
  return r.count === 1 ? row.attempt + 1 : null;
}

/** Progress of the current attempt; false when the run is no longer this attempt's (cancelled, failed, taken over). */
export async function reportRunProgress(runId: string, attempt: number, progress: number, stage: string): Promise<boolean> {
  const r = await db().analysisRun.updateMany({
    where: { id: runId, status: "running", attempt },
    data: { progress: Math.min(1, Math.max(0, progress)), stage: stage.slice(0, 300), heartbeatAt: new Date() },
  });
  return r.count === 1;
}

/**
 * Stores the result of the current attempt (once per analysis key: a result already stored with
 * the run's key is referred to, not stored again); false (nothing stored) when the run is no
 * longer its own. A fresh result is put in its stored form here; the runner hands over the stored
 * form its thread made.
 */
export async function finishRun(runId: string, attempt: number, result: ResultToStore): Promise<boolean> {
  const stored = storedForm(result);
  return db().$transaction(async (tx) => {
    const run = await tx.analysisRun.findUnique({ where: { id: runId }, select: { key: true, analysisVersion: true, status: true, attempt: true } });
    if (!run || run.status !== "running" || run.attempt !== attempt) return false;
    await storeResultInTx(tx, run.key, run.analysisVersion, stored);
    const now = new Date();
    const r = await tx.analysisRun.updateMany({
      where: { id: runId, status: "running", attempt },
      data: { status: "done", progress: 1, stage: "done", resultKey: run.key, finishedAt: now, heartbeatAt: now },
    });
    return r.count === 1;
  });
}

/** Fails an unfinished run (only the given attempt's, when one is named). */
export async function failRun(runId: string, message: string, attempt?: number): Promise<boolean> {
  const now = new Date();
  const r = await db().analysisRun.updateMany({
    where: { id: runId, status: { in: ["queued", "running"] }, ...(attempt !== undefined ? { attempt } : {}) },
    data: { status: "failed", error: message.slice(0, 2000), finishedAt: now, heartbeatAt: now },
  });
  return r.count === 1;
}

/** Puts the current attempt's run back in the queue (it will be tried again), with a note. */
export async function requeueRun(runId: string, attempt: number, note: string): Promise<boolean> {
  const r = await db().analysisRun.updateMany({
    where: { id: runId, status: "running", attempt },
    data: { status: "queued", progress: 0, stage: note.slice(0, 300), heartbeatAt: new Date() },
  });
  return r.count === 1;
}

/**
 * Cancels a queued or running run: its runner stops it at the next progress report. Returns the
 * run afterwards (unchanged when it had already finished), or null when it does not exist.
 */
export async function cancelRun(userId: string | null, runId: string): Promise<RunInfo | null> {
  const now = new Date();
  const user = userId ? await db().user.findUnique({ where: { id: userId }, select: { name: true } }) : null;
  const r = await db().analysisRun.updateMany({
    where: { id: runId, status: { in: ["queued", "running"] } },
    data: { status: "cancelled", error: `cancelled${user ? ` by ${user.name}` : ""}`, finishedAt: now, heartbeatAt: now },
  });
  if (r.count === 1) {
    const row = await db().analysisRun.findUniqueOrThrow({ where: { id: runId }, select: { shortlistId: true } });
    await recordAudit(db(), { actorId: userId, action: "shortlist.run.cancel", entityType: "shortlist", entityId: row.shortlistId, detail: { runId } });
  }
  return getRun(runId);
}

/** Ids of the queued runs, oldest first (the order they are taken in). */
export async function listQueuedRunIds(): Promise<string[]> {
  const rows = await db().analysisRun.findMany({ where: { status: "queued" }, orderBy: [{ createdAt: "asc" }, { id: "asc" }], select: { id: true } });
  return rows.map((r) => r.id);
}

/** Ids of the queued and running runs. */
export async function listUnfinishedRunIds(): Promise<string[]> {
  const rows = await db().analysisRun.findMany({ where: { status: { in: ["queued", "running"] } }, select: { id: true } });
  return rows.map((r) => r.id);
}

/** Runner names of the running runs whose runner name starts with `prefix`. */
export async function listRunners(prefix: string): Promise<string[]> {
  const rows = await db().analysisRun.findMany({ where: { status: "running", runner: { startsWith: prefix } }, distinct: ["runner"], select: { runner: true } });
  return rows.map((r) => r.runner!).filter(Boolean);
}

/** Fails every running run of one runner (its process is gone). */
export async function failRunsOfRunner(runner: string, message: string): Promise<number> {
  const now = new Date();
  const r = await db().analysisRun.updateMany({ where: { status: "running", runner }, data: { status: "failed", error: message, finishedAt: now, heartbeatAt: now } });
  return r.count;
}

/** Counts of runs by state (health and admin page). */
export async function countRunsByStatus(): Promise<Record<RunStatus, number>> {
  const groups = await db().analysisRun.groupBy({ by: ["status"], _count: { _all: true } });
  const out: Record<RunStatus, number> = { queued: 0, running: 0, done: 0, failed: 0, cancelled: 0 };
  for (const g of groups) if (g.status in out) out[g.status as RunStatus] = g._count._all;
  return out;
}

/**
 * What a share link's view is built from, in one read: the shortlist, the pinned arms' specs
 * (only when `prices` is asked for; they carry the prices), and the latest finished run with its
 * result (null when there is none yet).
 */
export async function getSharedShortlist(
  shortlistId: string,
  opts: { prices: boolean },
): Promise<{ shortlist: ShortlistRecord; specs: Map<string, ArmSpecs>; run: RunInfo | null; result: ShortlistAnalysis | null } | null> {
  const shortlist = await getShortlist(shortlistId);
  if (!shortlist) return null;
  const specs = new Map<string, ArmSpecs>();
  if (opts.prices) {
    const pins = await getPins(shortlist.id);
    for (const a of pins ? (await loadPinnedInputs(pins)).arms : []) if (a.arm.specs) specs.set(a.id, a.arm.specs);
  }
  const run = (await listRuns(shortlist.id)).find((r) => r.status === "done") ?? null;
  const result = run ? await getRunResult(run.id) : null;
  return { shortlist, specs, run, result };
}

/** Everything the shortlist page shows, in one read. */
interface ShortlistPageData {
  shortlist: ShortlistRecord;
  /** Newest first. */
  runs: RunInfo[];
  /** The run asked for, else the latest finished one; null when there is none (or no such run). */
  shown: RunInfo | null;
  /** The shown run's result when it is done. */
  analysis: ShortlistAnalysis | null;
  /** The pinned documents' names, for what comments can be about. */
  pinned: { arms: { id: string; name: string }[]; targets: string[]; paths: string[]; specs: RequirementSet["specs"] };
}

/** The shortlist page's data: the shortlist, its runs, the shown run and result, the pinned names. */
export async function getShortlistPage(id: string, opts: { run?: string } = {}): Promise<ShortlistPageData | null> {
  const shortlist = await getShortlist(id);
  if (!shortlist) return null;
  const runs = await listRuns(id);
  const shown = opts.run ? runs.find((r) => r.id === opts.run) ?? null : runs.find((r) => r.status === "done") ?? null;
  const analysis = shown && shown.status === "done" ? await getRunResult(shown.id) : null;
  const pins = await getPins(id);
  const inputs = pins ? await loadPinnedInputs(pins) : null;
  const pinned = {
    arms: (inputs?.arms ?? []).map((a) => ({ id: a.id, name: a.arm.name })),
    targets: (inputs?.requirementSet.targets ?? []).map((t) => t.name),
    paths: (inputs?.requirementSet.paths ?? []).map((p) => p.name),
    specs: inputs?.requirementSet.specs ?? [],
  };
  return { shortlist, runs, shown, analysis, pinned };
}
