"use client";
import { useState } from "react";
import { MAX_JOINTS, MOUNTINGS, type ArmDocument } from "@/shared/schemas";
import { DescriptionField, NumberField, SelectField, TextField, errText, wholeErrors, CellNumber } from "../fields";
import { PoseFieldset } from "../PoseFieldset";
import { EditorFrame } from "../EditorFrame";
import { useDocumentEditor, type DocumentKind } from "../useDocumentEditor";
import { RPY_CONVENTION, rowKey } from "../pose";
import { armFormFromDoc, armPathLabel, emptyArmForm, validateArmForm, type ArmForm } from "./armForm";
import { formatArmValue } from "./format";
import { JointTable } from "./JointTable";
import { DhPastePanel } from "./DhPastePanel";
import { convertFormToChain } from "./chainConvert";
import { CollisionPanel } from "./CollisionPanel";
import { RemoveRowCell } from "../RowControls";
import { ArmViewPanel } from "../view3d/launchers";

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

/** Transform entries are shown as one pose, not as 16 matrix cells. */
function groupArmPath(path: string): string {
  return /^(base|tool)\.\d+$/.test(path) ? path.split(".")[0] : path;
}

const ARM_KIND: DocumentKind<ArmDocument, ArmForm> = {
  api: "/api/arms",
  page: "/arms",
  bodyKey: "arm",
  what: "arm",
  plural: "arms",
  restoreFrom: "catalog",
  fromDoc: armFormFromDoc,
  empty: emptyArmForm,
  validate: validateArmForm,
  pathLabel: armPathLabel,
  groupPath: groupArmPath,
  formatValue: formatArmValue,
};

