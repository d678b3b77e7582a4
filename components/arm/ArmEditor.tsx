"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { MAX_JOINTS, MOUNTINGS, type ArmDocument, type FieldError } from "@/shared/schemas";
import { api, byPath } from "../api";
import { ErrorSummary, NumberField, SelectField, TextField, errText, CellNumber } from "../fields";
import { PoseFieldset } from "../PoseFieldset";
import { ConflictPanel, KeptEdits, diffPaths, valueAt, type ConflictRow } from "../ConflictPanel";
import { DeleteControl } from "../DeleteControl";
import { RPY_CONVENTION, rowKey, type PoseText } from "../pose";
import { armFormFromDoc, armPathLabel, describeError, emptyArmForm, validateArmForm, type ArmForm } from "./armForm";
import { formatArmValue } from "./format";
import { JointTable } from "./JointTable";
import { DhPastePanel } from "./DhPastePanel";
import { RemoveRowCell } from "../RowControls";

interface Props {
  /** Arm id when editing an existing arm; absent for a new one. */
  id?: string;
  revision?: number;
  initial?: ArmDocument;
  /** Whether the signed-in user may change arms. */
  canWrite: boolean;
  /** Viewing a past revision: read-only, no save. */
  viewingRevision?: number;
  deleted?: boolean;
  /** Just created: say so once. */
  created?: boolean;
}

interface ConflictState {
  byName: string | null;
  baseRevision: number;
  currentRevision: number;
  current: ArmDocument;
  rows: ConflictRow[];
  mine: ArmDocument;
}

function poseErrors(errors: Record<string, string[]>, key: "base" | "tool"): Partial<Record<keyof PoseText, string>> {
  const out: Partial<Record<keyof PoseText, string>> = {};
  for (const k of ["x", "y", "z", "roll", "pitch", "yaw"] as const) {
    const m = errText(errors, `${key}.${k}`);
    if (m) out[k] = m;
  }
  return out;
}
function wholeErrors(errors: Record<string, string[]>, key: string): string | undefined {
  const m = Object.entries(errors)
    .filter(([p]) => p === key || new RegExp(`^${key}\\.\\d+$`).test(p))
    .flatMap(([, ms]) => ms);
  return m.length ? m.join("; ") : undefined;
}

/** Transform entries are shown as one pose, not as 16 matrix cells. */
function groupArmPath(path: string): string {
  return /^(base|tool)\.\d+$/.test(path) ? path.split(".")[0] : path;
}

