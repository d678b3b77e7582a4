"use client";
import type { ObstacleShape } from "@/shared/schemas";
import { CellNumber } from "../fields";
import { RowActionsCell } from "../RowControls";
import { newShapeRow, shapeCellPaths, SIZE_LABELS, withShape, type ShapeRow, type ShapeTextKey } from "./shapes";

const POS: { key: ShapeTextKey; label: string; unit: string }[] = [
  { key: "x", label: "x", unit: "mm" },
  { key: "y", label: "y", unit: "mm" },
  { key: "z", label: "z", unit: "mm" },
  { key: "roll", label: "roll", unit: "°" },
  { key: "pitch", label: "pitch", unit: "°" },
  { key: "yaw", label: "yaw", unit: "°" },
];
const SIZES: ShapeTextKey[] = ["s1", "s2", "s3"];

/**
 * An editable table of shapes (obstacles, or a tool's or payload's shapes): name, shape, centre,
 * orientation and sizes, one row each, with field errors beside the cells.
 */
export function ShapeTable(props: {
  rows: ShapeRow[];
  onChange: (rows: ShapeRow[], structural?: boolean) => void;
  errors: Record<string, string[]>;
  readOnly: boolean;
  /** Document path of the list, e.g. "cell.obstacles" or "tool.collision". */
  prefix: string;
  /** Row noun for labels and buttons, e.g. "obstacle" or "tool shape". */
  noun: string;
  shapes: readonly ObstacleShape[];
  /** Whether a name is required (obstacles) or optional (tool and payload shapes). */
  named: boolean;
  caption: string;
  testId: string;
}) {
  const { rows, errors, readOnly, prefix, noun } = props;
  const set = (i: number, patch: Partial<ShapeRow>) => props.onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  const err = (paths: string[]) => paths.flatMap((p) => errors[p] ?? []).join("; ") || undefined;
  return (
    <>
      {rows.length === 0 ? (
        <p className="empty">No {noun}s yet.</p>
      ) : (
        <div className="table-wrap">
          <table className="cell-table" data-testid={props.testId}>
            <caption className="visually-hidden">{props.caption}</caption>
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Name{props.named ? "" : " (optional)"}</th>
                <th scope="col">Shape</th>
                {POS.map((c) => (
                  <th key={c.key} scope="col" className="num">
                    {c.label} ({c.unit})
                  </th>
                ))}
                <th scope="col" className="num">size 1 (mm)</th>
                <th scope="col" className="num">size 2 (mm)</th>
                <th scope="col" className="num">size 3 (mm)</th>
                {!readOnly && <th scope="col">Order</th>}
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => {
                const what = `${noun} ${i + 1}${r.name.trim() ? ` (${r.name.trim()})` : ""}`;
                const sizes = SIZE_LABELS[r.shape];
                return (
                  <tr key={r.key}>
                    <th scope="row" className="idx">
                      {i + 1}
                      {err([`${prefix}.${i}`]) && <span className="err">{err([`${prefix}.${i}`])}</span>}
                    </th>
                    <td>
                      <input
                        className="name"
                        aria-label={`${noun} ${i + 1} name`}
                        name={`${prefix}.${i}.name`}
                        value={r.name}
                        readOnly={readOnly}
                        aria-invalid={err(shapeCellPaths(prefix, i, r, "name")) ? true : undefined}
                        onChange={(e) => set(i, { name: e.target.value })}
                      />
                      {err(shapeCellPaths(prefix, i, r, "name")) && <span className="err">{err(shapeCellPaths(prefix, i, r, "name"))}</span>}
                    </td>
                    <td>
                      <select aria-label={`${noun} ${i + 1} shape`} name={`${prefix}.${i}.shape`} value={r.shape} disabled={readOnly} onChange={(e) => props.onChange(rows.map((x, k) => (k === i ? withShape(x, e.target.value as ObstacleShape) : x)))}>
                        {props.shapes.map((s) => (
                          <option key={s} value={s}>
                            {s}
                          </option>
                        ))}
                      </select>
                    </td>
                    {POS.map((c) => {
                      const unused = r.shape === "sphere" && (c.key === "roll" || c.key === "pitch" || c.key === "yaw");
                      return (
                        <td key={c.key}>
                          {unused ? (
                            <span className="hint" aria-label={`${what} ${c.label}: not used by a sphere`}>–</span>
                          ) : (
                            <CellNumber
                              className="nm"
                              label={`${what} ${c.label} (${c.unit})`}
                              name={`${prefix}.${i}.${c.key}`}
                              value={r[c.key]}
                              readOnly={readOnly}
                              error={err(shapeCellPaths(prefix, i, r, c.key))}
                              onChange={(v) => set(i, { [c.key]: v })}
                            />
                          )}
                        </td>
                      );
                    })}
                    {SIZES.map((k, n) => (
                      <td key={k}>
                        {sizes[n] === null ? (
                          <span className="hint" aria-label={`${what} size ${n + 1}: not used by a ${r.shape}`}>–</span>
                        ) : (
                          <>
                            <CellNumber
                              className="nm"
                              label={`${what} ${sizes[n]} (mm)`}
                              name={`${prefix}.${i}.${k}`}
                              value={r[k]}
                              readOnly={readOnly}
                              error={err(shapeCellPaths(prefix, i, r, k))}
                              onChange={(v) => set(i, { [k]: v })}
                            />
                            <span className="hint small-label">{sizes[n]}</span>
                          </>
                        )}
                      </td>
                    ))}
                    {!readOnly && <RowActionsCell rows={rows} index={i} label={`${noun} ${i + 1}`} onChange={(next) => props.onChange(next, true)} />}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      {err([prefix]) && <p className="err">{err([prefix])}</p>}
      {!readOnly && (
        <div className="toolbar">
          {props.shapes.map((s) => (
            <button key={s} type="button" onClick={() => props.onChange([...rows, newShapeRow(s, props.named ? `${s} ${rows.length + 1}` : "")], true)}>
              Add {s}
            </button>
          ))}
        </div>
      )}
    </>
  );
}
