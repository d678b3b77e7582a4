import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, requirementDoc, type TestDb } from "./helpers";
import {
  createRequirementSet,
  getRequirementRevision,
  getRequirementSet,
  listRequirementRevisions,
  listRequirementSets,
  restoreRequirementSet,
  softDeleteRequirementSet,
  updateRequirementSet,
} from "@/lib/db/requirements";
import { ConflictError } from "@/lib/db/errors";
import { SUB_SCORES } from "@/shared/sub-scores";

let t: TestDb;
beforeAll(() => {
  t = createTestDb();
});
afterAll(async () => t.cleanup());

describe("requirement sets", () => {
  it("stores revisions with defaults applied, detects conflicts, soft-deletes and restores", async () => {
    const { id, requirementSet } = await createRequirementSet(null, requirementDoc());
    // A set stored without weights gets every weight of the sub-score table at its default.
    expect(requirementSet.weights).toEqual(SUB_SCORES.defaultWeights);
    expect(requirementSet.weights).toMatchObject({ coverage: 4, dexterity: 2, payload: 1 });
    expect(requirementSet.targets[0].positionTolerance).toBe(1e-5);

    const edited = requirementDoc({ payload: { mass: 2.5, cog: [0, 0, 0.02] } });
    expect((await updateRequirementSet(null, id, 1, edited)).revision).toBe(2);

    const err = await updateRequirementSet(null, id, 1, requirementDoc({ name: "Other edit" })).catch((e) => e);
    expect(err).toBeInstanceOf(ConflictError);
    expect(err.changes).toEqual([{ path: "payload.mass", base: 1, current: 2.5 }]);

    expect((await getRequirementSet(id))?.requirementSet.payload.mass).toBe(2.5);
    expect((await getRequirementRevision(id, 1))?.requirementSet.payload.mass).toBe(1);
    expect((await listRequirementRevisions(id))?.map((r) => r.summary)).toEqual(["changed payload.mass", "created"]);
    expect((await listRequirementSets())[0]).toMatchObject({ id, targets: 2, paths: 0, revision: 2, deletedAt: null });

    await softDeleteRequirementSet(null, id);
    expect(await listRequirementSets()).toEqual([]);
    await restoreRequirementSet(null, id);
    expect((await listRequirementSets()).map((r) => r.id)).toEqual([id]);
  });

  it("refuses UPDATE and DELETE on requirement revision rows (database triggers)", async () => {
    const { id } = await createRequirementSet(null, requirementDoc());
    await expect(t.client.$executeRaw`UPDATE "RequirementRevision" SET "summary" = 'x' WHERE "setId" = ${id}`).rejects.toThrow(/immutable/);
    await expect(t.client.requirementRevision.deleteMany({ where: { setId: id } })).rejects.toThrow();
    expect(await t.client.requirementRevision.count({ where: { setId: id } })).toBe(1);
  });
});
