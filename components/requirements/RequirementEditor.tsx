"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import type { FieldError, RequirementSet } from "@/shared/schemas";
import { api, byPath } from "../api";
import { ErrorSummary, NumberField, TextField, errText } from "../fields";
import { PoseFieldset } from "../PoseFieldset";
import { ConflictPanel, KeptEdits, diffPaths, valueAt, type ConflictRow } from "../ConflictPanel";
import { DeleteControl } from "../DeleteControl";
import { RPY_CONVENTION, type PoseText } from "../pose";
import { describeError } from "../arm/armForm";
import { WEIGHT_KEYS, WEIGHT_LABEL, emptyReqForm, formatReqValue, reqFormFromDoc, reqPathLabel, validateReqForm, type ReqForm } from "./reqForm";
import { TargetTable } from "./TargetTable";
import { PathEditor } from "./PathEditor";
import { SpecTable } from "./SpecTable";

interface Props {
  id?: string;
  revision?: number;
  initial?: RequirementSet;
  canWrite: boolean;
  viewingRevision?: number;
  deleted?: boolean;
  /** Just created: say so once. */
  created?: boolean;
}

interface ConflictState {
  byName: string | null;
  baseRevision: number;
  currentRevision: number;
  current: RequirementSet;
  rows: ConflictRow[];
  mine: RequirementSet;
}

/** A transform is shown as one pose, not as 16 matrix cells. */
function groupPath(path: string): string {
  const m = /^(base|tool\.tcp)\.\d+$/.exec(path);
  return m ? m[1] : path;
}

function poseErrors(errors: Record<string, string[]>, key: string): Partial<Record<keyof PoseText, string>> {
  const out: Partial<Record<keyof PoseText, string>> = {};
  for (const k of ["x", "y", "z", "roll", "pitch", "yaw"] as const) {
    const m = errText(errors, `${key}.${k}`);
    if (m) out[k] = m;
  }
  return out;
}
function wholeErrors(errors: Record<string, string[]>, key: string): string | undefined {
  const re = new RegExp(`^${key.replace(".", "\\.")}(\\.\\d+)?$`);
  const m = Object.entries(errors)
    .filter(([p]) => re.test(p))
    .flatMap(([, ms]) => ms);
  return m.length ? m.join("; ") : undefined;
}

