import { randomUUID } from "node:crypto";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { jsonDiff, summarizeChanges } from "./diff";
import { ConflictError, NotFoundError, ValidationError } from "./errors";
import { deletedWhere, isUniqueViolation, parseDocument, readStoredDocument, userRef, type DeletedFilter, type UserRef } from "./documents";

/** One row of the requirement-set list. */
export interface RequirementSummary {
  id: string;
  name: string;
  targets: number;
  paths: number;
  revision: number;
  updatedAt: Date;
  updatedBy: UserRef | null;
  deletedAt: Date | null;
}

/** A requirement set at its current revision. */
export interface RequirementRecord {
  id: string;
  revision: number;
  requirementSet: RequirementSet;
  createdAt: Date;
  updatedAt: Date;
  deletedAt: Date | null;
}

export interface RequirementRevisionInfo {
  revision: number;
  createdAt: Date;
  author: UserRef | null;
  summary: string;
}

export interface RequirementRevisionRecord {
  revision: number;
  requirementSet: RequirementSet;
  createdAt: Date;
  author: UserRef | null;
}

const readSet = (json: string, id: string, revision: number): RequirementSet =>
  readStoredDocument(requirementSetSchema, json, `requirement set ${id} revision ${revision}`);

const mirrored = (set: RequirementSet) => ({
  name: set.name,
  targets: set.targets.length,
  paths: set.paths.length,
});

export async function listRequirementSets(opts: { deleted?: DeletedFilter } = {}): Promise<RequirementSummary[]> {
  const rows = await db().requirementSet.findMany({
    where: deletedWhere(opts.deleted),
    orderBy: [{ name: "asc" }, { id: "asc" }],
    include: { updatedBy: { select: { id: true, name: true } } },
  });
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    targets: r.targets,
    paths: r.paths,
    revision: r.currentRevision,
    updatedAt: r.updatedAt,
    updatedBy: userRef(r.updatedBy),
    deletedAt: r.deletedAt,
  }));
}

export async function getRequirementSet(id: string): Promise<RequirementRecord | null> {
  const row = await db().requirementSet.findUnique({ where: { id } });
  if (!row) return null;
  const rev = await db().requirementRevision.findUnique({ where: { setId_revision: { setId: id, revision: row.currentRevision } } });
  if (!rev) throw new Error(`requirement set ${id} has no revision ${row.currentRevision}`);
  return {
    id,
    revision: row.currentRevision,
    requirementSet: readSet(rev.document, id, rev.revision),
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    deletedAt: row.deletedAt,
  };
}

/** Revision history, newest first; null when the set does not exist. */
export async function listRequirementRevisions(id: string): Promise<RequirementRevisionInfo[] | null> {
  const exists = await db().requirementSet.findUnique({ where: { id }, select: { id: true } });
  if (!exists) return null;
  const revs = await db().requirementRevision.findMany({
    where: { setId: id },
    orderBy: { revision: "desc" },
    select: { revision: true, createdAt: true, summary: true, author: { select: { id: true, name: true } } },
  });
  return revs.map((r) => ({ revision: r.revision, createdAt: r.createdAt, author: userRef(r.author), summary: r.summary }));
}

export async function getRequirementRevision(id: string, revision: number): Promise<RequirementRevisionRecord | null> {
  if (!Number.isInteger(revision) || revision < 1) return null;
  const r = await db().requirementRevision.findUnique({
    where: { setId_revision: { setId: id, revision } },
    include: { author: { select: { id: true, name: true } } },
  });
  if (!r) return null;
  return { revision: r.revision, requirementSet: readSet(r.document, id, r.revision), createdAt: r.createdAt, author: userRef(r.author) };
}

/** Stores a new requirement set as revision 1. `input` is validated with requirementSetSchema (defaults applied). */
export async function createRequirementSet(
  userId: string | null,
  input: unknown,
  opts: { action?: "create" | "import" } = {},
): Promise<{ id: string; revision: 1; requirementSet: RequirementSet }> {
  const set = parseDocument(requirementSetSchema, input);
  const id = randomUUID();
  const now = new Date();
  await db().$transaction(async (tx) => {
    await tx.requirementSet.create({ data: { id, ...mirrored(set), currentRevision: 1, createdAt: now, updatedAt: now, updatedById: userId } });
    await tx.requirementRevision.create({
      data: {
        id: randomUUID(),
        setId: id,
        revision: 1,
        document: JSON.stringify(set),
        summary: opts.action === "import" ? "imported" : "created",
        authorId: userId,
        createdAt: now,
      },
    });
    await recordAudit(tx, { actorId: userId, action: `requirement.${opts.action ?? "create"}`, entityType: "requirement", entityId: id, detail: { revision: 1 } });
  });
  return { id, revision: 1, requirementSet: set };
}

