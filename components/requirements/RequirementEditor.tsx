"use client";
import type { RequirementSet } from "@/shared/schemas";
import { DescriptionField, NumberField, TextField, errText, wholeErrors } from "../fields";
import { PoseFieldset } from "../PoseFieldset";
import { EditorFrame } from "../EditorFrame";
import { useDocumentEditor, type DocumentKind } from "../useDocumentEditor";
import { RPY_CONVENTION } from "../pose";
import { WEIGHT_KEYS, WEIGHT_LABEL, emptyReqForm, formatReqValue, reqFormFromDoc, reqPathLabel, validateReqForm, type ReqForm } from "./reqForm";
import { TargetTable } from "./TargetTable";
import { PathEditor } from "./PathEditor";
import { SequenceEditor } from "./SequenceEditor";
import { SpecTable } from "./SpecTable";
import { ShapeTable } from "./ShapeTable";
import { CellCaution } from "../CellCaution";
import { CycleCaution } from "../CycleCaution";
import { CellViewPanel } from "../view3d/launchers";

interface Props {
  id?: string;
  revision?: number;
  initial?: RequirementSet;
  canWrite: boolean;
  viewingRevision?: number;
  deleted?: boolean;
  /** Just created: say so once. */
  created?: boolean;
  /** What the reader converted when the file was imported (shown once). */
  notices?: string[];
}

/** A transform is shown as one pose, not as 16 matrix cells. */
/** The two shape lists the tool carries: the tool itself and the part it holds. */
const HELD_SHAPES = [
  {
    key: "toolShapes",
    id: "tool",
    legend: "Tool collision shapes",
    hint: "Capsules or boxes in the arm's tool-point frame (the frame of the tool CoG): the gripper, spindle or screwdriver as it is built.",
    caption: "Tool collision shapes in the tool-point frame",
  },
  {
    key: "payloadShapes",
    id: "payload",
    legend: "Payload collision shapes",
    hint: "Capsules or boxes in the TCP frame (the frame of the payload CoG): the part as it is held.",
    caption: "Payload collision shapes in the TCP frame",
  },
] as const;

function groupPath(path: string): string {
  const m = /^(base|tool\.tcp)\.\d+$/.exec(path);
  return m ? m[1] : path;
}

const REQ_KIND: DocumentKind<RequirementSet, ReqForm> = {
  api: "/api/requirements",
  page: "/requirements",
  bodyKey: "requirementSet",
  what: "requirement set",
  plural: "requirement sets",
  restoreFrom: "list",
  fromDoc: reqFormFromDoc,
  empty: emptyReqForm,
  validate: validateReqForm,
  pathLabel: reqPathLabel,
  groupPath,
  formatValue: (path, value) => formatReqValue(path, value),
};

