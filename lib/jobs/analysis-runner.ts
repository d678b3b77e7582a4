/**
 * Runs shortlist analyses outside the web server's request thread: the route that asks for a run
 * starts a detached `tsx --conditions=react-server scripts/run-analysis.ts <runId>` process, which reads the pinned inputs
 * from the database, analyses them and stores the result (or the reason it failed). Progress and a
 * heartbeat are written while the (synchronous, CPU-bound) analysis runs, at most every 200 ms.
 */
import { spawn } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { analyzeShortlist } from "@/lib/analysis/shortlist";
import { databaseUrl } from "@/lib/db";
import { openProgressWriter } from "@/lib/db";
import { claimRun, failRun, finishRun, getRun, loadPinnedInputs } from "@/lib/db";

/** The data layer is server-only: its processes resolve `server-only` as the server does. */
export const SERVER_CONDITION = "--conditions=react-server";

/** Least time between two progress writes (ms). */
export const PROGRESS_INTERVAL_MS = 200;
/**
 * The stage text stored for the run: analyzeShortlist already names the arm and the step just
 * finished ("arm 3/7 Helper Seven 7: target press-fit (4/9)"), so only " done" is added.
 */
export function describeProgress(stage: string): string {
  return `${stage} done`;
}

/** Analyses one queued run to the end (done or failed). Returns the final status. */
export async function executeRun(runId: string, opts: { now?: () => number } = {}): Promise<"done" | "failed" | "skipped"> {
  if (!(await claimRun(runId))) return "skipped";
  const now = opts.now ?? (() => Date.now());
  const writer = openProgressWriter(runId, databaseUrl());
  try {
    const run = await getRun(runId);
    if (!run?.pins) throw new Error("the run has no pinned inputs");
    const { arms, requirementSet } = await loadPinnedInputs(run.pins);
    writer.write(0, `analysing ${arms.length} arm${arms.length === 1 ? "" : "s"} against ${requirementSet.name}`);
    let last = now();
    const result = analyzeShortlist(arms, requirementSet, {
      onProgress(fraction, stage) {
        const t = now();
        if (t - last < PROGRESS_INTERVAL_MS && fraction < 1) return;
        last = t;
        writer.write(fraction * 0.99, describeProgress(stage));
      },
    });
    writer.write(0.995, "storing the result");
    await finishRun(runId, result);
    return "done";
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    await failRun(runId, `the analysis failed: ${message}`);
    return "failed";
  } finally {
    writer.close();
  }
}

/** Starts the analysis of a queued run in a detached process; a failure to start fails the run. */
export async function startRunProcess(runId: string, root: string = process.cwd()): Promise<void> {
  const tsx = path.join(root, "node_modules", ".bin", "tsx");
  const script = path.join(root, "scripts", "run-analysis.ts");
  if (!existsSync(tsx) || !existsSync(script)) {
    await failRun(runId, `the analysis could not be started: ${existsSync(tsx) ? script : tsx} is missing`);
    return;
  }
  try {
    const child = spawn(tsx, [SERVER_CONDITION, script, runId], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: databaseUrl(), NODE_ENV: "production" },
      detached: true,
      stdio: "ignore",
    });
    child.on("error", (err) => void failRun(runId, `the analysis could not be started: ${err.message}`));
    child.unref();
  } catch (err) {
    await failRun(runId, `the analysis could not be started: ${err instanceof Error ? err.message : String(err)}`);
  }
}
