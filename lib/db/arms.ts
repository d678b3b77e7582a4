import { randomUUID } from "node:crypto";
import { armSchema, type ArmDocument, type ArmSpecs } from "@/shared/schemas";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { jsonDiff, summarizeChanges } from "./diff";
import { ConflictError, NotFoundError, ValidationError } from "./errors";
import { deletedWhere, isUniqueViolation, parseDocument, readStoredDocument, userRef, type DeletedFilter, type UserRef } from "./documents";

/** One row of the arm catalog. */
export interface ArmSummary {
  id: string;
  name: string;
  maker: string | null;
  modelCode: string | null;
  axes: number;
  revision: number;
  updatedAt: Date;
  updatedBy: UserRef | null;
  deletedAt: Date | null;
  specs: ArmSpecs;
}

/** An arm at its current revision. */
export interface ArmRecord {
  id: string;
  revision: number;
  arm: ArmDocument;
  createdAt: Date;
  updatedAt: Date;
  deletedAt: Date | null;
}

export interface ArmRevisionInfo {
  revision: number;
  createdAt: Date;
  author: UserRef | null;
  summary: string;
}

export interface ArmRevisionRecord {
  revision: number;
  arm: ArmDocument;
  createdAt: Date;
  author: UserRef | null;
}

const readArm = (json: string, id: string, revision: number): ArmDocument =>
  readStoredDocument(armSchema, json, `arm ${id} revision ${revision}`);

const mirrored = (arm: ArmDocument) => ({
  name: arm.name,
  maker: arm.maker ?? null,
  modelCode: arm.modelCode ?? null,
  axes: arm.joints.length,
});

export async function listArms(opts: { deleted?: DeletedFilter } = {}): Promise<ArmSummary[]> {
  const rows = await db().arm.findMany({
    where: deletedWhere(opts.deleted),
    orderBy: [{ name: "asc" }, { id: "asc" }],
    include: { updatedBy: { select: { id: true, name: true } } },
  });
  if (rows.length === 0) return [];
  const revisions = await db().armRevision.findMany({
    where: { OR: rows.map((r) => ({ armId: r.id, revision: r.currentRevision })) },
    select: { armId: true, revision: true, document: true },
  });
  const docs = new Map(revisions.map((r) => [r.armId, readArm(r.document, r.armId, r.revision)]));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    maker: r.maker,
    modelCode: r.modelCode,
    axes: r.axes,
    revision: r.currentRevision,
    updatedAt: r.updatedAt,
    updatedBy: userRef(r.updatedBy),
    deletedAt: r.deletedAt,
    specs: docs.get(r.id)?.specs ?? {},
  }));
}

export async function getArm(id: string): Promise<ArmRecord | null> {
  const row = await db().arm.findUnique({ where: { id } });
  if (!row) return null;
  const rev = await db().armRevision.findUnique({ where: { armId_revision: { armId: id, revision: row.currentRevision } } });
  if (!rev) throw new Error(`arm ${id} has no revision ${row.currentRevision}`);
  return {
    id,
    revision: row.currentRevision,
    arm: readArm(rev.document, id, rev.revision),
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    deletedAt: row.deletedAt,
  };
}

/** Revision history, newest first; null when the arm does not exist. */
export async function listArmRevisions(id: string): Promise<ArmRevisionInfo[] | null> {
  const exists = await db().arm.findUnique({ where: { id }, select: { id: true } });
  if (!exists) return null;
  const revs = await db().armRevision.findMany({
    where: { armId: id },
    orderBy: { revision: "desc" },
    select: { revision: true, createdAt: true, summary: true, author: { select: { id: true, name: true } } },
  });
  return revs.map((r) => ({ revision: r.revision, createdAt: r.createdAt, author: userRef(r.author), summary: r.summary }));
}

export async function getArmRevision(id: string, revision: number): Promise<ArmRevisionRecord | null> {
  if (!Number.isInteger(revision) || revision < 1) return null;
  const r = await db().armRevision.findUnique({
    where: { armId_revision: { armId: id, revision } },
    include: { author: { select: { id: true, name: true } } },
  });
  if (!r) return null;
  return { revision: r.revision, arm: readArm(r.document, id, r.revision), createdAt: r.createdAt, author: userRef(r.author) };
}

