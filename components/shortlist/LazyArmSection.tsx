"use client";
/**
 * An arm's section that the page sends collapsed (its heading and summary line only) and loads on
 * demand: pressing "Show details" fetches the arm's stored analysis from the run's view endpoint
 * (GET /api/shortlists/:id/runs/:runId/view?arm=…) and draws the full section. "Show every arm's
 * details" (for printing the whole report) asks every collapsed section to load.
 */
import { useCallback, useEffect, useState } from "react";
import type { ArmAnalysis, RunArmView } from "@/lib/analysis/shortlist";
import { api } from "../api";
import { ArmSection } from "./ArmSection";

/** The window event that makes every collapsed arm section load. */
const LOAD_ALL = "armsift:load-arm-sections";

/** What a collapsed section shows before its arm is loaded. */
export type ArmHeading = Pick<ArmAnalysis, "id" | "name" | "maker" | "modelCode" | "axes" | "revision" | "summary">;

type State = { kind: "collapsed" } | { kind: "loading" } | { kind: "ready"; arm: ArmAnalysis } | { kind: "failed"; message: string };

export function LazyArmSection({ arm, index, shortlistId, runId, required }: { arm: ArmHeading; index: number; shortlistId: string; runId: string; required: number }) {
  const [state, setState] = useState<State>({ kind: "collapsed" });
  const load = useCallback(async () => {
    setState((s) => (s.kind === "ready" || s.kind === "loading" ? s : { kind: "loading" }));
    const r = await api<RunArmView>(`/api/shortlists/${shortlistId}/runs/${runId}/view?arm=${encodeURIComponent(arm.id)}`, "GET");
    setState(r.ok ? { kind: "ready", arm: r.data.analysis } : { kind: "failed", message: r.error.message });
  }, [shortlistId, runId, arm.id]);
  useEffect(() => {
    const onAll = () => {
      if (state.kind === "collapsed" || state.kind === "failed") void load();
    };
    window.addEventListener(LOAD_ALL, onAll);
    return () => window.removeEventListener(LOAD_ALL, onAll);
  }, [state.kind, load]);
  if (state.kind === "ready") return <ArmSection arm={state.arm} index={index} shortlistId={shortlistId} runId={runId} required={required} />;
  return (
    <section className="panel arm-section" aria-labelledby={`arm-${index}-h`} data-testid="arm-section" data-collapsed="true">
      <h3 id={`arm-${index}-h`}>
        {arm.name} <span className="sub">{[arm.maker, arm.modelCode].filter(Boolean).join(" · ")} · {arm.axes} axes · revision {arm.revision}</span>
      </h3>
      <p>{arm.summary}</p>
      <p className="no-print">
        <button type="button" onClick={() => void load()} disabled={state.kind === "loading"} data-testid="arm-section-load" aria-describedby={`arm-${index}-h`}>
          {state.kind === "loading" ? "Loading…" : "Show details"}
        </button>{" "}
        <span className="sub">3-D view, force capability, payload, cell, cycle, path profiles and workspace of this arm.</span>
      </p>
      {state.kind === "failed" && (
        <p role="alert" className="err">
          The details could not be loaded: {state.message}
        </p>
      )}
      <p className="print-only sub">Details not loaded when this page was printed (use “Show every arm&apos;s details” before printing).</p>
    </section>
  );
}

/** Loads every collapsed arm section of the page. */
export function LoadAllArmSections({ count }: { count: number }) {
  return (
    <p className="no-print">
      <button type="button" onClick={() => window.dispatchEvent(new Event(LOAD_ALL))} data-testid="arm-sections-load-all">
        Show every arm&apos;s details
      </button>{" "}
      <span className="sub">{count} arm sections below are collapsed to keep the page light; load them all before printing the whole report.</span>
    </p>
  );
}