export function RequirementEditor(props: Props) {
  const ed = useDocumentEditor(REQ_KIND, props);
  const { readOnly, form, update, errMap } = ed;

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

  return (
    <EditorFrame editor={ed} kind={REQ_KIND} name={form.name} of={props}>
      <fieldset className="panel">
        <legend>Scenario</legend>
        <TextField label="Name" name="name" value={form.name} onChange={(v) => update({ name: v })} error={errText(errMap, "name")} readOnly={readOnly} required />
        <DescriptionField value={form.description} readOnly={readOnly} onChange={(v) => update({ description: v })} />
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
          errorMap={errMap}
          readOnly={readOnly}
        />
        <PoseFieldset
          legend="Tool: TCP offset"
          idPrefix="tool.tcp"
          description="From the arm's tool point (flange side) to the TCP: x y z in mm, roll pitch yaw in °."
          value={form.tcp}
          onChange={(v) => update({ tcp: v })}
          errorMap={errMap}
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

      <fieldset className="panel" data-testid="cell-panel">
        <legend>Cell: obstacles and clearance</legend>
        <p className="hint">
          Obstacles are rigid shapes in the cell frame: a centre x y z in mm and an orientation as roll pitch yaw in ° (about the fixed cell axes), with sizes in mm. Box: full sides along its own
          x, y, z. Sphere: radius. Cylinder: radius and full length along its own z. Capsule: radius and the length of its axis along its own z. Names must be unique; targets and paths name the
          obstacles their tool or payload may touch.
        </p>
        <div className="grid">
          <NumberField
            label="Required clearance"
            hint="between every checked pair of bodies"
            name="cell.clearance"
            unit="mm"
            value={form.clearance}
            readOnly={readOnly}
            error={errText(errMap, "cell.clearance")}
            onChange={(v) => update({ clearance: v })}
          />
        </div>
        <ShapeTable
          rows={form.obstacles}
          errors={errMap}
          readOnly={readOnly}
          prefix="cell.obstacles"
          noun="obstacle"
          named
          shapes={["box", "sphere", "cylinder", "capsule"]}
          caption="Obstacles in the cell frame"
          testId="obstacle-table"
          onChange={(rows, s) => update({ obstacles: rows }, s)}
        />
        <CellCaution />
      </fieldset>

      <fieldset className="panel" data-testid="mounting-panel">
        <legend>Mounting region (placement search)</legend>
        <p className="hint">
          Where the base may stand: each arm is searched for its own best placement in this box and yaw range, then ranked there beside the nominal base above. Positions of the base origin
          in mm in the cell frame, yaw in ° about the cell z axis after the mount orientation; pedestal heights (mm, comma-separated) replace the z range.
        </p>
        <label className="check">
          <input type="checkbox" checked={form.mounting.on} disabled={readOnly} onChange={(e) => update({ mounting: { ...form.mounting, on: e.target.checked } })} /> Search a mounting region
        </label>
        {form.mounting.on && (
          <>
            <div className="grid">
              {(
                [
                  ["x", "x", "mm"],
                  ["y", "y", "mm"],
                  ["z", "z", "mm"],
                  ["yaw", "yaw", "°"],
                ] as const
              ).map(([key, label, unit]) =>
                ([0, 1] as const).map((end) => (
                  <NumberField
                    key={`${key}${end}`}
                    label={`${label} ${end === 0 ? "from" : "to"}`}
                    name={`mounting.region.${key}.${end}`}
                    unit={unit}
                    value={form.mounting[key][end]}
                    readOnly={readOnly}
                    error={end === 0 ? errText(errMap, `mounting.region.${key}`) : undefined}
                    onChange={(v) => {
                      const r: [string, string] = [...form.mounting[key]];
                      r[end] = v;
                      update({ mounting: { ...form.mounting, [key]: r } });
                    }}
                  />
                )),
              )}
              <TextField
                label="Pedestal heights"
                hint="mm, comma-separated; instead of the z range"
                name="mounting.heights"
                value={form.mounting.heights}
                readOnly={readOnly}
                error={wholeErrors(errMap, "mounting.heights")}
                onChange={(v) => update({ mounting: { ...form.mounting, heights: v } })}
              />
              <div className="field">
                <label htmlFor="mount-orientation">Mount orientation</label>
                <select
                  id="mount-orientation"
                  name="mounting.orientation"
                  value={form.mounting.preset}
                  disabled={readOnly}
                  aria-invalid={errText(errMap, "mounting.orientation") ? true : undefined}
                  aria-describedby={errText(errMap, "mounting.orientation") ? "mount-orientation-err" : undefined}
                  onChange={(e) => update({ mounting: { ...form.mounting, preset: e.target.value as typeof form.mounting.preset } })}
                >
                  <option value="floor">floor (base z up)</option>
                  <option value="ceiling">ceiling (base z down)</option>
                  <option value="wall">wall (base z along the cell x)</option>
                  {form.mounting.fileOrientation && <option value="file">as in the file</option>}
                </select>
                {errText(errMap, "mounting.orientation") && <span id="mount-orientation-err" className="err">{errText(errMap, "mounting.orientation")}</span>}
              </div>
            </div>
          </>
        )}
      </fieldset>

      <div className="two-col">
        {HELD_SHAPES.map((h) => (
          <fieldset key={h.key} className="panel" data-testid={`${h.id}-shapes-panel`}>
            <legend>{h.legend}</legend>
            <p className="hint">{h.hint}</p>
            <ShapeTable
              rows={form[h.key]}
              errors={errMap}
              readOnly={readOnly}
              prefix={`${h.id}.collision`}
              noun={`${h.id} shape`}
              named={false}
              shapes={["capsule", "box"]}
              caption={h.caption}
              testId={`${h.id}-shape-table`}
              onChange={(rows, s) => update({ [h.key]: rows }, s)}
            />
          </fieldset>
        ))}
      </div>

      <fieldset className="panel">
        <legend>Targets</legend>
        <p className="hint">
          TCP poses in the cell frame, orientation as roll-pitch-yaw about the fixed cell axes X, Y, Z: R = Rz(yaw)·Ry(pitch)·Rx(roll). Mode: <strong>pose</strong> = full position and orientation;{" "}
          <strong>axis</strong> = position and tool z-axis, free spin about it; <strong>point</strong> = position only. Force and moment (optional) are what the tool applies to the environment, in
          the cell frame; leave all three empty for none, an empty cell next to a filled one counts as 0. Contact: obstacle names (comma-separated) the tool and payload may touch at the
          target, such as the fixture a part is placed in; the links may touch nothing.
        </p>
        <TargetTable rows={form.targets} errors={errMap} readOnly={readOnly} onChange={(rows, s) => update({ targets: rows }, s)} />
      </fieldset>

      <fieldset className="panel">
        <legend>Paths</legend>
        <PathEditor paths={form.paths} errors={errMap} readOnly={readOnly} onChange={(paths, s) => update({ paths }, s)} />
      </fieldset>

      <fieldset className="panel" data-testid="sequences-panel">
        <legend>Sequences and cycle time</legend>
        <p className="hint">
          The work of one cycle, step by step: a point-to-point move to a target (then an optional dwell in s), a path followed at its required tool speed, or a wait in s. The
          cycle is closed: it starts where its last step ends. Give a required cycle time in s or a required rate in parts per hour (saved as 3600 / rate s); each arm&apos;s
          estimated cycle is compared with it on the shortlist page.
        </p>
        <SequenceEditor sequences={form.sequences} form={form} errors={errMap} readOnly={readOnly} onChange={(sequences, s) => update({ sequences }, s)} />
        <CycleCaution />
      </fieldset>

      <fieldset className="panel">
        <legend>3-D view of the cell</legend>
        <p className="hint">The arm base placement, the targets as frames with their names, the paths with their direction, and the obstacles, as the form stands.</p>
        <CellViewPanel form={form} />
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

    </EditorFrame>
  );
}