/** Stores a new arm as revision 1. `input` is validated with armSchema. */
export async function createArm(
  userId: string | null,
  input: unknown,
  opts: { action?: "create" | "import" } = {},
): Promise<{ id: string; revision: 1; arm: ArmDocument }> {
  const arm = parseDocument(armSchema, input);
  const id = randomUUID();
  const now = new Date();
  await db().$transaction(async (tx) => {
    await tx.arm.create({ data: { id, ...mirrored(arm), currentRevision: 1, createdAt: now, updatedAt: now, updatedById: userId } });
    await tx.armRevision.create({
      data: {
        id: randomUUID(),
        armId: id,
        revision: 1,
        document: JSON.stringify(arm),
        summary: opts.action === "import" ? "imported" : "created",
        authorId: userId,
        createdAt: now,
      },
    });
    await recordAudit(tx, { actorId: userId, action: `arm.${opts.action ?? "create"}`, entityType: "arm", entityId: id, detail: { revision: 1 } });
  });
  return { id, revision: 1, arm };
}

async function conflictFor(tx: Tx, id: string, baseRevision: number): Promise<Error> {
  const row = await tx.arm.findUnique({ where: { id } });
  if (!row) return new NotFoundError(`arm ${id} does not exist`);
  if (row.deletedAt) return new NotFoundError(`arm ${id} is deleted; restore it before editing`);
  if (baseRevision > row.currentRevision) {
    return new ValidationError([
      { path: "baseRevision", message: `revision ${baseRevision} does not exist; the current revision is ${row.currentRevision}` },
    ]);
  }
  const [base, current] = await Promise.all([
    tx.armRevision.findUniqueOrThrow({ where: { armId_revision: { armId: id, revision: baseRevision } } }),
    tx.armRevision.findUniqueOrThrow({ where: { armId_revision: { armId: id, revision: row.currentRevision } } }),
  ]);
  const currentDoc = readArm(current.document, id, current.revision);
  const changes = jsonDiff(readArm(base.document, id, base.revision), currentDoc);
  return new ConflictError<ArmDocument>({
    message: `arm ${id} was changed by someone else: your edit is based on revision ${baseRevision}, the current revision is ${row.currentRevision}`,
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
 * unique (armId, revision) index is a second guard.
 */
export async function updateArm(
  userId: string | null,
  id: string,
  baseRevision: number,
  input: unknown,
): Promise<{ id: string; revision: number; arm: ArmDocument }> {
  if (!Number.isInteger(baseRevision) || baseRevision < 1) {
    throw new ValidationError([{ path: "baseRevision", message: "must be a revision number (integer ≥ 1)" }]);
  }
  const arm = parseDocument(armSchema, input);
  const revision = baseRevision + 1;
  try {
    return await db().$transaction(async (tx) => {
      const now = new Date();
      const claimed = await tx.arm.updateMany({
        where: { id, currentRevision: baseRevision, deletedAt: null },
        data: { ...mirrored(arm), currentRevision: revision, updatedAt: now, updatedById: userId },
      });
      if (claimed.count !== 1) throw await conflictFor(tx, id, baseRevision);
      const previous = await tx.armRevision.findUniqueOrThrow({ where: { armId_revision: { armId: id, revision: baseRevision } } });
      const changes = jsonDiff(readArm(previous.document, id, baseRevision), arm);
      await tx.armRevision.create({
        data: { id: randomUUID(), armId: id, revision, document: JSON.stringify(arm), summary: summarizeChanges(changes), authorId: userId, createdAt: now },
      });
      await recordAudit(tx, { actorId: userId, action: "arm.update", entityType: "arm", entityId: id, detail: { revision, changed: changes.length } });
      return { id, revision, arm };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw await db().$transaction((tx) => conflictFor(tx, id, baseRevision));
    throw err;
  }
}

async function setDeleted(userId: string | null, id: string, deleted: boolean): Promise<{ id: string; deletedAt: Date | null }> {
  return db().$transaction(async (tx) => {
    const row = await tx.arm.findUnique({ where: { id }, select: { deletedAt: true } });
    if (!row) throw new NotFoundError(`arm ${id} does not exist`);
    if ((row.deletedAt !== null) === deleted) return { id, deletedAt: row.deletedAt };
    const deletedAt = deleted ? new Date() : null;
    await tx.arm.update({ where: { id }, data: { deletedAt } });
    await recordAudit(tx, { actorId: userId, action: deleted ? "arm.delete" : "arm.restore", entityType: "arm", entityId: id });
    return { id, deletedAt };
  });
}

/** Marks the arm deleted (revisions stay); idempotent. */
export const softDeleteArm = (userId: string | null, id: string) => setDeleted(userId, id, true);
/** Clears the deleted mark; idempotent. */
export const restoreArm = (userId: string | null, id: string) => setDeleted(userId, id, false);

export async function countArms(): Promise<number> {
  return db().arm.count();
}
