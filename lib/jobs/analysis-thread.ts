/**
 * Worker-thread entry of an analysis: receives the pinned inputs, runs the (synchronous,
 * CPU-bound) shortlist analysis, puts the result in its stored form (lib/analysis/stored.ts) and
 * posts progress and that form to the thread that started it, which does all database work. Compiled to plain JavaScript (`dist/jobs/analysis-thread.mjs`, see
 * scripts/build-jobs.mjs) so a production install runs it with node alone.
 */
import { parentPort, workerData } from "node:worker_threads";
import { analyzeShortlist, type ShortlistArm } from "@/lib/analysis/shortlist";
import { encodeResult } from "@/lib/analysis/stored";
import { compactArm } from "@/lib/analysis/compact";
import type { RequirementSet } from "@/shared/schemas";
import type { ThreadMessage } from "./thread-protocol";

const post = (m: ThreadMessage, transfer: ArrayBuffer[] = []) => parentPort!.postMessage(m, transfer);
const { arms, requirementSet } = workerData as { arms: ShortlistArm[]; requirementSet: RequirementSet };

try {
  // each arm in its stored form as soon as it is done: the thread never holds every arm's per-sample data
  const result = analyzeShortlist(arms, requirementSet, { onProgress: (fraction, stage) => post({ type: "progress", fraction, stage }), mapArm: compactArm });
  const stored = encodeResult(result);
  post({ type: "done", result: stored }, stored.arms.map((a) => a.data.buffer));
} catch (err) {
  post({ type: "error", message: err instanceof Error ? err.message : String(err) });
}
