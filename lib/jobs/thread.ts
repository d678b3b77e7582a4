/**
 * Runs one analysis in a worker thread of this process. The thread dies with the process, so an
 * analysis never outlives the server or worker that started it; a heap limit per thread keeps one
 * oversized shortlist from taking the machine's memory.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { ShortlistArm } from "@/lib/analysis/shortlist";
import type { StoredResult } from "@/lib/analysis/stored";
import type { RequirementSet } from "@/shared/schemas";
import type { ThreadMessage } from "./thread-protocol";

/** Heap limit of one analysis thread (MB): ARMSIFT_ANALYSIS_MEMORY_MB, default 3072. */
function threadMemoryMb(env: NodeJS.ProcessEnv = process.env): number {
  const n = Number(env.ARMSIFT_ANALYSIS_MEMORY_MB);
  return Number.isFinite(n) && n >= 64 ? Math.floor(n) : 3072;
}

/**
 * The compiled thread entry: ARMSIFT_ANALYSIS_THREAD, else dist/jobs/analysis-thread.mjs under
 * ARMSIFT_ROOT or the current directory (the repository root for `npm start` and the worker).
 */
function threadScript(env: NodeJS.ProcessEnv = process.env): string {
  if (env.ARMSIFT_ANALYSIS_THREAD) return env.ARMSIFT_ANALYSIS_THREAD;
  return path.join(/* turbopackIgnore: true */ env.ARMSIFT_ROOT ?? process.cwd(), "dist", "jobs", "analysis-thread.mjs");
}

export class AnalysisStopped extends Error {
  constructor(reason: string) {
    super(reason);
    this.name = "AnalysisStopped";
  }
}

interface ThreadRun {
  /** The result in its stored form. */
  result: Promise<StoredResult>;
  /** Ends the thread at once; `result` rejects with AnalysisStopped(reason). */
  stop(reason: string): void;
}

/** Starts the analysis of the inputs in a new thread; progress arrives through `onProgress`. */
export function analyseInThread(
  inputs: { arms: ShortlistArm[]; requirementSet: RequirementSet },
  onProgress: (fraction: number, stage: string) => void,
  opts: { script?: string; memoryMb?: number } = {},
): ThreadRun {
  const script = opts.script ?? threadScript();
  if (!existsSync(/* turbopackIgnore: true */ script)) {
    return {
      result: Promise.reject(new Error(`the analysis program ${script} is missing (build it with npm run build)`)),
      stop() {},
    };
  }
  const memoryMb = opts.memoryMb ?? threadMemoryMb();
  // Constructed through Reflect: the bundler of the web server would otherwise take the run-time
  // path for a module to bundle (and try every file of the project).
  const worker: Worker = Reflect.construct(Worker, [script, { workerData: inputs, resourceLimits: { maxOldGenerationSizeMb: memoryMb }, stdout: false, stderr: false }]);
  let stopped: string | null = null;
  const result = new Promise<StoredResult>((resolve, reject) => {
    let settled = false;
    const settle = (fn: () => void) => {
      if (!settled) {
        settled = true;
        fn();
      }
    };
    worker.on("message", (m: ThreadMessage) => {
      if (m.type === "progress") onProgress(m.fraction, m.stage);
      else if (m.type === "done") settle(() => resolve(m.result));
      else settle(() => reject(new Error(m.message)));
      if (m.type !== "progress") void worker.terminate();
    });
    worker.on("error", (err: Error & { code?: string }) => {
      const message = err.code === "ERR_WORKER_OUT_OF_MEMORY" ? `it ran out of memory (limit ${memoryMb} MB per analysis; ARMSIFT_ANALYSIS_MEMORY_MB)` : err.message;
      settle(() => reject(new Error(message)));
    });
    worker.on("exit", (code) => {
      settle(() => reject(stopped !== null ? new AnalysisStopped(stopped) : new Error(`the analysis thread ended early (exit code ${code})`)));
    });
  });
  return {
    result,
    stop(reason) {
      stopped ??= reason;
      void worker.terminate();
    },
  };
}