export function RequirementEditor(props: Props) {
  const router = useRouter();
  const uid = useId();
  const readOnly = !props.canWrite || props.viewingRevision !== undefined || props.deleted === true;
  const [form, setForm] = useState<ReqForm>(() => (props.initial ? reqFormFromDoc(props.initial) : emptyReqForm()));
  const [startDoc, setStartDoc] = useState<RequirementSet | undefined>(props.initial);
  const [baseRevision, setBaseRevision] = useState<number | undefined>(props.revision);
  const [errors, setErrors] = useState<FieldError[]>([]);
  const [message, setMessage] = useState("");
  const [saved, setSaved] = useState(props.created ? "Created as revision 1." : "");
  const [busy, setBusy] = useState(false);
  const [conflict, setConflict] = useState<ConflictState | null>(null);
  const [kept, setKept] = useState<{ rows: { label: string; path: string; mine: string }[]; json: string } | null>(null);

  const errMap = useMemo(() => byPath(errors), [errors]);
  const summary = errors.map((e) => describeError(e, reqPathLabel));
  const update = (patch: Partial<ReqForm>, structural?: boolean) => {
    setForm((f) => ({ ...f, ...patch }));
    setSaved("");
    if (structural) setErrors([]);
  };

  async function save() {
    setSaved("");
    setMessage("");
    const { doc, errors: clientErrors } = validateReqForm(form);
    if (clientErrors.length) {
      setErrors(clientErrors);
      setMessage(`Not saved: ${clientErrors.length === 1 ? "1 problem" : `${clientErrors.length} problems`}, marked at the fields and listed above this bar.`);
      return;
    }
    setBusy(true);
    type Ok = { id: string; revision: number; requirementSet: RequirementSet };
    const res = props.id
      ? await api<Ok>(`/api/requirements/${props.id}`, "PUT", { baseRevision, requirementSet: doc })
      : await api<Ok>("/api/requirements", "POST", doc);
    setBusy(false);
    if (res.ok) {
      setErrors([]);
      if (!props.id) {
        router.push(`/requirements/${res.data.id}?created=1`);
        return;
      }
      setBaseRevision(res.data.revision);
      setStartDoc(res.data.requirementSet);
      setForm(reqFormFromDoc(res.data.requirementSet));
      setSaved(`Saved as revision ${res.data.revision}.`);
      return;
    }
    if (res.status === 409 && res.error.conflict) {
      const c = res.error.conflict;
      const current = c.current as RequirementSet;
      let byName: string | null = null;
      const revs = await api<{ revisions: { revision: number; author: { name: string } | null }[] }>(`/api/requirements/${props.id}/revisions`, "GET");
      if (revs.ok) byName = revs.data.revisions.find((r) => r.revision === c.currentRevision)?.author?.name ?? null;
      const paths = [...new Set(c.changes.map((ch) => groupPath(ch.path)))];
      const rows: ConflictRow[] = paths.map((path) => ({
        path,
        label: reqPathLabel(path),
        base: formatReqValue(path, valueAt(startDoc, path)),
        current: formatReqValue(path, valueAt(current, path)),
        mine: formatReqValue(path, valueAt(doc, path)),
      }));
      setConflict({ byName, baseRevision: c.baseRevision, currentRevision: c.currentRevision, current, rows, mine: doc });
      return;
    }
    setErrors(res.error.fieldErrors ?? []);
    setMessage(res.status === 403 ? "Not saved: your role may not change requirement sets." : `Not saved: ${res.error.message}`);
  }

  function loadLatest(keep: boolean) {
    if (!conflict) return;
    if (keep) {
      const changed = startDoc ? [...new Set(diffPaths(startDoc, conflict.mine).map(groupPath))] : [];
      setKept({
        rows: changed.map((path) => ({ path, label: reqPathLabel(path), mine: formatReqValue(path, valueAt(conflict.mine, path)) })),
        json: JSON.stringify(conflict.mine, null, 2),
      });
    } else setKept(null);
    setForm(reqFormFromDoc(conflict.current));
    setStartDoc(conflict.current);
    setBaseRevision(conflict.currentRevision);
    setErrors([]);
    setConflict(null);
    setSaved(`Loaded revision ${conflict.currentRevision}.`);
  }

  const vec = (label: string, path: string, value: [string, string, string], onChange: (v: [string, string, string]) => void, hint?: string) =>
    (["x", "y", "z"] as const).map((a, i) => (
      <NumberField
        key={a}
        label={`${label} ${a}`}
        hint={i === 0 ? hint : undefined}
        name={`${path}.${i}`}
        unit="mm"
        value={value[i]}
        readOnly={readOnly}
        error={errText(errMap, `${path}.${i}`) ?? (i === 0 ? errText(errMap, path) : undefined)}
        onChange={(v) => {
          const next = value.slice() as [string, string, string];
          next[i] = v;
          onChange(next);
        }}
      />
    ));

  const title = props.viewingRevision !== undefined ? `${form.name} · revision ${props.viewingRevision}` : props.id ? form.name || "Requirement set" : "New requirement set";
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
              <Link href={`/requirements/${props.id}/history`}>History</Link>
              <a className="button" href={`/api/requirements/${props.id}/export`} download>
                Export JSON
              </a>
            </>
          )}
          {props.id && props.canWrite && props.viewingRevision === undefined && !props.deleted && (
            <DeleteControl url={`/api/requirements/${props.id}`} what="requirement set" afterHref="/requirements" />
          )}
        </div>
      </div>
      {props.viewingRevision !== undefined && (
        <p className="notice">
          A past revision, read-only. <Link href={`/requirements/${props.id}`}>Open the latest revision</Link>.
        </p>
      )}
      {props.deleted && <p className="notice warn">This requirement set is deleted. Restore it from the list to edit it.</p>}
      {!props.canWrite && props.viewingRevision === undefined && (
        <p className="notice" data-testid="read-only-note">
          Read-only: your role is viewer. An administrator can make you an editor.
        </p>
      )}
      {conflict && (
        <ConflictPanel
          what="requirement set"
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
        <legend>Scenario</legend>
        <TextField label="Name" name="name" value={form.name} onChange={(v) => update({ name: v })} error={errText(errMap, "name")} readOnly={readOnly} required />
        <div className="field">
          <label htmlFor={uid + "-desc"}>Description</label>
          <textarea id={uid + "-desc"} name="description" rows={2} style={{ fontFamily: "inherit" }} value={form.description} readOnly={readOnly} onChange={(e) => update({ description: e.target.value })} />
        </div>
        <p className="hint" data-testid="rpy-convention">
          Frames: all poses are in the cell frame. Orientations are {RPY_CONVENTION.replace("the fixed axes", "the fixed cell axes")}.
        </p>
      </fieldset>

      <div className="two-col">
        <PoseFieldset
          legend="Arm base placement in the cell"
          idPrefix="base"
          description="Where the arm's base frame sits in the cell: x y z in mm, roll pitch yaw in °."
          value={form.base}
          onChange={(v) => update({ base: v })}
          errors={poseErrors(errMap, "base")}
          errorAll={wholeErrors(errMap, "base")}
          readOnly={readOnly}
        />
        <PoseFieldset
          legend="Tool: TCP offset"
          idPrefix="tool.tcp"
          description="From the arm's tool point (flange side) to the TCP: x y z in mm, roll pitch yaw in °."
          value={form.tcp}
          onChange={(v) => update({ tcp: v })}
          errors={poseErrors(errMap, "tool.tcp")}
          errorAll={wholeErrors(errMap, "tool.tcp")}
          readOnly={readOnly}
        />
      </div>
      <div className="two-col">
        <fieldset className="panel">
          <legend>Tool mass</legend>
          <div className="grid">
            <NumberField label="Tool mass" name="tool.mass" unit="kg" value={form.toolMass} onChange={(v) => update({ toolMass: v })} error={errText(errMap, "tool.mass")} readOnly={readOnly} />
            {vec("Tool CoG", "tool.cog", form.toolCog, (v) => update({ toolCog: v }), "flange-side frame")}
          </div>
        </fieldset>
        <fieldset className="panel">
          <legend>Payload</legend>
          <div className="grid">
            <NumberField label="Payload mass" name="payload.mass" unit="kg" value={form.payloadMass} onChange={(v) => update({ payloadMass: v })} error={errText(errMap, "payload.mass")} readOnly={readOnly} />
            {vec("Payload CoG", "payload.cog", form.payloadCog, (v) => update({ payloadCog: v }), "TCP frame")}
          </div>
        </fieldset>
      </div>

      <fieldset className="panel">
        <legend>Targets</legend>
        <p className="hint">
          TCP poses in the cell frame, orientation as roll-pitch-yaw about the fixed cell axes X, Y, Z: R = Rz(yaw)·Ry(pitch)·Rx(roll). Mode: <strong>pose</strong> = full position and orientation;{" "}
          <strong>axis</strong> = position and tool z-axis, free spin about it; <strong>point</strong> = position only. Force and moment (optional) are what the tool applies to the environment, in
          the cell frame; leave all three empty for none, an empty cell next to a filled one counts as 0.
        </p>
        <TargetTable rows={form.targets} errors={errMap} readOnly={readOnly} onChange={(rows, s) => update({ targets: rows }, s)} />
      </fieldset>

      <fieldset className="panel">
        <legend>Paths</legend>
        <PathEditor paths={form.paths} errors={errMap} readOnly={readOnly} onChange={(paths, s) => update({ paths }, s)} />
      </fieldset>

      <fieldset className="panel">
        <legend>Spec requirements</legend>
        <SpecTable rows={form.specs} errors={errMap} readOnly={readOnly} onChange={(rows, s) => update({ specs: rows }, s)} />
      </fieldset>

      <fieldset className="panel">
        <legend>Ranking weights</legend>
        <p className="hint">Relative weights (≥ 0, any scale); the score divides by their sum.</p>
        <div className="grid">
          {WEIGHT_KEYS.map((k) => (
            <NumberField
              key={k}
              label={WEIGHT_LABEL[k]}
              name={`weights.${k}`}
              unit="weight"
              value={form.weights[k]}
              readOnly={readOnly}
              error={errText(errMap, `weights.${k}`)}
              onChange={(v) => update({ weights: { ...form.weights, [k]: v } })}
            />
          ))}
        </div>
      </fieldset>

      <ErrorSummary messages={summary} />
      {!readOnly && (
        <div className="save-bar">
          <button type="submit" className="primary" disabled={busy}>
            {busy ? "Saving…" : props.id ? "Save new revision" : "Create requirement set"}
          </button>
          <span aria-live="polite" role="status" className="ok" data-testid="save-status">
            {saved}
          </span>
          <span className="err" aria-live="assertive">
            {message}
          </span>
        </div>
      )}
    </form>
  );
}
