import { armSchema, requirementNotices, requirementSetSchema, type ArmDocument, type RequirementSet } from "@/shared/schemas";
import * as data from "@/lib/db";
import { documentRoutes, type DocumentStore } from "./documents";

type StoreRecord<D> = NonNullable<Awaited<ReturnType<DocumentStore<D>["get"]>>>;
type StoreRevision<D> = NonNullable<Awaited<ReturnType<DocumentStore<D>["revision"]>>>;
/** A record of the database layer: the document under its own key instead of `doc`. */
type Keyed<K extends string, D, T = unknown> = Omit<T, "doc"> & { [P in K]: D };

/**
 * A DocumentStore from the database functions of one kind, whose records carry the document
 * under `key` ("arm", "requirementSet").
 */
function keyedStore<D, K extends string>(
  meta: Pick<DocumentStore<D>, "noun" | "read" | "write" | "schema" | "notices"> & { key: K },
  db: {
    list: DocumentStore<D>["list"];
    get(id: string): Promise<Keyed<K, D, StoreRecord<D>> | null>;
    create(userId: string, doc: D, opts: { action: "create" | "import" }): Promise<Keyed<K, D, { id: string; revision: number }>>;
    update(userId: string, id: string, baseRevision: number, doc: D): Promise<Keyed<K, D, { id: string; revision: number }>>;
    softDelete: DocumentStore<D>["softDelete"];
    restore: DocumentStore<D>["restore"];
    revisions: DocumentStore<D>["revisions"];
    revision(id: string, rev: number): Promise<Keyed<K, D, StoreRevision<D>> | null>;
  },
): DocumentStore<D> {
  const { key } = meta;
  return {
    ...meta,
    list: (opts) => db.list(opts),
    async get(id) {
      const r = await db.get(id);
      return r && { ...r, doc: r[key] };
    },
    async create(userId, doc, action) {
      const r = await db.create(userId, doc, { action });
      return { id: r.id, revision: r.revision, doc: r[key] };
    },
    async update(userId, id, baseRevision, doc) {
      const r = await db.update(userId, id, baseRevision, doc);
      return { id: r.id, revision: r.revision, doc: r[key] };
    },
    softDelete: db.softDelete,
    restore: db.restore,
    revisions: db.revisions,
    async revision(id, rev) {
      const r = await db.revision(id, rev);
      return r && { ...r, doc: r[key] };
    },
  };
}

/** Route handlers for /api/arms. */
export const armRoutes = documentRoutes<ArmDocument>(
  keyedStore<ArmDocument, "arm">(
    { key: "arm", noun: "arm", read: "arm:read", write: "arm:write", schema: armSchema },
    {
      list: (opts) => data.listArms(opts),
      get: data.getArm,
      create: data.createArm,
      update: data.updateArm,
      softDelete: data.softDeleteArm,
      restore: data.restoreArm,
      revisions: data.listArmRevisions,
      revision: data.getArmRevision,
    },
  ),
);

/** Route handlers for /api/requirements. */
export const requirementRoutes = documentRoutes<RequirementSet>(
  keyedStore<RequirementSet, "requirementSet">(
    { key: "requirementSet", noun: "requirement set", read: "req:read", write: "req:write", schema: requirementSetSchema, notices: requirementNotices },
    {
      list: (opts) => data.listRequirementSets(opts),
      get: data.getRequirementSet,
      create: data.createRequirementSet,
      update: data.updateRequirementSet,
      softDelete: data.softDeleteRequirementSet,
      restore: data.restoreRequirementSet,
      revisions: data.listRequirementRevisions,
      revision: data.getRequirementRevision,
    },
  ),
);
