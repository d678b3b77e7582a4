/**
 * Analyses one queued run: claims it, reads the pinned inputs from the database, analyses them in
 * a worker thread (lib/jobs/thread.ts) and stores the result or the reason it failed. Progress
 * and a heartbeat are written while the thread works, at most every 200 ms; each write also tells
 * whether the run is still this attempt's, and when it is not (cancelled from the page, or taken
 * over by another worker) the thread is stopped at once.
 *
 * Used by both runners behind lib/jobs/runs.ts: the web server's bounded local runner (SQLite) and
 * the queue workers (`npm run worker`, PostgreSQL).
 */
import { claimRun, failRun, finishRun, getRun, loadPinnedInputs, reportRunProgress, requeueRun } from "@/lib/db";
import { AnalysisStopped, analyseInThread } from "./thread";

/** Least time between two progress writes (ms). */
const PROGRESS_INTERVAL_MS = 200;
/**
 * The stage text stored for the run: analyzeShortlist already names the arm and the step just
 * finished ("arm 3/7 Helper Seven 7: target press-fit (4/9)"), so only " done" is added.
 */
function describeProgress(stage: string): string {
  return `${stage} done`;
}

export type RunOutcome = "done" | "failed" | "skipped" | "cancelled" | "retry";

interface ExecuteOptions {
  /** Who runs it ("local:<host>:<pid>" or a worker id), stored on the run. */
  runner?: string;
  /** Take over a run that is marked running (a queue job delivered again after its worker died). */
  takeOver?: boolean;
  /**
   * When an attempt fails and this returns true, the run goes back to queued ("retry") instead
   * of failed: the queue tries it again. Default: no retries.
   */
  retryAfterFailure?: () => boolean;
  /** Lets the caller stop the thread (worker shutdown): the run is put back in the queue. */
  onStart?: (stop: (reason: string) => void) => void;
  now?: () => number;
}

/** Analyses one run to the end. Returns what happened to it. */
export async function executeRun(runId: string, opts: ExecuteOptions = {}): Promise<RunOutcome> {
  const attempt = await claimRun(runId, opts.runner ?? "direct", { takeOver: opts.takeOver });
  if (attempt === null) return "skipped";
  const now = opts.now ?? (() => Date.now());
  let thread: ReturnType<typeof analyseInThread> | undefined;
  let shutdown: string | null = null;
  try {
    const run = await getRun(runId);
    if (!run?.pins) throw new Error("the run has no pinned inputs");
    const inputs = await loadPinnedInputs(run.pins);
    if (!(await reportRunProgress(runId, attempt, 0, `analysing ${inputs.arms.length} arm${inputs.arms.length === 1 ? "" : "s"} against ${inputs.requirementSet.name}`))) {
      return (await getRun(runId))?.status === "cancelled" ? "cancelled" : "skipped";
    }
    let last = now();
    let writing: Promise<void> = Promise.resolve();
    let pending: { fraction: number; stage: string } | null = null;
    const flush = () => {
      writing = writing.then(async () => {
        const p = pending;
        pending = null;
        if (p && !(await reportRunProgress(runId, attempt, p.fraction * 0.99, describeProgress(p.stage)))) {
          thread?.stop("the run is no longer this attempt's");
        }
      });
    };
    thread = analyseInThread(inputs, (fraction, stage) => {
      pending = { fraction, stage };
      const t = now();
      if (t - last < PROGRESS_INTERVAL_MS && fraction < 1) return;
      last = t;
      flush();
    });
    opts.onStart?.((reason) => {
      shutdown = reason;
      thread?.stop(reason);
    });
    const result = await thread.result;
    await writing;
    if (!(await reportRunProgress(runId, attempt, 0.995, "storing the result"))) return stoppedOutcome(runId);
    return (await finishRun(runId, attempt, result)) ? "done" : stoppedOutcome(runId);
  } catch (err) {
    if (err instanceof AnalysisStopped) {
      if (shutdown === null) return stoppedOutcome(runId);
      if (opts.retryAfterFailure?.() && (await requeueRun(runId, attempt, `queued again: ${shutdown}`))) return "retry";
      return (await failRun(runId, `the analysis was stopped: ${shutdown}`, attempt)) ? "failed" : stoppedOutcome(runId);
    }
    const message = err instanceof Error ? err.message : String(err);
    if (opts.retryAfterFailure?.() && (await requeueRun(runId, attempt, `attempt ${attempt} failed (${message.slice(0, 200)}); queued to try again`))) {
      return "retry";
    }
    await failRun(runId, `the analysis failed: ${message}`, attempt);
    return "failed";
  }
}

async function stoppedOutcome(runId: string): Promise<RunOutcome> {
  return (await getRun(runId))?.status === "cancelled" ? "cancelled" : "skipped";
}
