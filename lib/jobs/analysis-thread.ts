/**
 * Worker-thread entry of an analysis: receives the pinned inputs, runs the (synchronous,
 * CPU-bound) shortlist analysis and posts progress and the result to the thread that started it,
 * which does all database work. Compiled to plain JavaScript (`dist/jobs/analysis-thread.mjs`, see
 * scripts/build-jobs.mjs) so a production install runs it with node alone.
 */
import { parentPort, workerData } from "node:worker_threads";
import { analyzeShortlist, type ShortlistArm } from "@/lib/analysis/shortlist";
import type { RequirementSet } from "@/shared/schemas";
import type { ThreadMessage } from "./thread-protocol";

const post = (m: ThreadMessage) => parentPort!.postMessage(m);
const { arms, requirementSet } = workerData as { arms: ShortlistArm[]; requirementSet: RequirementSet };

try {
  const result = analyzeShortlist(arms, requirementSet, { onProgress: (fraction, stage) => post({ type: "progress", fraction, stage }) });
  post({ type: "done", result });
} catch (err) {
  post({ type: "error", message: err instanceof Error ? err.message : String(err) });
}
