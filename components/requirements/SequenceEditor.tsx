"use client";
import { useId } from "react";
import { fixed } from "@/shared/format";
import { CellNumber, NumberField, SelectField, TextField, errText } from "../fields";
import { RowActionsCell } from "../RowControls";
import { parseNum } from "../pose";
import { newSequence, newStep, perHour, switchRequiredMode, type ReqForm, type RequiredMode, type SequenceForm, type StepRow } from "./reqForm";

const KIND_LABEL: Record<StepRow["kind"], string> = { move: "move", path: "follow path", wait: "wait" };
const MODE_OPTIONS: { value: RequiredMode; label: string }[] = [
  { value: "none", label: "none" },
  { value: "time", label: "a cycle time (s)" },
  { value: "rate", label: "a rate (parts per hour)" },
];

/** The names a step can refer to (trimmed, non-empty, first of each), plus the step's own if it is not among them. */
function nameOptions(names: string[], current: string, what: string): { value: string; label: string }[] {
  const seen = [...new Set(names.map((n) => n.trim()).filter(Boolean))];
  const opts = seen.map((n) => ({ value: n, label: n }));
  if (!seen.includes(current)) opts.unshift({ value: current, label: current ? `${current} (no such ${what})` : `(no ${what} chosen)` });
  return opts;
}

/** A select inside a table cell, labelled for screen readers, with its error below. */
function CellSelect(props: { label: string; name: string; value: string; options: { value: string; label: string }[]; onChange: (v: string) => void; error?: string; readOnly: boolean }) {
  const id = useId();
  return (
    <>
      <select
        id={id}
        name={props.name}
        aria-label={props.label}
        value={props.value}
        disabled={props.readOnly}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? id + "-err" : undefined}
        onChange={(e) => props.onChange(e.target.value)}
      >
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {props.error && (
        <span id={id + "-err"} className="err">
          {props.error}
        </span>
      )}
    </>
  );
}

/** What the requirement amounts to the other way round: "= 120 parts per hour" or "= 30 s per cycle". */
function otherWay(seq: SequenceForm): string | null {
  const text = seq.requiredMode === "time" ? seq.required : seq.requiredMode === "rate" ? seq.rate : "";
  const v = parseNum(text);
  const o = typeof v === "number" ? perHour(v) : null;
  if (o === null) return null;
  return seq.requiredMode === "time" ? `= ${fixed(o, o >= 100 ? 0 : 1)} parts per hour` : `= ${fixed(o, o >= 100 ? 0 : 2)} s per cycle`;
}

/** Seconds the steps hold still (dwells and waits), or null while one is not a number. */
function fixedSeconds(seq: SequenceForm): number | null {
  let sum = 0;
  for (const st of seq.steps) {
    const text = st.kind === "move" ? st.dwell : st.kind === "wait" ? st.seconds : "";
    const v = parseNum(text);
    if (v === "bad") return null;
    sum += v ?? 0;
  }
  return sum;
}

/**
 * Task sequences of the requirement set: per sequence a name, a required cycle time or rate, and
 * an ordered list of steps (move to a target with a dwell, follow a path, wait), each row
 * reordered or removed with its buttons (docs/formats.md#sequence).
 */
