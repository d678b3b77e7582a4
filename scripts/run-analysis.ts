// Analyses one queued shortlist run: `tsx --conditions=react-server scripts/run-analysis.ts <runId>`
// (started by the server; run from the repository root with ARMSIFT_DB / DATABASE_URL naming the
// database; the condition lets the server-only data layer load outside Next).
import { disconnectDb } from "@/lib/db";
import { executeRun } from "@/lib/jobs/analysis-runner";

async function main(): Promise<void> {
  const runId = process.argv[2];
  if (!runId) {
    console.error("usage: tsx --conditions=react-server scripts/run-analysis.ts <runId>");
    process.exitCode = 2;
    return;
  }
  const status = await executeRun(runId);
  console.log(`run ${runId}: ${status}`);
  await disconnectDb();
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
