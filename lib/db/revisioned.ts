import "server-only";
import { randomUUID } from "node:crypto";
import type { z } from "zod";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { jsonDiff, summarizeChanges } from "./diff";
import { ConflictError, NotFoundError, ValidationError } from "./errors";
import { deletedWhere, isUniqueViolation, readStoredDocument, userRef, type DeletedFilter, type UserRef } from "./documents";

// Revisioned documents (arms, requirement sets): a head row holding the current revision number,
// the deleted mark and a few columns mirrored from the document for listing, plus one immutable
// revision row per save holding the full document as JSON. Each kind supplies a small adapter
// naming its Prisma tables; everything else (revision numbering, conflict detection, audit) is here.

/** The head row's columns every kind has. */
interface HeadRow {
  id: string;
  name: string;
  currentRevision: number;
  createdAt: Date;
  updatedAt: Date;
  deletedAt: Date | null;
}

type UserColumns = { id: string; name: string } | null;

/** Head columns written on create and on every save, besides the mirrored ones. */
interface HeadWrite {
  currentRevision: number;
  updatedAt: Date;
  updatedById: string | null;
}

interface StoredRevision {
  revision: number;
  document: string;
}

/** The revision row's columns, independent of the name of the column pointing at the head. */
interface RevisionWrite extends StoredRevision {
  id: string;
  ownerId: string;
  summary: string;
  authorId: string | null;
  createdAt: Date;
}

/** Orders lists by name, then id. */
export const byName = [{ name: "asc" }, { id: "asc" }] as const;
/** Selects a user's id and name (editor, author). */
export const userColumns = { select: { id: true, name: true } } as const;

/**
 * The Prisma side of one document kind. `M` are the head columns mirrored from the document,
 * `R` is the head row. `c` is the client or a transaction; `tx` always a transaction.
 */
export interface RevisionedKind<S extends z.ZodType, K extends string, M extends object, R extends HeadRow> {
  /** Property under which records carry the document ("arm", "requirementSet"). */
  key: K;
  /** Name in messages ("arm", "requirement set"). */
  noun: string;
  /** Audit entity type and action prefix ("arm", "requirement"). */
  auditKind: string;
  schema: S;
  mirrored(doc: z.output<S>): M;
  /** Head rows matching `where`, ordered by `byName`, with the last editor. */
  listHeads(c: Tx, where: ReturnType<typeof deletedWhere>): Promise<Array<R & { updatedBy: UserColumns }>>;
  findHead(c: Tx, id: string): Promise<R | null>;
  createHead(tx: Tx, data: M & HeadWrite & { id: string; createdAt: Date }): Promise<unknown>;
  /** Updates the head only if it is at `baseRevision` and not deleted; returns the rows changed. */
  claimHead(tx: Tx, id: string, baseRevision: number, data: M & HeadWrite): Promise<{ count: number }>;
  setDeletedAt(tx: Tx, id: string, deletedAt: Date | null): Promise<unknown>;
  countHeads(c: Tx): Promise<number>;
  /** One revision with its author, or null. */
  findRevision(c: Tx, id: string, revision: number): Promise<(StoredRevision & { createdAt: Date; author: UserColumns }) | null>;
  /** One revision; throws Prisma's not-found error when it is missing. */
  requireRevision(c: Tx, id: string, revision: number): Promise<StoredRevision>;
  /** Revision history, newest first. */
  listRevisions(c: Tx, id: string): Promise<Array<{ revision: number; createdAt: Date; summary: string; author: UserColumns }>>;
  /** The given (head, revision) pairs' documents. */
  findDocuments(c: Tx, pairs: Array<{ id: string; revision: number }>): Promise<Array<StoredRevision & { ownerId: string }>>;
  createRevision(tx: Tx, data: RevisionWrite): Promise<unknown>;
}

/** `doc` under the kind's key. */
type Keyed<K extends string, D> = { [P in K]: D };

