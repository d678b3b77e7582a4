"use client";
import { useEffect, useId, useState } from "react";
import type { Verdict } from "@/lib/analysis/types";
import type { RunArmView } from "@/lib/analysis/shortlist";
import { api } from "../api";
import { armMatrixCells } from "./view";
import { fixed } from "@/shared/format";
import { VERDICT_SYMBOL } from "./verdict";

export interface MatrixCell {
  kind: "target" | "path";
  name: string;
  verdict: Verdict;
  /** Dexterity margin (chosen branch, or the smallest along a path); null when not reached. */
  margin: number | null;
  /** Limiting factor, in words. */
  limiting: string;
  /** The reason in words; absent when the page left it out (loaded with the arm on opening). */
  reason?: string;
  /** Further lines: residuals, branches, holding, force, wrist, path events (absent like `reason`). */
  details?: string[];
}

export interface MatrixRow {
  armId: string;
  armName: string;
  cells: MatrixCell[];
}

/** Where the matrix loads a row's reasons and details from: the run's view of one arm. */
interface DetailsSource {
  shortlistId: string;
  runId: string;
  requirementSet: { targets: string[]; paths: string[] };
}

type Loaded = { state: "loading" } | { state: "ready"; cells: MatrixCell[] } | { state: "failed"; message: string };

/**
 * Arms × targets and paths. Each cell is a button: its verdict word and symbol with the dexterity
 * margin; hovering or focusing shows the limiting factor, activating it opens the details panel.
 * When the rows come without reasons and details (a large page), opening a cell loads its arm's
 * from `source` (once per arm).
 */
export function TaskMatrix({ columns, rows, threshold, source }: { columns: { kind: "target" | "path"; name: string }[]; rows: MatrixRow[]; threshold: number; source?: DetailsSource }) {
  const uid = useId();
  const [open, setOpen] = useState<{ r: number; c: number } | null>(null);
  const [loaded, setLoaded] = useState<Record<string, Loaded>>({});
  const base = open ? rows[open.r]?.cells[open.c] : undefined;
  const armId = open ? rows[open.r]?.armId : undefined;
  const extra = armId ? loaded[armId] : undefined;
  const cell = base && base.details === undefined && extra?.state === "ready" ? { ...base, ...extra.cells[open!.c] } : base;
  useEffect(() => {
    if (!source || !base || base.details !== undefined || !armId || loaded[armId]) return;
    setLoaded((l) => ({ ...l, [armId]: { state: "loading" } }));
    void api<RunArmView>(`/api/shortlists/${source.shortlistId}/runs/${source.runId}/view?arm=${encodeURIComponent(armId)}`, "GET").then((r) =>
      setLoaded((l) => ({ ...l, [armId]: r.ok ? { state: "ready", cells: armMatrixCells(source.requirementSet, r.data.analysis) } : { state: "failed", message: r.error.message } })),
    );
  }, [source, base, armId, loaded]);
  return (
    <section className="panel" aria-labelledby={uid + "-h"} data-testid="task-matrix">
      <h2 id={uid + "-h"}>Task matrix</h2>
      <p className="sub">
        Each cell: verdict and dexterity margin D (0–1; below {fixed(threshold, 1)} is marginal). Hover or focus a cell for the limiting factor; press it for the details.
      </p>
      <div className="table-wrap">
        <table className="matrix">
          <thead>
            <tr>
              <th scope="col">Arm</th>
              {columns.map((c) => (
                <th scope="col" key={`${c.kind}:${c.name}`}>
                  <span className="sub">{c.kind}</span>
                  <br />
                  {c.name}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row, r) => (
              <tr key={row.armId}>
                <th scope="row">{row.armName}</th>
                {row.cells.map((x, c) => {
                  const tipId = `${uid}-tip-${r}-${c}`;
                  const isOpen = open?.r === r && open?.c === c;
                  return (
                    <td key={c} className="mcell">
                      <button
                        type="button"
                        className={`cellbtn v-${x.verdict}${isOpen ? " open" : ""}`}
                        aria-describedby={tipId}
                        aria-expanded={isOpen}
                        aria-controls={uid + "-details"}
                        aria-label={`${row.armName}, ${x.kind} ${x.name}: ${x.verdict}${x.margin !== null ? `, dexterity margin ${fixed(x.margin)}` : ""}`}
                        onClick={() => setOpen(isOpen ? null : { r, c })}
                      >
                        <span aria-hidden="true" className="vsym">
                          {VERDICT_SYMBOL[x.verdict]}
                        </span>
                        <span className="vword">{x.verdict}</span>
                        <span className="margin">{x.margin !== null ? `D ${fixed(x.margin)}` : "—"}</span>
                      </button>
                      <span role="tooltip" id={tipId} className="tip">
                        {x.limiting}
                      </span>
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div id={uid + "-details"} className="cell-details" role="region" aria-label="Cell details" aria-live="polite" data-testid="cell-details">
        {cell && open ? (
          <>
            <h3>
              {rows[open.r].armName} · {cell.kind} {cell.name}:{" "}
              <span className={`verdict v-${cell.verdict}`}>
                <span aria-hidden="true">{VERDICT_SYMBOL[cell.verdict]}</span> {cell.verdict}
              </span>
            </h3>
            {cell.reason !== undefined ? <p>{cell.reason}</p> : extra?.state === "failed" ? <p role="alert" className="err">The details could not be loaded: {extra.message}</p> : <p className="sub">Loading the details…</p>}
            <p>
              <strong>Limiting factor:</strong> {cell.limiting}
            </p>
            {cell.details && cell.details.length > 0 && (
              <ul>
                {cell.details.map((d, i) => (
                  <li key={i}>{d}</li>
                ))}
              </ul>
            )}
            <button type="button" className="small" onClick={() => setOpen(null)}>
              Close details
            </button>
          </>
        ) : (
          <p className="sub">No cell selected.</p>
        )}
      </div>
    </section>
  );
}