export function ArmEditor(props: Props) {
  const ed = useDocumentEditor(ARM_KIND, props);
  const { readOnly, form, update, errMap } = ed;
  const [pasteOpen, setPasteOpen] = useState(false);
  const [conversion, setConversion] = useState<{ ok: boolean; text: string } | null>(null);
  const updateSpecs = (patch: Partial<ArmForm["specs"]>) => update({ specs: { ...form.specs, ...patch } });

  return (
    <EditorFrame
      editor={ed}
      kind={ARM_KIND}
      name={form.name}
      of={props}
      exports={(id) => (
        <a className="button" href={`/api/arms/${id}/urdf`} download title="The arm as a URDF robot description (current revision)">
          Export URDF
        </a>
      )}
    >
      <fieldset className="panel">
        <legend>Identity</legend>
        <div className="grid wide">
          <TextField label="Name" name="name" value={form.name} onChange={(v) => update({ name: v })} error={errText(errMap, "name")} readOnly={readOnly} required />
          <TextField label="Maker" name="maker" value={form.maker} onChange={(v) => update({ maker: v })} error={errText(errMap, "maker")} readOnly={readOnly} />
          <TextField label="Model code" name="modelCode" value={form.modelCode} onChange={(v) => update({ modelCode: v })} error={errText(errMap, "modelCode")} readOnly={readOnly} />
        </div>
        <DescriptionField value={form.description} readOnly={readOnly} onChange={(v) => update({ description: v })} />
      </fieldset>

      <fieldset className="panel">
        <legend>Kinematics ({form.convention === "chain" ? "joint chain" : "DH table"})</legend>
        {form.source && (
          <p className="hint" data-testid="arm-source">
            Imported from the URDF file <code>{form.source.file}</code>
            {form.source.baseLink && form.source.tipLink && (
              <>
                {" "}
                (chain from link <code>{form.source.baseLink}</code> to link <code>{form.source.tipLink}</code>)
              </>
            )}
            , SHA-256 <code title={form.source.sha256}>{form.source.sha256.slice(0, 16)}…</code>.
          </p>
        )}
        <div role="radiogroup" aria-label="Kinematic convention" className="checks" style={{ marginBottom: "0.4rem" }}>
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
          <label>
            <input type="radio" name="convention" value="chain" checked={form.convention === "chain"} disabled={readOnly} onChange={() => update({ convention: "chain" })} />
            <span>
              <strong>chain</strong> (general joint chain, as in URDF): link i = T(originᵢ)·Rot(axisᵢ, qᵢ), or ·Trans(axisᵢ·qᵢ) for a prismatic joint
            </span>
          </label>
        </div>
        {form.convention === "chain" ? (
          <p className="hint">
            Each joint: its origin in the previous link&apos;s frame, x y z in mm and roll, pitch, yaw in degrees (T(origin) = Trans(x y z)·Rz(yaw)·Ry(pitch)·Rx(roll)),
            then its axis in the joint frame (any length; it is normalised; a zero axis is refused). q turns about the axis (°) or slides along it (mm); min and max bound q.
          </p>
        ) : (
          <p className="hint">
            The joint variable q adds to θ (revolute) or to d (prismatic); min and max bound q. Lengths in mm, angles in degrees.
            {form.convention === "mdh" && " In mdh the last link's length goes into the tool transform."} Switching the convention keeps each column&apos;s numbers; to rewrite the
            table as the same arm in another form, use the conversion below.
          </p>
        )}
        <JointTable
          chain={form.convention === "chain"}
          rows={form.joints}
          maxJoints={MAX_JOINTS}
          readOnly={readOnly}
          errors={errMap}
          onChange={(rows, structural) => update({ joints: rows }, structural)}
        />
        {!readOnly && form.convention !== "chain" && (
          <div className="toolbar">
            <button
              type="button"
              onClick={() => {
                const r = convertFormToChain(form);
                if (!r.ok) {
                  setConversion({ ok: false, text: `Not converted: ${r.errors.map((e) => e.message).join("; ")}` });
                  return;
                }
                update(r.patch, true);
                setConversion({
                  ok: r.maxDifference <= 1e-9,
                  text: `Converted the ${form.convention} table to a joint chain (one way). Forward-kinematics check at ${r.configs} configurations within the limits: the tool pose agrees to ${r.maxDifference.toExponential(1)} (largest difference of a pose entry, m or unitless). Mass centres, collision capsules and the tool transform were moved into the chain's link frames. Save to keep it.`,
                });
              }}
            >
              Convert this DH table to a chain
            </button>
          </div>
        )}
        {conversion && (
          <p className={conversion.ok ? "notice" : "notice bad"} data-testid="chain-conversion" role="status">
            {conversion.text}
          </p>
        )}
        {!readOnly && !pasteOpen && form.convention !== "chain" && (
          <button type="button" onClick={() => setPasteOpen(true)}>
            Paste from spreadsheet…
          </button>
        )}
        {!readOnly && pasteOpen && form.convention !== "chain" && (
          <DhPastePanel
            onClose={() => setPasteOpen(false)}
            onApply={(rows) => update({ joints: rows }, true)}
          />
        )}
      </fieldset>

      <div className="two-col">
        <PoseFieldset
          legend="Base transform (arm base → first joint frame)"
          idPrefix="base"
          description={<>x y z in mm, then {RPY_CONVENTION}. Saved as a row-major 4×4 in metres.</>}
          value={form.base}
          onChange={(v) => update({ base: v })}
          errorMap={errMap}
          readOnly={readOnly}
        />
        <PoseFieldset
          legend="Tool transform (flange → tool point)"
          idPrefix="tool"
          description={<>x y z in mm, then {RPY_CONVENTION}. Saved as a row-major 4×4 in metres.</>}
          value={form.tool}
          onChange={(v) => update({ tool: v })}
          errorMap={errMap}
          readOnly={readOnly}
        />
      </div>

      <CollisionPanel form={form} errors={errMap} readOnly={readOnly} onChange={update} />

      <fieldset className="panel">
        <legend>3-D view</legend>
        <p className="hint">The arm as the table and transforms stand, posed by a slider per joint: check link directions, offsets and axis signs against the datasheet drawing.</p>
        <ArmViewPanel form={form} />
      </fieldset>

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
    </EditorFrame>
  );
}
