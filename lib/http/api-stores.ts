import { armSchema, requirementSetSchema, type ArmDocument, type RequirementSet } from "@/shared/schemas";
import * as arms from "@/lib/db/arms";
import * as reqs from "@/lib/db/requirements";
import { documentRoutes } from "./document-routes";

/** Route handlers for /api/arms. */
export const armRoutes = documentRoutes<ArmDocument>({
  key: "arm",
  noun: "arm",
  read: "arm:read",
  write: "arm:write",
  schema: armSchema,
  list: (opts) => arms.listArms(opts),
  async get(id) {
    const r = await arms.getArm(id);
    return r && { ...r, doc: r.arm };
  },
  async create(userId, doc, action) {
    const r = await arms.createArm(userId, doc, { action });
    return { id: r.id, revision: r.revision, doc: r.arm };
  },
  async update(userId, id, baseRevision, doc) {
    const r = await arms.updateArm(userId, id, baseRevision, doc);
    return { id: r.id, revision: r.revision, doc: r.arm };
  },
  softDelete: arms.softDeleteArm,
  restore: arms.restoreArm,
  revisions: arms.listArmRevisions,
  async revision(id, rev) {
    const r = await arms.getArmRevision(id, rev);
    return r && { ...r, doc: r.arm };
  },
});

/** Route handlers for /api/requirements. */
export const requirementRoutes = documentRoutes<RequirementSet>({
  key: "requirementSet",
  noun: "requirement set",
  read: "req:read",
  write: "req:write",
  schema: requirementSetSchema,
  list: (opts) => reqs.listRequirementSets(opts),
  async get(id) {
    const r = await reqs.getRequirementSet(id);
    return r && { ...r, doc: r.requirementSet };
  },
  async create(userId, doc, action) {
    const r = await reqs.createRequirementSet(userId, doc, { action });
    return { id: r.id, revision: r.revision, doc: r.requirementSet };
  },
  async update(userId, id, baseRevision, doc) {
    const r = await reqs.updateRequirementSet(userId, id, baseRevision, doc);
    return { id: r.id, revision: r.revision, doc: r.requirementSet };
  },
  softDelete: reqs.softDeleteRequirementSet,
  restore: reqs.restoreRequirementSet,
  revisions: reqs.listRequirementRevisions,
  async revision(id, rev) {
    const r = await reqs.getRequirementRevision(id, rev);
    return r && { ...r, doc: r.requirementSet };
  },
});
