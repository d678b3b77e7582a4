// Seeds the invented demo arms and requirement sets into ARMSIFT_DB (default ./data/armsift.db)
// when the database has no arms yet. Run from the repository root: `npx tsx scripts/seed.ts`.
import { loadSeedArms, loadSeedRequirementSets } from "../seed-data/index";
import { databaseUrl, db } from "../lib/db/client";
import { seedDemo } from "../lib/db/seed";

async function main(): Promise<void> {
  const arms = loadSeedArms();
  const sets = loadSeedRequirementSets();
  const r = await seedDemo(arms, sets);
  const where = databaseUrl().replace(/^file:/, "");
  console.log(r.seeded ? `seeded ${r.arms} demo arms and ${r.requirementSets} requirement sets into ${where}` : `${where} already has arms; not seeding`);
  await db().$disconnect();
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
