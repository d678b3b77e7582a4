"use client";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { api } from "../api";

interface RunState {
  status: "queued" | "running" | "done" | "failed" | "cancelled";
  progress: number;
  stage: string | null;
  error: string | null;
  /** Place among all queued analyses (1 = next), while queued. */
  queuePosition: number | null;
}

const ordinal = (n: number) => {
  const tens = n % 100, ones = n % 10;
  const suffix = tens >= 11 && tens <= 13 ? "th" : ones === 1 ? "st" : ones === 2 ? "nd" : ones === 3 ? "rd" : "th";
  return `${n}${suffix}`;
};

/** "next in the queue" / "3rd in the queue (2 analyses ahead)". */
function queueText(position: number | null): string {
  if (position === null) return "waiting to start";
  if (position <= 1) return "next in the queue";
  return `${ordinal(position)} in the queue (${position - 1} ${position === 2 ? "analysis" : "analyses"} ahead)`;
}

/**
 * Polls a run until it ends, showing its place in the queue or a progress bar with the stage;
 * refreshes the page when it ends. Editors can cancel it.
 */
export function RunProgress({ shortlistId, runId, initial, canCancel = false }: { shortlistId: string; runId: string; initial: RunState; canCancel?: boolean }) {
  const router = useRouter();
  const [run, setRun] = useState<RunState>(initial);
  const [problem, setProblem] = useState("");
  const [cancelling, setCancelling] = useState(false);
  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const tick = async () => {
      const r = await api<{ run: RunState }>(`/api/shortlists/${shortlistId}/runs/${runId}`, "GET");
      if (stop) return;
      if (r.ok) {
        setProblem("");
        setRun(r.data.run);
        if (r.data.run.status !== "queued" && r.data.run.status !== "running") {
          router.refresh();
          return;
        }
      } else setProblem(r.error.message);
      timer = setTimeout(tick, 400);
    };
    timer = setTimeout(tick, 300);
    return () => {
      stop = true;
      if (timer) clearTimeout(timer);
    };
  }, [shortlistId, runId, router]);
  const pct = Math.round(run.progress * 100);
  return (
    <div className="panel run-progress" data-testid="run-progress" aria-live="polite">
      <h2>Analysis {run.status}</h2>
      {run.status === "queued" && (
        <p className="queue-place" data-testid="run-queue">
          Queued: {queueText(run.queuePosition)}. Analyses run a few at a time; this one starts when a place is free.
        </p>
      )}
      <div className="progress-row">
        <progress max={1} value={run.progress} aria-label="Analysis progress" />
        <span className="num">{pct} %</span>
      </div>
      <p className="sub" data-testid="run-stage">
        {run.stage ?? "waiting to start"}
      </p>
      <p className="sub">You can leave this page; the analysis continues on the server and the result appears here when it is done.</p>
      {canCancel && (run.status === "queued" || run.status === "running") && (
        <p className="no-print">
          <button
            type="button"
            disabled={cancelling}
            onClick={async () => {
              setCancelling(true);
              const r = await api<{ run: RunState }>(`/api/shortlists/${shortlistId}/runs/${runId}/cancel`, "POST");
              setCancelling(false);
              if (r.ok) {
                setRun(r.data.run);
                router.refresh();
              } else setProblem(r.error.message);
            }}
          >
            {cancelling ? "Cancelling…" : "Cancel the analysis"}
          </button>
        </p>
      )}
      {run.status === "failed" && <p className="notice bad">The analysis failed: {run.error}</p>}
      {problem && <p className="notice warn">Could not read the progress: {problem}</p>}
    </div>
  );
}
