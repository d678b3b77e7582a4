"use client";
import { CONSTRAINT_MODES } from "@/shared/schemas";
import { CellNumber, NumberField, SelectField, TextField, wholeErrors } from "../fields";
import { newPath, newWaypoint, type PathForm, type WaypointRow } from "./reqForm";
import { RowActionsCell } from "../RowControls";

const WP: { key: keyof Omit<WaypointRow, "key">; unit: string; path: string }[] = [
  { key: "x", unit: "mm", path: "position.0" },
  { key: "y", unit: "mm", path: "position.1" },
  { key: "z", unit: "mm", path: "position.2" },
  { key: "roll", unit: "°", path: "rpy.0" },
  { key: "pitch", unit: "°", path: "rpy.1" },
  { key: "yaw", unit: "°", path: "rpy.2" },
];

export function PathEditor(props: { paths: PathForm[]; onChange: (paths: PathForm[], structural?: boolean) => void; errors: Record<string, string[]>; readOnly: boolean }) {
  const { paths, errors, readOnly } = props;
  const e = (p: string) => errors[p]?.join("; ");
  const setPath = (i: number, patch: Partial<PathForm>, structural?: boolean) => props.onChange(paths.map((p, k) => (k === i ? { ...p, ...patch } : p)), structural);
  return (
    <>
      {paths.length === 0 && <p className="empty">No paths yet.</p>}
      {paths.map((p, i) => {
        const pre = `paths.${i}`;
        const setWp = (j: number, patch: Partial<WaypointRow>) => setPath(i, { waypoints: p.waypoints.map((w, k) => (k === j ? { ...w, ...patch } : w)) });
        return (
          <fieldset key={p.key} className="panel" data-testid={`path-${i + 1}`}>
            <legend>
              Path {i + 1}
              {p.name.trim() ? `: ${p.name.trim()}` : ""}
            </legend>
            <div className="grid">
              <TextField label="Name" name={`${pre}.name`} value={p.name} onChange={(v) => setPath(i, { name: v })} error={e(`${pre}.name`)} readOnly={readOnly} />
              <SelectField
                label="Constraint mode"
                name={`${pre}.mode`}
                value={p.mode}
                options={CONSTRAINT_MODES.map((m) => ({ value: m, label: m }))}
                onChange={(v) => setPath(i, { mode: v })}
                error={e(`${pre}.mode`)}
                readOnly={readOnly}
              />
              <NumberField label="Sample step" name={`${pre}.step`} unit="mm" value={p.step} onChange={(v) => setPath(i, { step: v })} error={e(`${pre}.step`)} readOnly={readOnly} />
              <NumberField label="Required tool speed" name={`${pre}.speed`} unit="mm/s" value={p.speed} onChange={(v) => setPath(i, { speed: v })} error={e(`${pre}.speed`)} readOnly={readOnly} />
              <TextField
                label="Contact along the path"
                hint="obstacle names the tool and payload may touch, comma-separated"
                name={`${pre}.contact`}
                value={p.contact}
                onChange={(v) => setPath(i, { contact: v })}
                error={wholeErrors(errors, `${pre}.contact`)}
                readOnly={readOnly}
              />
            </div>
            <div className="table-wrap">
              <table className="cell-table">
                <caption className="visually-hidden">Waypoints of path {i + 1}, in order</caption>
                <thead>
                  <tr>
                    <th scope="col">Waypoint</th>
                    {WP.map((c) => (
                      <th key={c.key} scope="col" className="num">
                        {c.key} ({c.unit})
                      </th>
                    ))}
                    {!readOnly && <th scope="col">Order</th>}
                  </tr>
                </thead>
                <tbody>
                  {p.waypoints.map((w, j) => (
                    <tr key={w.key}>
                      <th scope="row" className="idx">
                        {j + 1}
                      </th>
                      {WP.map((c) => (
                        <td key={c.key}>
                          <CellNumber
                            className="nm"
                            label={`path ${i + 1} waypoint ${j + 1} ${c.key} (${c.unit})`}
                            name={`${pre}.waypoints.${j}.${c.key}`}
                            value={w[c.key]}
                            readOnly={readOnly}
                            error={e(`${pre}.waypoints.${j}.${c.path}`)}
                            onChange={(v) => setWp(j, { [c.key]: v })}
                          />
                        </td>
                      ))}
                      {!readOnly && <RowActionsCell rows={p.waypoints} index={j} label={`waypoint ${j + 1} of path ${i + 1}`} onChange={(waypoints) => setPath(i, { waypoints }, true)} />}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            {e(`${pre}.waypoints`) && <p className="err">{e(`${pre}.waypoints`)}</p>}
            {!readOnly && (
              <div className="toolbar">
                <button type="button" onClick={() => setPath(i, { waypoints: [...p.waypoints, newWaypoint(p.waypoints[p.waypoints.length - 1])] }, true)}>
                  Add waypoint to path {i + 1}
                </button>
                <button type="button" className="danger" onClick={() => props.onChange(paths.filter((_, k) => k !== i), true)}>
                  Remove path {i + 1}
                </button>
              </div>
            )}
          </fieldset>
        );
      })}
      {!readOnly && (
        <div className="toolbar">
          <button type="button" onClick={() => props.onChange([...paths, newPath(paths.length + 1)], true)}>
            Add path
          </button>
          <span className="hint">Waypoints are joined by straight lines; orientation is interpolated between them.</span>
        </div>
      )}
    </>
  );
}
