"use client";
import { CellNumber } from "../fields";
import { AXIS_FIELDS, CHAIN_FIELD_PATH, JOINT_LABEL, ORIGIN_FIELDS, jointFieldUnit, newJointRow, type JointNumField, type JointRow, type JointType } from "./armForm";
import { RowActionsCell } from "../RowControls";
import { ASSUMED_ACCELERATION_TIME } from "@/lib/analysis/cycle";

const LIMITS: JointNumField[] = ["min", "max", "maxSpeed", "maxAcceleration", "maxTorque", "mass"];

const jointList = (ns: number[]) => `${ns.length === 1 ? "Joint" : "Joints"} ${ns.join(", ")}`;

/**
 * Which joints the cycle-time model has to make assumptions for: no acceleration limit (an assumed
 * one, the result an estimate) or no speed limit (the cycle is unknown) (docs/design.md#cycle-time).
 */
export function CycleLimitsNote({ rows }: { rows: JointRow[] }) {
  const noAcc = rows.flatMap((r, i) => (r.maxAcceleration.trim() === "" ? [i + 1] : []));
  const noSpeed = rows.flatMap((r, i) => (r.maxSpeed.trim() === "" ? [i + 1] : []));
  if (noAcc.length === 0 && noSpeed.length === 0) {
    return (
      <p className="hint" data-testid="cycle-limits-note">
        Every joint states a max speed and a max acceleration: cycle times use them as entered.
      </p>
    );
  }
  return (
    <div className="notice warn" data-testid="cycle-limits-note">
      {noAcc.length > 0 && (
        <p>
          <strong>{jointList(noAcc)}</strong> {noAcc.length === 1 ? "has" : "have"} no max acceleration: cycle times assume each reaches its max speed in {ASSUMED_ACCELERATION_TIME} s
          (an assumed value, not the maker&apos;s) and are marked as estimates.
        </p>
      )}
      {noSpeed.length > 0 && (
        <p>
          <strong>{jointList(noSpeed)}</strong> {noSpeed.length === 1 ? "has" : "have"} no max speed: path speeds and cycle times are unknown for this arm.
        </p>
      )}
    </div>
  );
}
const DH_MAIN: JointNumField[] = ["a", "alpha", "d", "theta", ...LIMITS];
const CHAIN_MAIN: JointNumField[] = [...ORIGIN_FIELDS, ...AXIS_FIELDS, ...LIMITS];

/** Document path of a column (chain columns live under origin.xyz, origin.rpy and axis). */
const pathOf = (f: JointNumField): string => (CHAIN_FIELD_PATH as Partial<Record<JointNumField, string>>)[f] ?? f;

function headerUnit(f: JointNumField, rows: JointRow[]): string {
  const units = new Set(rows.map((r) => jointFieldUnit(f, r.type)));
  if (units.size === 0) units.add(jointFieldUnit(f, "revolute"));
  return [...units].join(" or ");
}

