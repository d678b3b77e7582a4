import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb, armDoc, requirementDoc } from "./helpers";
import { seedDemo } from "@/lib/db/seed";
import { createArm, listArms, listArmRevisions } from "@/lib/db/arms";
import { createRequirementSet, listRequirementSets } from "@/lib/db/requirements";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";

let t: TestDb;
beforeAll(() => {
  t = createTestDb();
});
afterAll(async () => t.cleanup());

describe("demo seed", () => {
  it("seeds an empty database once and never again", async () => {
    const first = await seedDemo([armDoc({ name: "Invented seed arm" })], [requirementDoc()]);
    expect(first).toEqual({ seeded: true, arms: 1, requirementSets: 1 });
    const arms = await listArms();
    expect(arms.map((a) => a.name)).toEqual(["Invented seed arm"]);
    expect((await listArmRevisions(arms[0].id))?.[0]).toMatchObject({ revision: 1, author: null, summary: "imported" });
    expect((await seedDemo([armDoc()], [])).seeded).toBe(false);
    expect(await listArms()).toHaveLength(1);
    expect(await listRequirementSets()).toHaveLength(1);
  });

  it("the shipped seed data passes the same validation as the API", async () => {
    const arms = loadSeedArms();
    const sets = loadSeedRequirementSets();
    expect(arms.length).toBeGreaterThan(0);
    const before = await t.client.arm.count();
    // seedDemo skips a non-empty database, so store them through the same path it uses.
    for (const a of arms) await createArm(null, a, { action: "import" });
    for (const s of sets) await createRequirementSet(null, s, { action: "import" });
    expect(await t.client.arm.count()).toBe(before + arms.length);
    expect(await t.client.requirementSet.count()).toBe(1 + sets.length);
  });
});
