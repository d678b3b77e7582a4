import "server-only";
import type { ArmDocument, RequirementSet } from "@/shared/schemas";
import { countArms, createArm } from "./arms";
import { createRequirementSet } from "./requirements";

/**
 * Loads demo data into an empty catalog: does nothing when any arm exists (deleted ones count),
 * so re-running never duplicates. Seeded revisions have no author. The documents come validated
 * (seed-data/index.ts checks every file with the shared schemas).
 */
export async function seedDemo(arms: ArmDocument[], requirementSets: RequirementSet[]): Promise<{ seeded: boolean; arms: number; requirementSets: number }> {
  if ((await countArms()) > 0) return { seeded: false, arms: 0, requirementSets: 0 };
  for (const arm of arms) await createArm(null, arm, { action: "import" });
  for (const set of requirementSets) await createRequirementSet(null, set, { action: "import" });
  return { seeded: true, arms: arms.length, requirementSets: requirementSets.length };
}