function keyed<K extends string, D>(key: K, doc: D): Keyed<K, D> {
  // A computed property with a generic key is typed `{ [x: string]: D }`; it is exactly Keyed<K, D>.
  return { [key]: doc } as Keyed<K, D>;
}

export interface RevisionInfo {
  revision: number;
  createdAt: Date;
  author: UserRef | null;
  summary: string;
}

function read<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  json: string,
  id: string,
  revision: number,
): z.output<S> {
  return readStoredDocument(kind.schema, json, `${kind.noun} ${id} revision ${revision}`);
}

/** Head rows with their last editor. */
export async function listHeads<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  deleted: DeletedFilter | undefined,
): Promise<Array<R & { updatedBy: UserRef | null }>> {
  const rows = await kind.listHeads(db(), deletedWhere(deleted));
  return rows.map((r) => ({ ...r, updatedBy: userRef(r.updatedBy) }));
}

/** The current documents of the given heads, by head id. */
export async function currentDocuments<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  heads: R[],
): Promise<Map<string, z.output<S>>> {
  const revisions = await kind.findDocuments(db(), heads.map((r) => ({ id: r.id, revision: r.currentRevision })));
  return new Map(revisions.map((r) => [r.ownerId, read(kind, r.document, r.ownerId, r.revision)]));
}

export async function getCurrent<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  id: string,
): Promise<({ id: string; revision: number; createdAt: Date; updatedAt: Date; deletedAt: Date | null } & Keyed<K, z.output<S>>) | null> {
  const row = await kind.findHead(db(), id);
  if (!row) return null;
  const rev = await kind.findRevision(db(), id, row.currentRevision);
  if (!rev) throw new Error(`${kind.noun} ${id} has no revision ${row.currentRevision}`);
  return {
    id,
    revision: row.currentRevision,
    ...keyed(kind.key, read(kind, rev.document, id, rev.revision)),
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    deletedAt: row.deletedAt,
  };
}

/** Revision history, newest first; null when the document does not exist. */
export async function listRevisionInfo<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  id: string,
): Promise<RevisionInfo[] | null> {
  const exists = await kind.findHead(db(), id);
  if (!exists) return null;
  const revs = await kind.listRevisions(db(), id);
  return revs.map((r) => ({ revision: r.revision, createdAt: r.createdAt, author: userRef(r.author), summary: r.summary }));
}

export async function getRevision<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  id: string,
  revision: number,
): Promise<({ revision: number; createdAt: Date; author: UserRef | null } & Keyed<K, z.output<S>>) | null> {
  if (!Number.isInteger(revision) || revision < 1) return null;
  const r = await kind.findRevision(db(), id, revision);
  if (!r) return null;
  return { revision: r.revision, ...keyed(kind.key, read(kind, r.document, id, r.revision)), createdAt: r.createdAt, author: userRef(r.author) };
}

/** Stores a new document (validated at the edge with the kind's schema) as revision 1. */
export async function createDocument<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  userId: string | null,
  doc: z.output<S>,
  opts: { action?: "create" | "import" },
): Promise<{ id: string; revision: 1 } & Keyed<K, z.output<S>>> {
  const id = randomUUID();
  const now = new Date();
  await db().$transaction(async (tx) => {
    await kind.createHead(tx, { id, ...kind.mirrored(doc), currentRevision: 1, createdAt: now, updatedAt: now, updatedById: userId });
    await kind.createRevision(tx, {
      id: randomUUID(),
      ownerId: id,
      revision: 1,
      document: JSON.stringify(doc),
      summary: opts.action === "import" ? "imported" : "created",
      authorId: userId,
      createdAt: now,
    });
    await recordAudit(tx, {
      actorId: userId,
      action: `${kind.auditKind}.${opts.action ?? "create"}`,
      entityType: kind.auditKind,
      entityId: id,
      detail: { revision: 1 },
    });
  });
  return { id, revision: 1, ...keyed(kind.key, doc) };
}

