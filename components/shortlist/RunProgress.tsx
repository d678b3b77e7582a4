"use client";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { api } from "../api";

interface RunState {
  status: "queued" | "running" | "done" | "failed";
  progress: number;
  stage: string | null;
  error: string | null;
}

/** Polls a run until it ends, showing a progress bar with the stage; refreshes the page when it ends. */
export function RunProgress({ shortlistId, runId, initial }: { shortlistId: string; runId: string; initial: RunState }) {
  const router = useRouter();
  const [run, setRun] = useState<RunState>(initial);
  const [problem, setProblem] = useState("");
  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const tick = async () => {
      const r = await api<{ run: RunState }>(`/api/shortlists/${shortlistId}/runs/${runId}`, "GET");
      if (stop) return;
      if (r.ok) {
        setProblem("");
        setRun(r.data.run);
        if (r.data.run.status === "done" || r.data.run.status === "failed") {
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
      <h2>Analysis {run.status === "queued" ? "queued" : run.status === "running" ? "running" : run.status}</h2>
      <div className="progress-row">
        <progress max={1} value={run.progress} aria-label="Analysis progress" />
        <span className="num">{pct} %</span>
      </div>
      <p className="sub" data-testid="run-stage">
        {run.stage ?? "waiting to start"}
      </p>
      <p className="sub">You can leave this page; the analysis continues on the server and the result appears here when it is done.</p>
      {run.status === "failed" && <p className="notice bad">The analysis failed: {run.error}</p>}
      {problem && <p className="notice warn">Could not read the progress: {problem}</p>}
    </div>
  );
}