async function conflictFor(tx: Tx, id: string, baseRevision: number): Promise<Error> {
  const row = await tx.requirementSet.findUnique({ where: { id } });
  if (!row) return new NotFoundError(`requirement set ${id} does not exist`);
  if (row.deletedAt) return new NotFoundError(`requirement set ${id} is deleted; restore it before editing`);
  if (baseRevision > row.currentRevision) {
    return new ValidationError([
      { path: "baseRevision", message: `revision ${baseRevision} does not exist; the current revision is ${row.currentRevision}` },
    ]);
  }
  const [base, current] = await Promise.all([
    tx.requirementRevision.findUniqueOrThrow({ where: { setId_revision: { setId: id, revision: baseRevision } } }),
    tx.requirementRevision.findUniqueOrThrow({ where: { setId_revision: { setId: id, revision: row.currentRevision } } }),
  ]);
  const currentDoc = readSet(current.document, id, current.revision);
  const changes = jsonDiff(readSet(base.document, id, base.revision), currentDoc);
  return new ConflictError<RequirementSet>({
    message: `requirement set ${id} was changed by someone else: your edit is based on revision ${baseRevision}, the current revision is ${row.currentRevision}`,
    baseRevision,
    currentRevision: row.currentRevision,
    current: currentDoc,
    changes,
  });
}

/**
 * Saves a new revision if `baseRevision` is still the current one; otherwise throws ConflictError
 * with what changed since. The first statement claims the row with a conditional UPDATE, so two
 * racing saves from the same base serialize on SQLite's write lock and exactly one wins; the
 * unique (setId, revision) index is a second guard.
 */
export async function updateRequirementSet(
  userId: string | null,
  id: string,
  baseRevision: number,
  input: unknown,
): Promise<{ id: string; revision: number; requirementSet: RequirementSet }> {
  if (!Number.isInteger(baseRevision) || baseRevision < 1) {
    throw new ValidationError([{ path: "baseRevision", message: "must be a revision number (integer ≥ 1)" }]);
  }
  const set = parseDocument(requirementSetSchema, input);
  const revision = baseRevision + 1;
  try {
    return await db().$transaction(async (tx) => {
      const now = new Date();
      const claimed = await tx.requirementSet.updateMany({
        where: { id, currentRevision: baseRevision, deletedAt: null },
        data: { ...mirrored(set), currentRevision: revision, updatedAt: now, updatedById: userId },
      });
      if (claimed.count !== 1) throw await conflictFor(tx, id, baseRevision);
      const previous = await tx.requirementRevision.findUniqueOrThrow({ where: { setId_revision: { setId: id, revision: baseRevision } } });
      const changes = jsonDiff(readSet(previous.document, id, baseRevision), set);
      await tx.requirementRevision.create({
        data: { id: randomUUID(), setId: id, revision, document: JSON.stringify(set), summary: summarizeChanges(changes), authorId: userId, createdAt: now },
      });
      await recordAudit(tx, { actorId: userId, action: "requirement.update", entityType: "requirement", entityId: id, detail: { revision, changed: changes.length } });
      return { id, revision, requirementSet: set };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw await db().$transaction((tx) => conflictFor(tx, id, baseRevision));
    throw err;
  }
}

async function setDeleted(userId: string | null, id: string, deleted: boolean): Promise<{ id: string; deletedAt: Date | null }> {
  return db().$transaction(async (tx) => {
    const row = await tx.requirementSet.findUnique({ where: { id }, select: { deletedAt: true } });
    if (!row) throw new NotFoundError(`requirement set ${id} does not exist`);
    if ((row.deletedAt !== null) === deleted) return { id, deletedAt: row.deletedAt };
    const deletedAt = deleted ? new Date() : null;
    await tx.requirementSet.update({ where: { id }, data: { deletedAt } });
    await recordAudit(tx, { actorId: userId, action: deleted ? "requirement.delete" : "requirement.restore", entityType: "requirement", entityId: id });
    return { id, deletedAt };
  });
}

/** Marks the requirement set deleted (revisions stay); idempotent. */
export const softDeleteRequirementSet = (userId: string | null, id: string) => setDeleted(userId, id, true);
/** Clears the deleted mark; idempotent. */
export const restoreRequirementSet = (userId: string | null, id: string) => setDeleted(userId, id, false);

export async function countRequirementSets(): Promise<number> {
  return db().requirementSet.count();
}
