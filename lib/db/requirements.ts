import "server-only";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas";
import type { RequirementSet as RequirementSetRow } from "./generated/client";
import type { DeletedFilter, UserRef } from "./documents";
import * as revisioned from "./revisioned";
import { byName, userColumns, type RevisionedKind, type RevisionInfo } from "./revisioned";

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
interface RequirementRecord {
  id: string;
  revision: number;
  requirementSet: RequirementSet;
  createdAt: Date;
  updatedAt: Date;
  deletedAt: Date | null;
}

type RequirementRevisionInfo = RevisionInfo;

interface RequirementRevisionRecord {
  revision: number;
  requirementSet: RequirementSet;
  createdAt: Date;
  author: UserRef | null;
}

const setRev = (setId: string, revision: number) => ({ setId_revision: { setId, revision } });

/** Requirement sets: head table `requirementSet`, revisions in `requirementRevision` keyed by (setId, revision). */
const sets: RevisionedKind<typeof requirementSetSchema, "requirementSet", { name: string; targets: number; paths: number }, RequirementSetRow> = {
  key: "requirementSet",
  noun: "requirement set",
  auditKind: "requirement",
  schema: requirementSetSchema,
  mirrored: (set) => ({ name: set.name, targets: set.targets.length, paths: set.paths.length }),
  listHeads: (c, where) => c.requirementSet.findMany({ where, orderBy: [...byName], include: { updatedBy: userColumns } }),
  findHead: (c, id) => c.requirementSet.findUnique({ where: { id } }),
  createHead: (tx, data) => tx.requirementSet.create({ data }),
  claimHead: (tx, id, baseRevision, data) =>
    tx.requirementSet.updateMany({ where: { id, currentRevision: baseRevision, deletedAt: null }, data }),
  setDeletedAt: (tx, id, deletedAt) => tx.requirementSet.update({ where: { id }, data: { deletedAt } }),
  countHeads: (c) => c.requirementSet.count(),
  findRevision: (c, id, revision) => c.requirementRevision.findUnique({ where: setRev(id, revision), include: { author: userColumns } }),
  requireRevision: (c, id, revision) => c.requirementRevision.findUniqueOrThrow({ where: setRev(id, revision) }),
  listRevisions: (c, id) =>
    c.requirementRevision.findMany({
      where: { setId: id },
      orderBy: { revision: "desc" },
      select: { revision: true, createdAt: true, summary: true, author: userColumns },
    }),
  findDocuments: async (c, pairs) =>
    (
      await c.requirementRevision.findMany({
        where: { OR: pairs.map((p) => ({ setId: p.id, revision: p.revision })) },
        select: { setId: true, revision: true, document: true },
      })
    ).map((r) => ({ ownerId: r.setId, revision: r.revision, document: r.document })),
  createRevision: (tx, { ownerId, ...data }) => tx.requirementRevision.create({ data: { ...data, setId: ownerId } }),
};

export async function listRequirementSets(opts: { deleted?: DeletedFilter } = {}): Promise<RequirementSummary[]> {
  const rows = await revisioned.listHeads(sets, opts.deleted);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    targets: r.targets,
    paths: r.paths,
    revision: r.currentRevision,
    updatedAt: r.updatedAt,
    updatedBy: r.updatedBy,
    deletedAt: r.deletedAt,
  }));
}

export async function getRequirementSet(id: string): Promise<RequirementRecord | null> {
  return revisioned.getCurrent(sets, id);
}

/** Revision history, newest first; null when the set does not exist. */
export async function listRequirementRevisions(id: string): Promise<RequirementRevisionInfo[] | null> {
  return revisioned.listRevisionInfo(sets, id);
}

/** The set and its revision history (newest first), for the history page; null when it does not exist. */
export async function getRequirementHistory(id: string): Promise<{ record: RequirementRecord; revisions: RequirementRevisionInfo[] } | null> {
  const [record, revisions] = await Promise.all([getRequirementSet(id), listRequirementRevisions(id)]);
  return record && revisions ? { record, revisions } : null;
}

export async function getRequirementRevision(id: string, revision: number): Promise<RequirementRevisionRecord | null> {
  return revisioned.getRevision(sets, id, revision);
}

/** Stores a new requirement set (validated at the edge with requirementSetSchema, defaults applied) as revision 1. */
export async function createRequirementSet(
  userId: string | null,
  doc: RequirementSet,
  opts: { action?: "create" | "import" } = {},
): Promise<{ id: string; revision: 1; requirementSet: RequirementSet }> {
  return revisioned.createDocument(sets, userId, doc, opts);
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
  doc: RequirementSet,
): Promise<{ id: string; revision: number; requirementSet: RequirementSet }> {
  return revisioned.updateDocument(sets, userId, id, baseRevision, doc);
}

/** Marks the requirement set deleted (revisions stay); idempotent. */
export const softDeleteRequirementSet = (userId: string | null, id: string) => revisioned.setDeleted(sets, userId, id, true);
/** Clears the deleted mark; idempotent. */
export const restoreRequirementSet = (userId: string | null, id: string) => revisioned.setDeleted(sets, userId, id, false);

