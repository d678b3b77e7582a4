"use client";
import { useId, useMemo, useState } from "react";
import { JOINT_LABEL, type JointRow } from "./armForm";
import { parseDhPaste } from "./dhPaste";

/** Paste a DH table copied from a spreadsheet, preview it with row-level errors, then apply. */
export function DhPastePanel(props: { onApply: (rows: JointRow[]) => void; onClose: () => void }) {
  const id = useId();
  const [text, setText] = useState("");
  const result = useMemo(() => parseDhPaste(text), [text]);
  const valid = result.rows.filter((r) => r.joint);
  const bad = result.rows.filter((r) => !r.joint);
  const [applied, setApplied] = useState("");

  function apply(rows: JointRow[], note: string) {
    props.onApply(rows);
    setApplied(note);
  }

  return (
    <section className="panel" aria-labelledby={id + "-h"} data-testid="dh-paste">
      <h3 id={id + "-h"}>Paste a DH table</h3>
      <p className="hint">
        Copy cells from a spreadsheet (tab-separated) or CSV (comma-separated). Either a header row naming the columns
        (type, a, alpha, d, theta, min, max, max speed, max torque, mass, com x, com y, com z, radius) or this order without a
        header: <strong>type, a (mm), α (°), d (mm), θ (°), min, max (° or mm), max speed (°/s or mm/s), max torque (N·m or N), link mass (kg), CoM x, y, z (mm)</strong>.
        The type column (revolute/prismatic, or R/P) may be left out; joints are then revolute. Applying replaces the joint table.
      </p>
      <label htmlFor={id + "-t"}>Pasted table</label>
      <textarea id={id + "-t"} rows={7} value={text} onChange={(e) => setText(e.target.value)} spellCheck={false} placeholder={"type\ta\talpha\td\ttheta\tmin\tmax\nR\t0\t90\t400\t0\t-170\t170"} />
      {result.rows.length > 0 && (
        <>
          <p className="sub">
            {result.rows.length} row{result.rows.length === 1 ? "" : "s"} read ({result.delimiter}-separated, {result.header ? "with header" : "documented order"}):{" "}
            {valid.length} valid, {bad.length} with errors.
          </p>
          {result.problem && <p className="err">Header: {result.problem}</p>}
          <div aria-live="polite" data-testid="paste-errors">
            {bad.length > 0 && (
              <ul className="notice bad">
                {bad.flatMap((r) => r.errors).map((m, i) => (
                  <li key={i}>{m}</li>
                ))}
              </ul>
            )}
          </div>
          <div className="table-wrap">
            <table>
              <caption className="visually-hidden">Preview of the pasted rows</caption>
              <thead>
                <tr>
                  <th scope="col">Row</th>
                  {result.columns.map((c, i) => (
                    <th scope="col" key={i}>
                      {c === "type" ? "type" : c === "ignore" ? "(ignored)" : JOINT_LABEL[c]}
                    </th>
                  ))}
                  <th scope="col">Status</th>
                </tr>
              </thead>
              <tbody>
                {result.rows.map((r) => (
                  <tr key={r.row} className={r.joint ? undefined : "bad-row"}>
                    <th scope="row">{r.row}</th>
                    {result.columns.map((_, i) => (
                      <td key={i} className="mono">
                        {r.cells[i] ?? ""}
                      </td>
                    ))}
                    <td>{r.joint ? <span className="ok">ok</span> : <span className="err">{r.errors.length} error{r.errors.length === 1 ? "" : "s"}</span>}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      )}
      <div className="toolbar">
        <button type="button" className="primary" disabled={result.rows.length === 0 || bad.length > 0} onClick={() => apply(valid.map((r) => r.joint!), `Applied all ${valid.length} rows.`)}>
          Apply all rows
        </button>
        <button
          type="button"
          disabled={valid.length === 0 || bad.length === 0}
          onClick={() => apply(valid.map((r) => r.joint!), `Applied ${valid.length} valid rows; ${bad.length} skipped.`)}
        >
          Apply only valid rows ({valid.length})
        </button>
        <button type="button" onClick={props.onClose}>
          Close
        </button>
        <span aria-live="polite" className="ok">
          {applied}
        </span>
      </div>
    </section>
  );
}
