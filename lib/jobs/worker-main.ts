// `npm run worker`: one queue worker process until SIGINT/SIGTERM (compiled to dist/jobs/worker.mjs).
import { disconnectDb } from "@/lib/db";
import { startWorker, workerOptionsFromEnv } from "./worker";

async function main(): Promise<void> {
  const worker = await startWorker(workerOptionsFromEnv());
  let stopping = false;
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.on(signal, () => {
      if (stopping) return;
      stopping = true;
      console.log(`worker ${worker.id}: ${signal}, putting unfinished runs back in the queue`);
      void worker
        .stop(`worker ${worker.id} was stopped`)
        .then(() => disconnectDb())
        .finally(() => process.exit(0));
    });
  }
}

main().catch((err) => {
  console.error(`worker: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
