// Seeds the invented demo arms and requirement sets into ARMSIFT_DB (default ./data/armsift.db)
// when the database has no arms yet. Run from the repository root: `npm run db:seed`
// (tsx with the react-server condition, under which the server-only data layer loads).
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { databaseUrl, disconnectDb, seedDemo } from "@/lib/db";

async function main(): Promise<void> {
  const arms = loadSeedArms();
  const sets = loadSeedRequirementSets();
  const r = await seedDemo(arms, sets);
  const where = databaseUrl().replace(/^file:/, "");
  console.log(r.seeded ? `seeded ${r.arms} demo arms and ${r.requirementSets} requirement sets into ${where}` : `${where} already has arms; not seeding`);
  await disconnectDb();
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