async function conflictFor<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  tx: Tx,
  id: string,
  baseRevision: number,
): Promise<Error> {
  const row = await kind.findHead(tx, id);
  if (!row) return new NotFoundError(`${kind.noun} ${id} does not exist`);
  if (row.deletedAt) return new NotFoundError(`${kind.noun} ${id} is deleted; restore it before editing`);
  if (baseRevision > row.currentRevision) {
    return new ValidationError([
      { path: "baseRevision", message: `revision ${baseRevision} does not exist; the current revision is ${row.currentRevision}` },
    ]);
  }
  const [base, current] = await Promise.all([
    kind.requireRevision(tx, id, baseRevision),
    kind.requireRevision(tx, id, row.currentRevision),
  ]);
  const currentDoc = read(kind, current.document, id, current.revision);
  const changes = jsonDiff(read(kind, base.document, id, base.revision), currentDoc);
  return new ConflictError<z.output<S>>({
    message: `${kind.noun} ${id} was changed by someone else: your edit is based on revision ${baseRevision}, the current revision is ${row.currentRevision}`,
    baseRevision,
    currentRevision: row.currentRevision,
    current: currentDoc,
    changes,
  });
}

/**
 * Saves a new revision if `baseRevision` is still the current one; otherwise throws ConflictError
 * with what changed since. The first statement claims the head with a conditional UPDATE, so two
 * racing saves from the same base serialize on SQLite's write lock and exactly one wins; the
 * unique (head, revision) index is a second guard.
 */
export async function updateDocument<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  userId: string | null,
  id: string,
  baseRevision: number,
  doc: z.output<S>,
): Promise<{ id: string; revision: number } & Keyed<K, z.output<S>>> {
  if (!Number.isInteger(baseRevision) || baseRevision < 1) {
    throw new ValidationError([{ path: "baseRevision", message: "must be a revision number (integer ≥ 1)" }]);
  }
  const revision = baseRevision + 1;
  try {
    return await db().$transaction(async (tx) => {
      const now = new Date();
      const claimed = await kind.claimHead(tx, id, baseRevision, { ...kind.mirrored(doc), currentRevision: revision, updatedAt: now, updatedById: userId });
      if (claimed.count !== 1) throw await conflictFor(kind, tx, id, baseRevision);
      const previous = await kind.requireRevision(tx, id, baseRevision);
      const changes = jsonDiff(read(kind, previous.document, id, baseRevision), doc);
      await kind.createRevision(tx, {
        id: randomUUID(),
        ownerId: id,
        revision,
        document: JSON.stringify(doc),
        summary: summarizeChanges(changes),
        authorId: userId,
        createdAt: now,
      });
      await recordAudit(tx, {
        actorId: userId,
        action: `${kind.auditKind}.update`,
        entityType: kind.auditKind,
        entityId: id,
        detail: { revision, changed: changes.length },
      });
      return { id, revision, ...keyed(kind.key, doc) };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw await db().$transaction((tx) => conflictFor(kind, tx, id, baseRevision));
    throw err;
  }
}

/** Sets or clears the deleted mark (revisions stay); idempotent. */
export async function setDeleted<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(
  kind: RevisionedKind<S, K, M, R>,
  userId: string | null,
  id: string,
  deleted: boolean,
): Promise<{ id: string; deletedAt: Date | null }> {
  return db().$transaction(async (tx) => {
    const row = await kind.findHead(tx, id);
    if (!row) throw new NotFoundError(`${kind.noun} ${id} does not exist`);
    if ((row.deletedAt !== null) === deleted) return { id, deletedAt: row.deletedAt };
    const deletedAt = deleted ? new Date() : null;
    await kind.setDeletedAt(tx, id, deletedAt);
    await recordAudit(tx, {
      actorId: userId,
      action: `${kind.auditKind}.${deleted ? "delete" : "restore"}`,
      entityType: kind.auditKind,
      entityId: id,
    });
    return { id, deletedAt };
  });
}

export async function countDocuments<S extends z.ZodType, K extends string, M extends object, R extends HeadRow>(kind: RevisionedKind<S, K, M, R>): Promise<number> {
  return kind.countHeads(db());
}