export function SequenceEditor(props: {
  sequences: SequenceForm[];
  form: Pick<ReqForm, "targets" | "paths">;
  onChange: (sequences: SequenceForm[], structural?: boolean) => void;
  errors: Record<string, string[]>;
  readOnly: boolean;
}) {
  const { sequences, errors, readOnly, form } = props;
  const e = (p: string) => errText(errors, p);
  const setSeq = (i: number, next: SequenceForm, structural?: boolean) => props.onChange(sequences.map((q, k) => (k === i ? next : q)), structural);
  const targetNames = form.targets.map((t) => t.name);
  const pathNames = form.paths.map((p) => p.name);
  return (
    <>
      {sequences.length === 0 && <p className="empty">No sequences yet: add one to have each arm&apos;s cycle time estimated.</p>}
      {sequences.map((q, i) => {
        const pre = `sequences.${i}`;
        const n = i + 1;
        const setStep = (k: number, patch: Partial<StepRow>) => setSeq(i, { ...q, steps: q.steps.map((s, j) => (j === k ? { ...s, ...patch } : s)) });
        const still = fixedSeconds(q);
        const other = otherWay(q);
        const reqErr = e(`${pre}.required`);
        return (
          <fieldset key={q.key} className="panel sequence" data-testid={`sequence-${n}`}>
            <legend>
              Sequence {n}
              {q.name.trim() ? `: ${q.name.trim()}` : ""}
            </legend>
            <div className="grid">
              <TextField label="Name" name={`${pre}.name`} value={q.name} onChange={(v) => setSeq(i, { ...q, name: v })} error={e(`${pre}.name`)} readOnly={readOnly} />
              <SelectField
                label="Required"
                name={`${pre}.requiredMode`}
                value={q.requiredMode}
                options={MODE_OPTIONS}
                onChange={(m) => setSeq(i, switchRequiredMode(q, m))}
                error={q.requiredMode === "none" ? reqErr : undefined}
                readOnly={readOnly}
              />
              {q.requiredMode === "time" && (
                <NumberField label="Required cycle time" name={`${pre}.required`} unit="s" value={q.required} onChange={(v) => setSeq(i, { ...q, required: v })} error={reqErr} readOnly={readOnly} />
              )}
              {q.requiredMode === "rate" && (
                <NumberField label="Required rate" name={`${pre}.rate`} unit="parts/h" value={q.rate} onChange={(v) => setSeq(i, { ...q, rate: v })} error={reqErr} readOnly={readOnly} />
              )}
            </div>
            {q.requiredMode !== "none" && (
              <p className="hint" data-testid={`sequence-${n}-required-other`} aria-live="polite">
                {other ?? "Enter a number greater than 0."}
                {q.requiredMode === "rate" ? "; saved as the cycle time 3600 / rate." : ""}
              </p>
            )}
            <div className="table-wrap">
              <table className="cell-table" data-testid={`sequence-${n}-steps`}>
                <caption className="visually-hidden">Steps of sequence {n}, in order; the cycle closes from the last step back to the first</caption>
                <thead>
                  <tr>
                    <th scope="col">Step</th>
                    <th scope="col">Kind</th>
                    <th scope="col">Target or path</th>
                    <th scope="col">Dwell or wait (s)</th>
                    {!readOnly && <th scope="col">Order</th>}
                  </tr>
                </thead>
                <tbody>
                  {q.steps.map((st, k) => {
                    const sp = `${pre}.steps.${k}`;
                    const label = `sequence ${n} step ${k + 1}`;
                    return (
                      <tr key={st.key}>
                        <th scope="row" className="idx">
                          {k + 1}
                          {e(sp) && <span className="err">{e(sp)}</span>}
                        </th>
                        <td>
                          <CellSelect
                            label={`${label} kind`}
                            name={`${sp}.kind`}
                            value={st.kind}
                            options={(["move", "path", "wait"] as const).map((v) => ({ value: v, label: KIND_LABEL[v] }))}
                            readOnly={readOnly}
                            onChange={(v) => {
                              const kind = v as StepRow["kind"];
                              const fill = newStep(kind, form);
                              setStep(k, { kind, target: st.target || fill.target, path: st.path || fill.path, seconds: st.seconds || fill.seconds });
                            }}
                          />
                        </td>
                        <td>
                          {st.kind === "move" && (
                            <CellSelect label={`${label} target`} name={`${sp}.target`} value={st.target} options={nameOptions(targetNames, st.target, "target")} readOnly={readOnly} error={e(`${sp}.target`)} onChange={(v) => setStep(k, { target: v })} />
                          )}
                          {st.kind === "path" && (
                            <CellSelect label={`${label} path`} name={`${sp}.path`} value={st.path} options={nameOptions(pathNames, st.path, "path")} readOnly={readOnly} error={e(`${sp}.path`)} onChange={(v) => setStep(k, { path: v })} />
                          )}
                          {st.kind === "wait" && <span className="hint">stand still</span>}
                        </td>
                        <td>
                          {st.kind === "move" && (
                            <CellNumber className="nm" label={`${label} dwell (s)`} name={`${sp}.dwell`} value={st.dwell} placeholder="none" readOnly={readOnly} error={e(`${sp}.dwell`)} onChange={(v) => setStep(k, { dwell: v })} />
                          )}
                          {st.kind === "wait" && (
                            <CellNumber className="nm" label={`${label} wait (s)`} name={`${sp}.seconds`} value={st.seconds} readOnly={readOnly} error={e(`${sp}.seconds`)} onChange={(v) => setStep(k, { seconds: v })} />
                          )}
                          {st.kind === "path" && <span className="hint">at the path&apos;s speed</span>}
                        </td>
                        {!readOnly && <RowActionsCell rows={q.steps} index={k} label={label} onChange={(steps) => setSeq(i, { ...q, steps }, true)} />}
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            {e(`${pre}.steps`) && <p className="err">{e(`${pre}.steps`)}</p>}
            <p className="hint" data-testid={`sequence-${n}-still`}>
              {q.steps.length} step{q.steps.length === 1 ? "" : "s"}; {still === null ? "dwells and waits: not all numbers yet" : `dwells and waits ${fixed(still, 2)} s`}. The moves between them are timed per arm by the analysis; the
              cycle closes from the last step back to the first.
            </p>
            {!readOnly && (
              <div className="toolbar">
                <button type="button" onClick={() => setSeq(i, { ...q, steps: [...q.steps, newStep("move", form)] }, true)}>
                  Add move to sequence {n}
                </button>
                <button type="button" onClick={() => setSeq(i, { ...q, steps: [...q.steps, newStep("path", form)] }, true)}>
                  Add path step to sequence {n}
                </button>
                <button type="button" onClick={() => setSeq(i, { ...q, steps: [...q.steps, newStep("wait", form)] }, true)}>
                  Add wait to sequence {n}
                </button>
                <button type="button" className="danger" onClick={() => props.onChange(sequences.filter((_, k) => k !== i), true)}>
                  Remove sequence {n}
                </button>
              </div>
            )}
          </fieldset>
        );
      })}
      {e("sequences") && <p className="err">{e("sequences")}</p>}
      {!readOnly && (
        <div className="toolbar">
          <button type="button" onClick={() => props.onChange([...sequences, newSequence(sequences.length + 1, form)], true)}>
            Add sequence
          </button>
        </div>
      )}
    </>
  );
}
