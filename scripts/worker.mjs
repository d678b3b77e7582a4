// `npm run worker`: a queue worker process for the team set-up (DATABASE_URL=postgresql://…).
// Runs the compiled worker (dist/jobs/worker.mjs), rebuilding it first when the sources changed
// and esbuild is installed. Settings: ARMSIFT_WORKER_CONCURRENCY (cores − 1), see DEVELOPERS.md.
import { existsSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { buildJobs, jobsStale, outDir, root } from "./build-jobs.mjs";

if (jobsStale() && existsSync(path.join(root, "node_modules", "esbuild"))) await buildJobs();
const worker = path.join(outDir, "worker.mjs");
if (!existsSync(worker)) {
  console.error("dist/jobs/worker.mjs is missing: run `npm run build` (with the development dependencies) first");
  process.exit(1);
}
process.chdir(root);
await import(pathToFileURL(worker).href);
