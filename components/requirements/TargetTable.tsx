"use client";
import { CONSTRAINT_MODES } from "@/shared/schemas";
import { CellNumber, wholeErrors } from "../fields";
import { newTarget, type TargetRow } from "./reqForm";
import { RowActionsCell } from "../RowControls";

type NumKey = "x" | "y" | "z" | "roll" | "pitch" | "yaw" | "posTol" | "rotTol" | "fx" | "fy" | "fz" | "mx" | "my" | "mz";
const COLS: { key: NumKey; label: string; unit: string; path: (i: number) => string[] }[] = [
  { key: "x", label: "x", unit: "mm", path: (i) => [`targets.${i}.position.0`, `targets.${i}.position`] },
  { key: "y", label: "y", unit: "mm", path: (i) => [`targets.${i}.position.1`] },
  { key: "z", label: "z", unit: "mm", path: (i) => [`targets.${i}.position.2`] },
  { key: "roll", label: "roll", unit: "°", path: (i) => [`targets.${i}.rpy.0`, `targets.${i}.rpy`] },
  { key: "pitch", label: "pitch", unit: "°", path: (i) => [`targets.${i}.rpy.1`] },
  { key: "yaw", label: "yaw", unit: "°", path: (i) => [`targets.${i}.rpy.2`] },
];
const TOL: typeof COLS = [
  { key: "posTol", label: "position tol.", unit: "mm", path: (i) => [`targets.${i}.positionTolerance`] },
  { key: "rotTol", label: "rotation tol.", unit: "°", path: (i) => [`targets.${i}.rotationTolerance`] },
];
const FORCE: typeof COLS = [
  { key: "fx", label: "Fx", unit: "N", path: (i) => [`targets.${i}.force.0`, `targets.${i}.force`] },
  { key: "fy", label: "Fy", unit: "N", path: (i) => [`targets.${i}.force.1`] },
  { key: "fz", label: "Fz", unit: "N", path: (i) => [`targets.${i}.force.2`] },
  { key: "mx", label: "Mx", unit: "N·m", path: (i) => [`targets.${i}.moment.0`, `targets.${i}.moment`] },
  { key: "my", label: "My", unit: "N·m", path: (i) => [`targets.${i}.moment.1`] },
  { key: "mz", label: "Mz", unit: "N·m", path: (i) => [`targets.${i}.moment.2`] },
];

export function TargetTable(props: { rows: TargetRow[]; onChange: (rows: TargetRow[], structural?: boolean) => void; errors: Record<string, string[]>; readOnly: boolean }) {
  const { rows, errors, readOnly } = props;
  const set = (i: number, patch: Partial<TargetRow>) => props.onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  const err = (paths: string[]) => paths.flatMap((p) => errors[p] ?? []).join("; ") || undefined;
  const contactErr = (i: number) => wholeErrors(errors, `targets.${i}.contact`);
  const cell = (r: TargetRow, i: number, c: (typeof COLS)[number]) => (
    <td key={c.key}>
      <CellNumber
        className="nm"
        label={`target ${i + 1} ${c.label} (${c.unit})`}
        name={`targets.${i}.${c.key}`}
        value={r[c.key]}
        readOnly={readOnly}
        error={err(c.path(i))}
        onChange={(v) => set(i, { [c.key]: v })}
      />
    </td>
  );
  return (
    <>
      {rows.length === 0 ? (
        <p className="empty">No targets yet.</p>
      ) : (
        <div className="table-wrap">
          <table className="cell-table" data-testid="target-table">
            <caption className="visually-hidden">Targets: TCP poses in the cell frame</caption>
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Name</th>
                {[...COLS, ...TOL].map((c) => (
                  <th key={c.key} scope="col" className="num">
                    {c.label} ({c.unit})
                  </th>
                ))}
                <th scope="col">Mode</th>
                {FORCE.map((c) => (
                  <th key={c.key} scope="col" className="num">
                    {c.label} ({c.unit})
                  </th>
                ))}
                <th scope="col">Contact (obstacles)</th>
                {!readOnly && <th scope="col">Order</th>}
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={r.key}>
                  <th scope="row" className="idx">
                    {i + 1}
                    {errors[`targets.${i}`] && <span className="err">{errors[`targets.${i}`].join("; ")}</span>}
                  </th>
                  <td>
                    <input
                      className="name"
                      aria-label={`target ${i + 1} name`}
                      name={`targets.${i}.name`}
                      value={r.name}
                      readOnly={readOnly}
                      aria-invalid={errors[`targets.${i}.name`] ? true : undefined}
                      onChange={(e) => set(i, { name: e.target.value })}
                    />
                    {errors[`targets.${i}.name`] && <span className="err">{errors[`targets.${i}.name`].join("; ")}</span>}
                  </td>
                  {COLS.map((c) => cell(r, i, c))}
                  {TOL.map((c) => cell(r, i, c))}
                  <td>
                    <select aria-label={`target ${i + 1} constraint mode`} name={`targets.${i}.mode`} value={r.mode} disabled={readOnly} onChange={(e) => set(i, { mode: e.target.value as TargetRow["mode"] })}>
                      {CONSTRAINT_MODES.map((m) => (
                        <option key={m} value={m}>
                          {m}
                        </option>
                      ))}
                    </select>
                  </td>
                  {FORCE.map((c) => cell(r, i, c))}
                  <td>
                    <input
                      className="name"
                      aria-label={`target ${i + 1} contact: obstacle names, comma-separated`}
                      name={`targets.${i}.contact`}
                      value={r.contact}
                      readOnly={readOnly}
                      placeholder="none"
                      aria-invalid={contactErr(i) ? true : undefined}
                      onChange={(e) => set(i, { contact: e.target.value })}
                    />
                    {contactErr(i) && <span className="err">{contactErr(i)}</span>}
                  </td>
                  {!readOnly && <RowActionsCell rows={rows} index={i} label={`target ${i + 1}`} onChange={(next) => props.onChange(next, true)} />}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {errors["targets"] && <p className="err">{errors["targets"].join("; ")}</p>}
      {!readOnly && (
        <div className="toolbar">
          <button type="button" onClick={() => props.onChange([...rows, newTarget(rows.length + 1)], true)}>
            Add target
          </button>
        </div>
      )}
    </>
  );
}