/** Editable joint table (DH parameters, or origin and axis for a chain): one row per joint, in order from the base. */
export function JointTable(props: {
  rows: JointRow[];
  /** Which columns: the DH table (dh, mdh) or the chain's origin and axis. */
  chain?: boolean;
  onChange: (rows: JointRow[], structural?: boolean) => void;
  errors: Record<string, string[]>;
  readOnly: boolean;
  maxJoints: number;
}) {
  const { rows, errors, readOnly } = props;
  const MAIN = props.chain ? CHAIN_MAIN : DH_MAIN;
  const set = (i: number, patch: Partial<JointRow>) => props.onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  const e = (i: number, f: string) => {
    const p = pathOf(f as JointNumField);
    const own = errors[`joints.${i}.${p}`] ?? [];
    // Whole-vector problems (a zero axis, a bad origin) show on the first cell of the vector.
    const whole = f === "axisX" ? errors[`joints.${i}.axis`] ?? [] : f === "ox" ? [...(errors[`joints.${i}.origin`] ?? []), ...(errors[`joints.${i}.origin.xyz`] ?? [])] : f === "roll" ? errors[`joints.${i}.origin.rpy`] ?? [] : [];
    return [...whole, ...own].join("; ") || undefined;
  };
  const comErr = (i: number) =>
    [errors[`joints.${i}.com`], errors[`joints.${i}.com.0`], errors[`joints.${i}.com.1`], errors[`joints.${i}.com.2`]].flat().filter(Boolean).join("; ") || undefined;

  return (
    <>
      <div className="table-wrap">
        <table className="cell-table" data-testid="joint-table">
          <caption className="visually-hidden">{props.chain ? "Joint origins, axes and limits per joint" : "DH parameters and limits per joint"}</caption>
          <thead>
            <tr>
              <th scope="col">Joint</th>
              <th scope="col">Type</th>
              {MAIN.map((f) => (
                <th scope="col" key={f} className="num">
                  {JOINT_LABEL[f]}
                  {headerUnit(f, rows) && ` (${headerUnit(f, rows)})`}
                </th>
              ))}
              <th scope="col">CoM x y z (mm)</th>
              <th scope="col" className="num">
                {JOINT_LABEL.radius} (mm)
              </th>
              {!readOnly && <th scope="col">Order</th>}
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => {
              const rowErr = errors[`joints.${i}`]?.join("; ");
              const n = i + 1;
              return (
                <tr key={r.key} data-row={n}>
                  <th scope="row" className="idx">
                    {n}
                    {rowErr && <span className="err">{rowErr}</span>}
                  </th>
                  <td>
                    <label className="visually-hidden" htmlFor={`jt-${r.key}`}>
                      joint {n} type
                    </label>
                    <select
                      id={`jt-${r.key}`}
                      name={`joints.${i}.type`}
                      value={r.type}
                      disabled={readOnly}
                      onChange={(ev) => set(i, { type: ev.target.value as JointType })}
                    >
                      <option value="revolute">revolute</option>
                      <option value="prismatic">prismatic</option>
                    </select>
                  </td>
                  {MAIN.map((f) => (
                    <td key={f}>
                      <CellNumber
                        label={`joint ${n} ${JOINT_LABEL[f]}${jointFieldUnit(f, r.type) ? ` (${jointFieldUnit(f, r.type)})` : ""}`}
                        name={`joints.${i}.${pathOf(f)}`}
                        value={r[f]}
                        readOnly={readOnly}
                        error={e(i, f)}
                        placeholder={f === "maxAcceleration" ? "assumed" : undefined}
                        onChange={(v) => set(i, { [f]: v })}
                      />
                    </td>
                  ))}
                  <td>
                    <div className="com-cell">
                      {(["comX", "comY", "comZ"] as const).map((f) => (
                        <CellNumber
                          key={f}
                          className="nm"
                          label={`joint ${n} ${JOINT_LABEL[f]} (mm)`}
                          name={`joints.${i}.${f}`}
                          value={r[f]}
                          readOnly={readOnly}
                          onChange={(v) => set(i, { [f]: v })}
                        />
                      ))}
                    </div>
                    {comErr(i) && <span className="err">{comErr(i)}</span>}
                  </td>
                  <td>
                    <CellNumber
                      className="nm"
                      label={`joint ${n} ${JOINT_LABEL.radius} (mm)`}
                      name={`joints.${i}.radius`}
                      value={r.radius}
                      readOnly={readOnly}
                      error={e(i, "radius")}
                      onChange={(v) => set(i, { radius: v })}
                    />
                  </td>
                  {!readOnly && <RowActionsCell rows={rows} index={i} label={`joint ${n}`} canRemove={rows.length > 1} onChange={(next) => props.onChange(next, true)} />}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {errors["joints"] && <p className="err">{errors["joints"].join("; ")}</p>}
      <CycleLimitsNote rows={rows} />
      {!readOnly && (
        <div className="toolbar">
          <button type="button" disabled={rows.length >= props.maxJoints} onClick={() => props.onChange([...rows, newJointRow("revolute")], true)}>
            Add revolute joint
          </button>
          <button type="button" disabled={rows.length >= props.maxJoints} onClick={() => props.onChange([...rows, newJointRow("prismatic")], true)}>
            Add prismatic joint
          </button>
          <span className="hint">Up to {props.maxJoints} joints. Empty optional cells mean “not stated”.</span>
        </div>
      )}
    </>
  );
}