export function ArmEditor(props: Props) {
  const router = useRouter();
  const uid = useId();
  const readOnly = !props.canWrite || props.viewingRevision !== undefined || props.deleted === true;
  const [form, setForm] = useState<ArmForm>(() => (props.initial ? armFormFromDoc(props.initial) : emptyArmForm()));
  const [startDoc, setStartDoc] = useState<ArmDocument | undefined>(props.initial);
  const [baseRevision, setBaseRevision] = useState<number | undefined>(props.revision);
  const [errors, setErrors] = useState<FieldError[]>([]);
  const [message, setMessage] = useState<string>("");
  const [saved, setSaved] = useState<string>(props.created ? "Created as revision 1." : "");
  const [busy, setBusy] = useState(false);
  const [pasteOpen, setPasteOpen] = useState(false);
  const [conflict, setConflict] = useState<ConflictState | null>(null);
  const [kept, setKept] = useState<{ rows: { label: string; path: string; mine: string }[]; json: string } | null>(null);

  const errMap = useMemo(() => byPath(errors), [errors]);
  const summary = errors.map((e) => describeError(e, armPathLabel));
  const update = (patch: Partial<ArmForm>) => {
    setForm((f) => ({ ...f, ...patch }));
    setSaved("");
  };
  const updateSpecs = (patch: Partial<ArmForm["specs"]>) => update({ specs: { ...form.specs, ...patch } });

  async function save() {
    setSaved("");
    setMessage("");
    const { doc, errors: clientErrors } = validateArmForm(form);
    if (clientErrors.length) {
      setErrors(clientErrors);
      setMessage(`Not saved: ${clientErrors.length === 1 ? "1 problem" : `${clientErrors.length} problems`}, marked at the fields and listed above this bar.`);
      return;
    }
    setBusy(true);
    const res = props.id
      ? await api<{ id: string; revision: number; arm: ArmDocument }>(`/api/arms/${props.id}`, "PUT", { baseRevision, arm: doc })
      : await api<{ id: string; revision: number; arm: ArmDocument }>("/api/arms", "POST", doc);
    setBusy(false);
    if (res.ok) {
      setErrors([]);
      if (!props.id) {
        router.push(`/arms/${res.data.id}?created=1`);
        return;
      }
      setBaseRevision(res.data.revision);
      setStartDoc(res.data.arm);
      setForm(armFormFromDoc(res.data.arm));
      setSaved(`Saved as revision ${res.data.revision}.`);
      return;
    }
    if (res.status === 409 && res.error.conflict) {
      const c = res.error.conflict;
      const current = c.current as ArmDocument;
      let byName: string | null = null;
      const revs = await api<{ revisions: { revision: number; author: { name: string } | null }[] }>(`/api/arms/${props.id}/revisions`, "GET");
      if (revs.ok) byName = revs.data.revisions.find((r) => r.revision === c.currentRevision)?.author?.name ?? null;
      // Leaf paths: expand whole-array changes the server may report.
      const paths = [...new Set(c.changes.map((ch) => groupArmPath(ch.path)))];
      const rows: ConflictRow[] = paths.map((path) => ({
        path,
        label: armPathLabel(path),
        base: formatArmValue(path, valueAt(startDoc, path), startDoc),
        current: formatArmValue(path, valueAt(current, path), current),
        mine: formatArmValue(path, valueAt(doc, path), doc),
      }));
      setConflict({ byName, baseRevision: c.baseRevision, currentRevision: c.currentRevision, current, rows, mine: doc });
      setMessage("");
      return;
    }
    setErrors(res.error.fieldErrors ?? []);
    setMessage(res.status === 403 ? "Not saved: your role may not change arms." : `Not saved: ${res.error.message}`);
  }

  function loadLatest(keep: boolean) {
    if (!conflict) return;
    if (keep) {
      const mineChanged = startDoc ? diffPaths(startDoc, conflict.mine) : [];
      setKept({
        rows: mineChanged.map((path) => ({ path, label: armPathLabel(path), mine: formatArmValue(path, valueAt(conflict.mine, path), conflict.mine) })),
        json: JSON.stringify(conflict.mine, null, 2),
      });
    } else setKept(null);
    setForm(armFormFromDoc(conflict.current));
    setStartDoc(conflict.current);
    setBaseRevision(conflict.currentRevision);
    setErrors([]);
    setConflict(null);
    setSaved(`Loaded revision ${conflict.currentRevision}.`);
  }

  const title = props.viewingRevision !== undefined ? `${form.name} · revision ${props.viewingRevision}` : props.id ? form.name || "Arm" : "New arm";
  return (
    <form
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (!readOnly) void save();
      }}
      aria-labelledby={uid + "-title"}
    >
      <div className="page-head">
        <h1 id={uid + "-title"}>{title}</h1>
        {props.id && baseRevision !== undefined && props.viewingRevision === undefined && <span className="sub">revision {baseRevision}</span>}
        <div className="actions no-print">
          {props.id && (
            <>
              <Link href={`/arms/${props.id}/history`}>History</Link>
              <a className="button" href={`/api/arms/${props.id}/export`} download>
                Export JSON
              </a>
            </>
          )}
          {props.id && props.canWrite && props.viewingRevision === undefined && !props.deleted && <DeleteControl url={`/api/arms/${props.id}`} what="arm" afterHref="/arms" />}
        </div>
      </div>
      {props.viewingRevision !== undefined && (
        <p className="notice">
          A past revision, read-only. <Link href={`/arms/${props.id}`}>Open the latest revision</Link>.
        </p>
      )}
      {props.deleted && <p className="notice warn">This arm is deleted. Restore it from the catalog to edit it.</p>}
      {!props.canWrite && props.viewingRevision === undefined && (
        <p className="notice" data-testid="read-only-note">
          Read-only: your role is viewer. An administrator can make you an editor.
        </p>
      )}

      {conflict && (
        <ConflictPanel
          what="arm"
          byName={conflict.byName}
          baseRevision={conflict.baseRevision}
          currentRevision={conflict.currentRevision}
          rows={conflict.rows}
          onKeep={() => loadLatest(true)}
          onDiscard={() => loadLatest(false)}
        />
      )}
      {kept && <KeptEdits rows={kept.rows} json={kept.json} onDismiss={() => setKept(null)} />}

      <fieldset className="panel">
        <legend>Identity</legend>
        <div className="grid wide">
          <TextField label="Name" name="name" value={form.name} onChange={(v) => update({ name: v })} error={errText(errMap, "name")} readOnly={readOnly} required />
          <TextField label="Maker" name="maker" value={form.maker} onChange={(v) => update({ maker: v })} error={errText(errMap, "maker")} readOnly={readOnly} />
          <TextField label="Model code" name="modelCode" value={form.modelCode} onChange={(v) => update({ modelCode: v })} error={errText(errMap, "modelCode")} readOnly={readOnly} />
        </div>
        <div className="field">
          <label htmlFor={uid + "-desc"}>Description</label>
          <textarea
            id={uid + "-desc"}
            name="description"
            rows={2}
            style={{ fontFamily: "inherit" }}
            value={form.description}
            readOnly={readOnly}
            onChange={(e) => update({ description: e.target.value })}
          />
        </div>
      </fieldset>

      <fieldset className="panel">
        <legend>Kinematics (DH table)</legend>
        <div role="radiogroup" aria-label="DH convention" className="checks" style={{ marginBottom: "0.4rem" }}>
          <label>
            <input type="radio" name="convention" value="dh" checked={form.convention === "dh"} disabled={readOnly} onChange={() => update({ convention: "dh" })} />
            <span>
              <strong>dh</strong> (standard): link i = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ)
            </span>
          </label>
          <label>
            <input type="radio" name="convention" value="mdh" checked={form.convention === "mdh"} disabled={readOnly} onChange={() => update({ convention: "mdh" })} />
            <span>
              <strong>mdh</strong> (modified): link i = Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ); row i holds a and α of the link before joint i
            </span>
          </label>
        </div>
        <p className="hint">
          The joint variable q adds to θ (revolute) or to d (prismatic); min and max bound q. Lengths in mm, angles in degrees.
          {form.convention === "mdh" && " In mdh the last link's length goes into the tool transform."}
        </p>
        <JointTable
          rows={form.joints}
          maxJoints={MAX_JOINTS}
          readOnly={readOnly}
          errors={errMap}
          onChange={(rows, structural) => {
            update({ joints: rows });
            if (structural) setErrors([]);
          }}
        />
        {!readOnly && !pasteOpen && (
          <button type="button" onClick={() => setPasteOpen(true)}>
            Paste from spreadsheet…
          </button>
        )}
        {!readOnly && pasteOpen && (
          <DhPastePanel
            onClose={() => setPasteOpen(false)}
            onApply={(rows) => {
              update({ joints: rows });
              setErrors([]);
            }}
          />
        )}
      </fieldset>

      <div className="two-col">
        <PoseFieldset
          legend="Base transform (arm base → first DH frame)"
          idPrefix="base"
          description={<>x y z in mm, then {RPY_CONVENTION}. Saved as a row-major 4×4 in metres.</>}
          value={form.base}
          onChange={(v) => update({ base: v })}
          errors={poseErrors(errMap, "base")}
          errorAll={wholeErrors(errMap, "base")}
          readOnly={readOnly}
        />
        <PoseFieldset
          legend="Tool transform (flange → tool point)"
          idPrefix="tool"
          description={<>x y z in mm, then {RPY_CONVENTION}. Saved as a row-major 4×4 in metres.</>}
          value={form.tool}
          onChange={(v) => update({ tool: v })}
          errors={poseErrors(errMap, "tool")}
          errorAll={wholeErrors(errMap, "tool")}
          readOnly={readOnly}
        />
      </div>

      <fieldset className="panel">
        <legend>Datasheet specs</legend>
        <div className="grid">
          <NumberField label="Rated payload" name="specs.ratedPayload" unit="kg" value={form.specs.ratedPayload} onChange={(v) => updateSpecs({ ratedPayload: v })} error={errText(errMap, "specs.ratedPayload")} readOnly={readOnly} />
          <NumberField label="Reach" name="specs.reach" unit="mm" value={form.specs.reach} onChange={(v) => updateSpecs({ reach: v })} error={errText(errMap, "specs.reach")} readOnly={readOnly} />
          <NumberField
            label="Pose repeatability"
            hint="ISO 9283 RP"
            name="specs.repeatability"
            unit="mm"
            value={form.specs.repeatability}
            onChange={(v) => updateSpecs({ repeatability: v })}
            error={errText(errMap, "specs.repeatability")}
            readOnly={readOnly}
          />
          <NumberField label="Arm mass" name="specs.armMass" unit="kg" value={form.specs.armMass} onChange={(v) => updateSpecs({ armMass: v })} error={errText(errMap, "specs.armMass")} readOnly={readOnly} />
          <TextField label="IP code" hint="IEC 60529, e.g. IP54" name="specs.ipCode" value={form.specs.ipCode} onChange={(v) => updateSpecs({ ipCode: v })} error={errText(errMap, "specs.ipCode")} readOnly={readOnly} />
          <SelectField
            label="Collaborative"
            name="specs.collaborative"
            value={form.specs.collaborative}
            options={[
              { value: "", label: "not stated" },
              { value: "yes", label: "yes" },
              { value: "no", label: "no" },
            ]}
            onChange={(v) => updateSpecs({ collaborative: v })}
            readOnly={readOnly}
          />
          <NumberField label="Price" name="specs.price" unit={form.specs.currency || "currency"} value={form.specs.price} onChange={(v) => updateSpecs({ price: v })} error={errText(errMap, "specs.price")} readOnly={readOnly} />
          <TextField label="Currency" hint="ISO 4217, e.g. EUR" name="specs.currency" value={form.specs.currency} onChange={(v) => updateSpecs({ currency: v })} error={errText(errMap, "specs.currency")} readOnly={readOnly} />
          <NumberField label="Lead time" name="specs.leadTimeWeeks" unit="weeks" value={form.specs.leadTimeWeeks} onChange={(v) => updateSpecs({ leadTimeWeeks: v })} error={errText(errMap, "specs.leadTimeWeeks")} readOnly={readOnly} />
        </div>
        <fieldset className="field" style={{ border: "none", padding: 0, margin: "0 0 0.75rem" }}>
          <legend style={{ fontWeight: 550, fontSize: "0.88rem" }}>Mounting options</legend>
          <div className="checks">
            {MOUNTINGS.map((m) => (
              <label key={m}>
                <input
                  type="checkbox"
                  name={`specs.mounting.${m}`}
                  checked={form.specs.mounting.includes(m)}
                  disabled={readOnly}
                  onChange={(e) => updateSpecs({ mounting: e.target.checked ? MOUNTINGS.filter((x) => x === m || form.specs.mounting.includes(x)) : form.specs.mounting.filter((x) => x !== m) })}
                />
                {m}
              </label>
            ))}
          </div>
          {wholeErrors(errMap, "specs.mounting") && <span className="err">{wholeErrors(errMap, "specs.mounting")}</span>}
        </fieldset>
        <h3>Allowable wrist loads (from the datasheet&apos;s load diagram)</h3>
        {form.specs.wristAllowables.length === 0 ? (
          <p className="empty">None stated.</p>
        ) : (
          <div className="table-wrap">
            <table className="cell-table">
              <thead>
                <tr>
                  <th scope="col">Joint (number)</th>
                  <th scope="col" className="num">
                    Allowable moment (N·m)
                  </th>
                  <th scope="col" className="num">
                    Allowable inertia (kg·m²)
                  </th>
                  {!readOnly && <th scope="col">Remove</th>}
                </tr>
              </thead>
              <tbody>
                {form.specs.wristAllowables.map((w, i) => {
                  const set = (patch: Partial<typeof w>) => updateSpecs({ wristAllowables: form.specs.wristAllowables.map((x, k) => (k === i ? { ...x, ...patch } : x)) });
                  return (
                    <tr key={w.key}>
                      <td>
                        <CellNumber className="nm" label={`wrist row ${i + 1} joint number`} value={w.joint} onChange={(v) => set({ joint: v })} error={errText(errMap, `specs.wristAllowables.${i}.joint`)} readOnly={readOnly} />
                      </td>
                      <td>
                        <CellNumber label={`wrist row ${i + 1} allowable moment (N·m)`} value={w.moment} onChange={(v) => set({ moment: v })} error={errText(errMap, `specs.wristAllowables.${i}.moment`)} readOnly={readOnly} />
                      </td>
                      <td>
                        <CellNumber label={`wrist row ${i + 1} allowable inertia (kg·m²)`} value={w.inertia} onChange={(v) => set({ inertia: v })} error={errText(errMap, `specs.wristAllowables.${i}.inertia`)} readOnly={readOnly} />
                      </td>
                      {!readOnly && <RemoveRowCell rows={form.specs.wristAllowables} index={i} label={`wrist row ${i + 1}`} onChange={(wristAllowables) => updateSpecs({ wristAllowables })} />}
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
        {!readOnly && (
          <div className="toolbar">
            <button
              type="button"
              onClick={() => {
                const used = new Set(form.specs.wristAllowables.map((w) => w.joint));
                const next = [form.joints.length - 2, form.joints.length - 1, form.joints.length].map(String).find((j) => Number(j) >= 1 && !used.has(j)) ?? "";
                updateSpecs({ wristAllowables: [...form.specs.wristAllowables, { key: rowKey(), joint: next, moment: "", inertia: "" }] });
              }}
            >
              Add wrist joint
            </button>
          </div>
        )}
      </fieldset>

      <ErrorSummary messages={summary} />
      {!readOnly ? (
        <div className="save-bar">
          <button type="submit" className="primary" disabled={busy}>
            {busy ? "Saving…" : props.id ? "Save new revision" : "Create arm"}
          </button>
          <span aria-live="polite" role="status" className="ok" data-testid="save-status">
            {saved}
          </span>
          <span className="err" aria-live="assertive">
            {message}
          </span>
        </div>
      ) : null}
    </form>
  );
}
