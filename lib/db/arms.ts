import "server-only";
import { armSchema, type ArmDocument, type ArmSpecs } from "@/shared/schemas";
import type { Arm } from "./generated/client";
import type { DeletedFilter, UserRef } from "./documents";
import * as revisioned from "./revisioned";
import { byName, userColumns, type RevisionedKind, type RevisionInfo } from "./revisioned";

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
interface ArmRecord {
  id: string;
  revision: number;
  arm: ArmDocument;
  createdAt: Date;
  updatedAt: Date;
  deletedAt: Date | null;
}

type ArmRevisionInfo = RevisionInfo;

interface ArmRevisionRecord {
  revision: number;
  arm: ArmDocument;
  createdAt: Date;
  author: UserRef | null;
}

const armRev = (armId: string, revision: number) => ({ armId_revision: { armId, revision } });

/** Arms: head table `arm`, revisions in `armRevision` keyed by (armId, revision). */
const arms: RevisionedKind<typeof armSchema, "arm", { name: string; maker: string | null; modelCode: string | null; axes: number }, Arm> = {
  key: "arm",
  noun: "arm",
  auditKind: "arm",
  schema: armSchema,
  mirrored: (arm) => ({ name: arm.name, maker: arm.maker ?? null, modelCode: arm.modelCode ?? null, axes: arm.joints.length }),
  listHeads: (c, where) => c.arm.findMany({ where, orderBy: [...byName], include: { updatedBy: userColumns } }),
  findHead: (c, id) => c.arm.findUnique({ where: { id } }),
  createHead: (tx, data) => tx.arm.create({ data }),
  claimHead: (tx, id, baseRevision, data) => tx.arm.updateMany({ where: { id, currentRevision: baseRevision, deletedAt: null }, data }),
  setDeletedAt: (tx, id, deletedAt) => tx.arm.update({ where: { id }, data: { deletedAt } }),
  countHeads: (c) => c.arm.count(),
  findRevision: (c, id, revision) => c.armRevision.findUnique({ where: armRev(id, revision), include: { author: userColumns } }),
  requireRevision: (c, id, revision) => c.armRevision.findUniqueOrThrow({ where: armRev(id, revision) }),
  listRevisions: (c, id) =>
    c.armRevision.findMany({
      where: { armId: id },
      orderBy: { revision: "desc" },
      select: { revision: true, createdAt: true, summary: true, author: userColumns },
    }),
  findDocuments: async (c, pairs) =>
    (
      await c.armRevision.findMany({
        where: { OR: pairs.map((p) => ({ armId: p.id, revision: p.revision })) },
        select: { armId: true, revision: true, document: true },
      })
    ).map((r) => ({ ownerId: r.armId, revision: r.revision, document: r.document })),
  createRevision: (tx, { ownerId, ...data }) => tx.armRevision.create({ data: { ...data, armId: ownerId } }),
};

export async function listArms(opts: { deleted?: DeletedFilter } = {}): Promise<ArmSummary[]> {
  const rows = await revisioned.listHeads(arms, opts.deleted);
  if (rows.length === 0) return [];
  const docs = await revisioned.currentDocuments(arms, rows);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    maker: r.maker,
    modelCode: r.modelCode,
    axes: r.axes,
    revision: r.currentRevision,
    updatedAt: r.updatedAt,
    updatedBy: r.updatedBy,
    deletedAt: r.deletedAt,
    specs: docs.get(r.id)?.specs ?? {},
  }));
}

export async function getArm(id: string): Promise<ArmRecord | null> {
  return revisioned.getCurrent(arms, id);
}

/** Revision history, newest first; null when the arm does not exist. */
export async function listArmRevisions(id: string): Promise<ArmRevisionInfo[] | null> {
  return revisioned.listRevisionInfo(arms, id);
}

/** The arm and its revision history (newest first), for the history page; null when it does not exist. */
export async function getArmHistory(id: string): Promise<{ record: ArmRecord; revisions: ArmRevisionInfo[] } | null> {
  const [record, revisions] = await Promise.all([getArm(id), listArmRevisions(id)]);
  return record && revisions ? { record, revisions } : null;
}

export async function getArmRevision(id: string, revision: number): Promise<ArmRevisionRecord | null> {
  return revisioned.getRevision(arms, id, revision);
}

/** Stores a new arm (validated at the edge with armSchema) as revision 1. */
export async function createArm(
  userId: string | null,
  doc: ArmDocument,
  opts: { action?: "create" | "import" } = {},
): Promise<{ id: string; revision: 1; arm: ArmDocument }> {
  return revisioned.createDocument(arms, userId, doc, opts);
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
  doc: ArmDocument,
): Promise<{ id: string; revision: number; arm: ArmDocument }> {
  return revisioned.updateDocument(arms, userId, id, baseRevision, doc);
}

/** Marks the arm deleted (revisions stay); idempotent. */
export const softDeleteArm = (userId: string | null, id: string) => revisioned.setDeleted(arms, userId, id, true);
/** Clears the deleted mark; idempotent. */
export const restoreArm = (userId: string | null, id: string) => revisioned.setDeleted(arms, userId, id, false);

export async function countArms(): Promise<number> {
  return revisioned.countDocuments(arms);
}
