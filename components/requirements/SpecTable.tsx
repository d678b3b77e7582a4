"use client";
import { MOUNTINGS, SPEC_FIELDS, SPEC_FIELD_NAMES, type SpecField } from "@/shared/schemas";
import { COMPARATOR_LABEL, comparatorsFor, newSpec, specUnit, type SpecRow } from "./reqForm";
import { RemoveRowCell } from "../RowControls";

export function SpecTable(props: { rows: SpecRow[]; onChange: (rows: SpecRow[], structural?: boolean) => void; errors: Record<string, string[]>; readOnly: boolean }) {
  const { rows, errors, readOnly } = props;
  const set = (i: number, patch: Partial<SpecRow>) => props.onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)));
  const e = (p: string) => errors[p]?.join("; ");
  function changeField(i: number, field: SpecField) {
    const kind = SPEC_FIELDS[field].kind;
    set(i, {
      field,
      comparator: comparatorsFor(field)[0],
      value: kind === "boolean" ? "yes" : kind === "mounting" ? "floor" : kind === "ip" ? "IP54" : "",
    });
  }
  return (
    <>
      {rows.length === 0 ? (
        <p className="empty">No spec requirements yet.</p>
      ) : (
        <div className="table-wrap">
          <table className="cell-table" data-testid="spec-table">
            <caption className="visually-hidden">Datasheet requirements</caption>
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Datasheet field</th>
                <th scope="col">Comparator</th>
                <th scope="col">Value</th>
                <th scope="col">Priority</th>
                <th scope="col">Note</th>
                {!readOnly && <th scope="col">Remove</th>}
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => {
                const kind = SPEC_FIELDS[r.field].kind;
                const unit = specUnit(r.field);
                const valueErr = e(`specs.${i}.value`);
                return (
                  <tr key={r.key}>
                    <th scope="row" className="idx">
                      {i + 1}
                    </th>
                    <td>
                      <select aria-label={`spec requirement ${i + 1} field`} value={r.field} disabled={readOnly} onChange={(ev) => changeField(i, ev.target.value as SpecField)}>
                        {SPEC_FIELD_NAMES.map((f) => (
                          <option key={f} value={f}>
                            {SPEC_FIELDS[f].label}
                          </option>
                        ))}
                      </select>
                      {e(`specs.${i}.field`) && <span className="err">{e(`specs.${i}.field`)}</span>}
                    </td>
                    <td>
                      <select
                        aria-label={`spec requirement ${i + 1} comparator`}
                        value={r.comparator}
                        disabled={readOnly}
                        aria-invalid={e(`specs.${i}.comparator`) ? true : undefined}
                        onChange={(ev) => set(i, { comparator: ev.target.value as SpecRow["comparator"] })}
                      >
                        {comparatorsFor(r.field).map((c) => (
                          <option key={c} value={c}>
                            {COMPARATOR_LABEL[c]}
                          </option>
                        ))}
                      </select>
                      {e(`specs.${i}.comparator`) && <span className="err">{e(`specs.${i}.comparator`)}</span>}
                    </td>
                    <td>
                      <div className="unit-input">
                        {kind === "mounting" ? (
                          <select aria-label={`spec requirement ${i + 1} value`} value={r.value} disabled={readOnly} onChange={(ev) => set(i, { value: ev.target.value })}>
                            {MOUNTINGS.map((m) => (
                              <option key={m} value={m}>
                                {m}
                              </option>
                            ))}
                          </select>
                        ) : kind === "boolean" ? (
                          <select aria-label={`spec requirement ${i + 1} value`} value={r.value} disabled={readOnly} onChange={(ev) => set(i, { value: ev.target.value })}>
                            <option value="yes">yes</option>
                            <option value="no">no</option>
                          </select>
                        ) : (
                          <>
                            <input
                              className="n"
                              aria-label={`spec requirement ${i + 1} value${unit ? ` (${unit})` : ""}`}
                              inputMode={kind === "number" ? "decimal" : undefined}
                              value={r.value}
                              readOnly={readOnly}
                              aria-invalid={valueErr ? true : undefined}
                              onChange={(ev) => set(i, { value: ev.target.value })}
                            />
                            <span className="unit">{unit || "–"}</span>
                          </>
                        )}
                      </div>
                      {valueErr && <span className="err">{valueErr}</span>}
                    </td>
                    <td>
                      <select aria-label={`spec requirement ${i + 1} priority`} value={r.priority} disabled={readOnly} onChange={(ev) => set(i, { priority: ev.target.value as SpecRow["priority"] })}>
                        <option value="must">must</option>
                        <option value="want">want</option>
                      </select>
                    </td>
                    <td>
                      <input className="note" aria-label={`spec requirement ${i + 1} note`} value={r.note} readOnly={readOnly} onChange={(ev) => set(i, { note: ev.target.value })} />
                    </td>
                    {!readOnly && <RemoveRowCell rows={rows} index={i} label={`spec requirement ${i + 1}`} onChange={(next) => props.onChange(next, true)} />}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      {!readOnly && (
        <div className="toolbar">
          <button type="button" onClick={() => props.onChange([...rows, newSpec()], true)}>
            Add spec requirement
          </button>
          <span className="hint">“must” rows exclude arms that fail them; “want” rows are reported. Reach and repeatability in mm.</span>
        </div>
      )}
    </>
  );
}
