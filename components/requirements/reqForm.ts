/**
 * Form state of the requirement-set editor and its conversion to and from RequirementSet (SI).
 * Shown units: mm, degrees, kg, N, N·m, mm/s. Values kept as typed text; loaded values that were
 * not edited go back exactly as loaded.
 */
import {
  COMPARATORS,
  COMPARATOR_TEXT,
  DEFAULT_CLEARANCE,
  DEFAULT_WEIGHTS,
  SPEC_FIELDS,
  requirementSetSchema,
  type Comparator,
  type ConstraintMode,
  type FieldError,
  type RequirementSet,
  type Sequence,
  type SpecField,
  type Weights,
} from "@/shared/schemas";
import { SUB_SCORES } from "@/shared/sub-scores";
import { degToRad, mmToM, mToMm, radToDeg } from "@/shared/units";
import { checkFormDoc } from "../formDoc";
import { matrixPose, parseNum, poseMatrix, rowKey, show, type PoseText } from "../pose";
import { shapeRowFromDoc, shapeRowToDoc, type ShapeRow } from "./shapes";
import { MOUNT_PRESETS } from "@/shared/schemas/mounting";

type Conv = "mm" | "deg" | "same";
const toShown = (c: Conv, si: number) => (c === "mm" ? mToMm(si) : c === "deg" ? radToDeg(si) : si);
const fromShown = (c: Conv, v: number) => (c === "mm" ? mmToM(v) : c === "deg" ? degToRad(v) : v);

export interface TargetRow {
  key: string;
  name: string;
  x: string; y: string; z: string;
  roll: string; pitch: string; yaw: string;
  mode: ConstraintMode;
  posTol: string;
  rotTol: string;
  fx: string; fy: string; fz: string;
  mx: string; my: string; mz: string;
  /** Obstacle names the tool and payload may touch here, comma-separated. */
  contact: string;
  /** The target's priority for the placement search (not edited here; carried through). */
  priority?: "must" | "want";
}
export interface WaypointRow {
  key: string;
  x: string; y: string; z: string;
  roll: string; pitch: string; yaw: string;
}
export interface PathForm {
  key: string;
  name: string;
  mode: ConstraintMode;
  step: string;
  speed: string;
  /** Obstacle names the tool and payload may touch along the path, comma-separated. */
  contact: string;
  waypoints: WaypointRow[];
}
/** One step of a sequence; only the fields of its kind are used. */
export interface StepRow {
  key: string;
  kind: "move" | "path" | "wait";
  /** move: the target's name and the dwell (s, empty = none). */
  target: string;
  dwell: string;
  /** path: the path's name. */
  path: string;
  /** wait: seconds. */
  seconds: string;
}
/** How a sequence's requirement is entered: none, a cycle time (s) or a rate (parts per hour, saved as 3600 / rate s). */
export type RequiredMode = "none" | "time" | "rate";
export interface SequenceForm {
  key: string;
  name: string;
  steps: StepRow[];
  requiredMode: RequiredMode;
  /** Required cycle time (s) and required rate (parts per hour) as typed; the mode says which one is saved. */
  required: string;
  rate: string;
}
export interface SpecRow {
  key: string;
  field: SpecField;
  comparator: Comparator;
  value: string;
  priority: "must" | "want";
  note: string;
}
type WeightKey = keyof Weights;
/** One weight field per row of the sub-score table (shared/sub-scores.ts), labelled by it. */
export const WEIGHT_KEYS: readonly WeightKey[] = SUB_SCORES.keys;
export const WEIGHT_LABEL: Readonly<Record<WeightKey, string>> = SUB_SCORES.label;

export interface ReqForm {
  name: string;
  description: string;
  base: PoseText;
  tcp: PoseText;
  toolMass: string;
  toolCog: [string, string, string];
  payloadMass: string;
  payloadCog: [string, string, string];
  /** Tool shapes (tool-point frame) and payload shapes (TCP frame). */
  toolShapes: ShapeRow[];
  payloadShapes: ShapeRow[];
  /** Cell obstacles (cell frame) and the required clearance (mm). */
  obstacles: ShapeRow[];
  clearance: string;
  targets: TargetRow[];
  paths: PathForm[];
  /** Task sequences for the cycle time. */
  sequences: SequenceForm[];
  specs: SpecRow[];
  weights: Record<WeightKey, string>;
  /** Parts the form does not edit, carried through unchanged. */
  /** The mounting region of the placement search (docs/formats.md#mounting): mm and °, off when `on` is false. */
  mounting: MountingForm;
  keep: { toolInertia?: [number, number, number]; payloadInertia?: [number, number, number] };
  /** Loaded values: id → text shown and SI value. */
  orig: Record<string, { text: string; si: number }>;
  /** Loaded transforms: id → texts and matrix. */
  origPose: Record<string, { text: PoseText; matrix: number[] }>;
}

/** The mounting region as edited: ranges in mm (x, y, z) and ° (yaw), heights in mm, the orientation preset. */
export interface MountingForm {
  on: boolean;
  x: [string, string];
  y: [string, string];
  z: [string, string];
  yaw: [string, string];
  /** Pedestal heights, comma-separated mm (empty: the continuous z range). */
  heights: string;
  preset: "floor" | "ceiling" | "wall" | "file";
  /** The orientation as loaded, kept when `preset` is "file" (not one of the presets). */
  fileOrientation: number[] | null;
}

export function emptyMountingForm(): MountingForm {
  return { on: false, x: ["-200", "200"], y: ["-200", "200"], z: ["0", "0"], yaw: ["-90", "90"], heights: "", preset: "floor", fileOrientation: null };
}

export const COMPARATOR_LABEL = Object.fromEntries(
  COMPARATORS.map((c) => [c, c === "includes" ? COMPARATOR_TEXT[c].words : `${COMPARATOR_TEXT[c].words} (${COMPARATOR_TEXT[c].symbol})`]),
) as Record<Comparator, string>;

export function comparatorsFor(field: SpecField): Comparator[] {
  const kind = SPEC_FIELDS[field].kind;
  if (kind === "number") return ["atLeast", "atMost", "equals"];
  if (kind === "ip") return ["atLeast", "equals"];
  if (kind === "mounting") return ["includes"];
  return ["equals"];
}

/** Unit shown for a spec field's value; reach and repeatability are entered in mm. */
export function specUnit(field: SpecField): string {
  const u = SPEC_FIELDS[field].unit;
  if (u === "m") return "mm";
  if (u === "currency") return "in the arm's currency";
  return u;
}

export function newTarget(n: number): TargetRow {
  return { key: rowKey(), name: `T${n}`, x: "500", y: "0", z: "300", roll: "180", pitch: "0", yaw: "0", mode: "pose", posTol: "0.01", rotTol: "0.01", fx: "", fy: "", fz: "", mx: "", my: "", mz: "", contact: "" };
}
export function newWaypoint(from?: WaypointRow): WaypointRow {
  return from ? { ...from, key: rowKey() } : { key: rowKey(), x: "500", y: "0", z: "300", roll: "180", pitch: "0", yaw: "0" };
}
export function newPath(n: number): PathForm {
  const a = newWaypoint();
  return { key: rowKey(), name: `Path ${n}`, mode: "axis", step: "5", speed: "100", contact: "", waypoints: [a, { ...newWaypoint(a), y: "200" }] };
}
export function newStep(kind: StepRow["kind"], form: Pick<ReqForm, "targets" | "paths">): StepRow {
  return { key: rowKey(), kind, target: form.targets[0]?.name.trim() ?? "", dwell: "", path: form.paths[0]?.name.trim() ?? "", seconds: kind === "wait" ? "1" : "" };
}
export function newSequence(n: number, form: Pick<ReqForm, "targets" | "paths">): SequenceForm {
  return { key: rowKey(), name: `Sequence ${n}`, steps: [newStep("move", form)], requiredMode: "none", required: "", rate: "" };
}

/** Parts per hour for a cycle of t s and the other way round: 3600 / x (null unless x > 0). */
export function perHour(x: number): number | null {
  return Number.isFinite(x) && x > 0 ? 3600 / x : null;
}

/**
 * The sequence's requirement switched to another way of entering it: the other field is filled
 * from the current one (3600 / value), so a typed time shows as its rate and back.
 */
export function switchRequiredMode(seq: SequenceForm, mode: RequiredMode): SequenceForm {
  const next = { ...seq, requiredMode: mode };
  const from = seq.requiredMode === "time" ? seq.required : seq.requiredMode === "rate" ? seq.rate : "";
  const v = parseNum(from);
  const other = typeof v === "number" ? perHour(v) : null;
  if (other !== null && seq.requiredMode === "time" && mode === "rate") next.rate = show(roundShown(other));
  if (other !== null && seq.requiredMode === "rate" && mode === "time") next.required = show(roundShown(other));
  return next;
}

/** A converted value rounded to 6 significant digits so 3600 / 7 does not fill the field. */
function roundShown(v: number): number {
  return Number(v.toPrecision(6));
}

export function newSpec(): SpecRow {
  return { key: rowKey(), field: "ratedPayload", comparator: "atLeast", value: "", priority: "must", note: "" };
}

const ZERO: PoseText = { x: "0", y: "0", z: "0", roll: "0", pitch: "0", yaw: "0" };

export function emptyReqForm(): ReqForm {
  return {
    name: "",
    description: "",
    base: { ...ZERO },
    tcp: { ...ZERO },
    toolMass: "0",
    toolCog: ["0", "0", "0"],
    payloadMass: "0",
    payloadCog: ["0", "0", "0"],
    toolShapes: [],
    payloadShapes: [],
    obstacles: [],
    clearance: show(DEFAULT_CLEARANCE * 1000),
    targets: [],
    paths: [],
    sequences: [],
    specs: [],
    weights: Object.fromEntries(WEIGHT_KEYS.map((k) => [k, String(DEFAULT_WEIGHTS[k])])) as Record<WeightKey, string>,
    mounting: emptyMountingForm(),
    keep: {},
    orig: {},
    origPose: {},
  };
}

const samePose = (a: readonly number[], b: readonly number[]) => a.length === b.length && a.every((v, i) => v === b[i]);

function mountingFormFromDoc(m: RequirementSet["mounting"], t: (id: string, si: number | undefined, c: Conv) => string): MountingForm {
  if (!m) return emptyMountingForm();
  const pair = (id: string, r: readonly number[] | undefined, c: Conv): [string, string] => (r ? [t(`${id}.0`, r[0], c), t(`${id}.1`, r[1], c)] : ["", ""]);
  const preset = (Object.keys(MOUNT_PRESETS) as (keyof typeof MOUNT_PRESETS)[]).find((k) => samePose(MOUNT_PRESETS[k], m.orientation));
  return {
    on: true,
    x: pair("mount.x", m.region.x, "mm"), y: pair("mount.y", m.region.y, "mm"), z: pair("mount.z", m.region.z, "mm"), yaw: pair("mount.yaw", m.region.yaw, "deg"),
    heights: (m.heights ?? []).map((h, i) => t(`mount.h${i}`, h, "mm")).join(", "),
    preset: preset ?? "file",
    fileOrientation: preset ? null : [...m.orientation],
  };
}

/** The mounting region from the form (undefined when off); number problems go into `errors` at their field. */
function mountingToDoc(
  form: ReqForm,
  num: (id: string, text: string, c: Conv, path: string, what: string, required?: boolean) => number | undefined,
  errors: FieldError[],
): RequirementSet["mounting"] {
  const m = form.mounting;
  if (!m.on) return undefined;
  const pair = (id: string, r: [string, string], c: Conv, path: string, what: string, required = true): [number, number] | undefined => {
    if (!required && r.every((v) => v.trim() === "")) return undefined;
    return [num(`${id}.0`, r[0], c, path, `${what} from`) ?? 0, num(`${id}.1`, r[1], c, path, `${what} to`) ?? 0];
  };
  const heightTexts = m.heights.split(",").map((v) => v.trim()).filter((v) => v !== "");
  const heights = heightTexts.map((v, i) => num(`mount.h${i}`, v, "mm", `mounting.heights.${i}`, `pedestal height ${i + 1}`) ?? 0);
  const z = pair("mount.z", m.z, "mm", "mounting.region.z", "mounting z", heights.length === 0);
  const orientation = m.preset === "file" && m.fileOrientation ? m.fileOrientation : [...MOUNT_PRESETS[m.preset === "file" ? "floor" : m.preset]];
  if (m.preset === "file" && !m.fileOrientation) errors.push({ path: "mounting.orientation", message: "choose a mount orientation" });
  return {
    region: {
      x: pair("mount.x", m.x, "mm", "mounting.region.x", "mounting x")!,
      y: pair("mount.y", m.y, "mm", "mounting.region.y", "mounting y")!,
      ...(z ? { z } : {}),
      yaw: pair("mount.yaw", m.yaw, "deg", "mounting.region.yaw", "mounting yaw")!,
    },
    orientation,
    ...(heights.length ? { heights } : {}),
  };
}

export function reqFormFromDoc(doc: RequirementSet): ReqForm {
  const orig: ReqForm["orig"] = {};
  const origPose: ReqForm["origPose"] = {};
  const t = (id: string, si: number | undefined, c: Conv): string => {
    if (si === undefined) return "";
    const text = show(toShown(c, si));
    orig[id] = { text, si };
    return text;
  };
  const pose = (id: string, m: number[]): PoseText => {
    const { p, rpy } = matrixPose(m);
    const text: PoseText = {
      x: show(mToMm(p[0])), y: show(mToMm(p[1])), z: show(mToMm(p[2])),
      roll: show(radToDeg(rpy[0])), pitch: show(radToDeg(rpy[1])), yaw: show(radToDeg(rpy[2])),
    };
    origPose[id] = { text: { ...text }, matrix: m.slice() };
    return text;
  };
  const targets = doc.targets.map((tg): TargetRow => {
    const key = rowKey();
    return {
      key,
      name: tg.name,
      x: t(`${key}.x`, tg.position[0], "mm"), y: t(`${key}.y`, tg.position[1], "mm"), z: t(`${key}.z`, tg.position[2], "mm"),
      roll: t(`${key}.roll`, tg.rpy[0], "deg"), pitch: t(`${key}.pitch`, tg.rpy[1], "deg"), yaw: t(`${key}.yaw`, tg.rpy[2], "deg"),
      mode: tg.mode,
      posTol: t(`${key}.posTol`, tg.positionTolerance, "mm"),
      rotTol: t(`${key}.rotTol`, tg.rotationTolerance, "deg"),
      fx: t(`${key}.fx`, tg.force?.[0], "same"), fy: t(`${key}.fy`, tg.force?.[1], "same"), fz: t(`${key}.fz`, tg.force?.[2], "same"),
      mx: t(`${key}.mx`, tg.moment?.[0], "same"), my: t(`${key}.my`, tg.moment?.[1], "same"), mz: t(`${key}.mz`, tg.moment?.[2], "same"),
      contact: (tg.contact ?? []).join(", "),
      ...(tg.priority ? { priority: tg.priority } : {}),
    };
  });
  const paths = doc.paths.map((p): PathForm => {
    const key = rowKey();
    return {
      key,
      name: p.name,
      mode: p.mode,
      step: t(`${key}.step`, p.step, "mm"),
      speed: t(`${key}.speed`, p.speed, "mm"),
      contact: (p.contact ?? []).join(", "),
      waypoints: p.waypoints.map((w) => {
        const k = rowKey();
        return {
          key: k,
          x: t(`${k}.x`, w.position[0], "mm"), y: t(`${k}.y`, w.position[1], "mm"), z: t(`${k}.z`, w.position[2], "mm"),
          roll: t(`${k}.roll`, w.rpy[0], "deg"), pitch: t(`${k}.pitch`, w.rpy[1], "deg"), yaw: t(`${k}.yaw`, w.rpy[2], "deg"),
        };
      }),
    };
  });
  const sequences = (doc.sequences ?? []).map((q): SequenceForm => {
    const key = rowKey();
    return {
      key,
      name: q.name,
      steps: q.steps.map((st): StepRow => {
        const k = rowKey();
        const row: StepRow = { key: k, kind: st.kind, target: "", dwell: "", path: "", seconds: "" };
        if (st.kind === "move") {
          row.target = st.target;
          row.dwell = t(`${k}.dwell`, st.dwell, "same");
        } else if (st.kind === "path") row.path = st.path;
        else row.seconds = t(`${k}.seconds`, st.seconds, "same");
        return row;
      }),
      requiredMode: q.required === undefined ? "none" : "time",
      required: t(`${key}.required`, q.required, "same"),
      rate: q.required === undefined ? "" : show(roundShown(3600 / q.required)),
    };
  });
  const specs = doc.specs.map((s): SpecRow => {
    const key = rowKey();
    const kind = SPEC_FIELDS[s.field].kind;
    let value: string;
    if (typeof s.value === "number") value = t(`${key}.value`, s.value, SPEC_FIELDS[s.field].unit === "m" ? "mm" : "same");
    else if (typeof s.value === "boolean") value = s.value ? "yes" : "no";
    else value = s.value;
    if (kind === "boolean" && typeof s.value !== "boolean") value = String(s.value);
    return { key, field: s.field, comparator: s.comparator, value, priority: s.priority, note: s.note ?? "" };
  });
  const w = doc.weights ?? DEFAULT_WEIGHTS;
  return {
    name: doc.name,
    description: doc.description ?? "",
    base: pose("base", doc.base),
    tcp: pose("tcp", doc.tool.tcp),
    toolMass: t("toolMass", doc.tool.mass, "same"),
    toolCog: [t("toolCog.0", doc.tool.cog[0], "mm"), t("toolCog.1", doc.tool.cog[1], "mm"), t("toolCog.2", doc.tool.cog[2], "mm")],
    payloadMass: t("payloadMass", doc.payload.mass, "same"),
    payloadCog: [t("payloadCog.0", doc.payload.cog[0], "mm"), t("payloadCog.1", doc.payload.cog[1], "mm"), t("payloadCog.2", doc.payload.cog[2], "mm")],
    toolShapes: (doc.tool.collision ?? []).map(shapeRowFromDoc),
    payloadShapes: (doc.payload.collision ?? []).map(shapeRowFromDoc),
    obstacles: (doc.cell?.obstacles ?? []).map(shapeRowFromDoc),
    clearance: t("clearance", doc.cell?.clearance ?? DEFAULT_CLEARANCE, "mm"),
    targets,
    paths,
    sequences,
    specs,
    weights: Object.fromEntries(WEIGHT_KEYS.map((k) => [k, t(`w.${k}`, w[k], "same")])) as Record<WeightKey, string>,
    mounting: mountingFormFromDoc(doc.mounting, t),
    keep: { toolInertia: doc.tool.inertia, payloadInertia: doc.payload.inertia },
    orig,
    origPose,
  };
}

/** Converts the form; `errors` lists entries that are not numbers, at their document paths. */
export function reqFormToDoc(form: ReqForm): { doc: RequirementSet; errors: FieldError[] } {
  const errors: FieldError[] = [];
  const num = (id: string, text: string, c: Conv, path: string, what: string, required = true): number | undefined => {
    const o = form.orig[id];
    if (o && o.text === text.trim()) return o.si;
    const v = parseNum(text);
    if (v === "bad") {
      errors.push({ path, message: `${what} '${text.trim()}' is not a number` });
      return undefined;
    }
    if (v === undefined) {
      if (required) errors.push({ path, message: `${what} is required` });
      return undefined;
    }
    return fromShown(c, v);
  };
  const pose = (id: string, text: PoseText, path: string, what: string): number[] => {
    const o = form.origPose[id];
    if (o && (["x", "y", "z", "roll", "pitch", "yaw"] as const).every((k) => o.text[k] === text[k].trim())) return o.matrix;
    const p = (["x", "y", "z"] as const).map((k) => num("", text[k], "mm", `${path}.${k}`, `${what} ${k}`) ?? 0) as [number, number, number];
    const r = (["roll", "pitch", "yaw"] as const).map((k) => num("", text[k], "deg", `${path}.${k}`, `${what} ${k}`) ?? 0) as [number, number, number];
    return poseMatrix(p, r);
  };
  const vec = (ids: string[], texts: string[], c: Conv, path: string, what: string, optional: boolean): [number, number, number] | undefined => {
    // An optional vector is absent when all three cells are empty; otherwise empty cells mean 0.
    if (optional && texts.every((s) => s.trim() === "")) return undefined;
    return texts.map((s, i) => num(ids[i], s, c, `${path}.${i}`, `${what} ${"xyz"[i]}`, !optional) ?? 0) as [number, number, number];
  };

  const targets = form.targets.map((t, i) => {
    const w = `target ${i + 1}${t.name.trim() ? ` (${t.name.trim()})` : ""}`;
    const k = t.key;
    const target: RequirementSet["targets"][number] = {
      name: t.name,
      position: vec([`${k}.x`, `${k}.y`, `${k}.z`], [t.x, t.y, t.z], "mm", `targets.${i}.position`, `${w}`, false)!,
      rpy: (["roll", "pitch", "yaw"] as const).map((a, j) => num(`${k}.${a}`, t[a], "deg", `targets.${i}.rpy.${j}`, `${w} ${a}`) ?? 0) as [number, number, number],
      mode: t.mode,
      positionTolerance: num(`${k}.posTol`, t.posTol, "mm", `targets.${i}.positionTolerance`, `${w} position tolerance`) ?? 0,
      rotationTolerance: num(`${k}.rotTol`, t.rotTol, "deg", `targets.${i}.rotationTolerance`, `${w} rotation tolerance`) ?? 0,
    };
    const force = vec([`${k}.fx`, `${k}.fy`, `${k}.fz`], [t.fx, t.fy, t.fz], "same", `targets.${i}.force`, `${w} force`, true);
    if (force) target.force = force;
    const moment = vec([`${k}.mx`, `${k}.my`, `${k}.mz`], [t.mx, t.my, t.mz], "same", `targets.${i}.moment`, `${w} moment`, true);
    if (moment) target.moment = moment;
    const contact = nameList(t.contact);
    if (contact.length) target.contact = contact;
    if (t.priority) target.priority = t.priority;
    return target;
  });

  const paths = form.paths.map((p, i) => {
    const w = `path ${i + 1}${p.name.trim() ? ` (${p.name.trim()})` : ""}`;
    const contact = nameList(p.contact);
    return {
      ...(contact.length ? { contact } : {}),
      name: p.name,
      mode: p.mode,
      step: num(`${p.key}.step`, p.step, "mm", `paths.${i}.step`, `${w} sample step`) ?? 0,
      speed: num(`${p.key}.speed`, p.speed, "mm", `paths.${i}.speed`, `${w} tool speed`) ?? 0,
      waypoints: p.waypoints.map((wp, j) => {
        const k = wp.key;
        const ww = `${w} waypoint ${j + 1}`;
        return {
          position: vec([`${k}.x`, `${k}.y`, `${k}.z`], [wp.x, wp.y, wp.z], "mm", `paths.${i}.waypoints.${j}.position`, ww, false)!,
          rpy: (["roll", "pitch", "yaw"] as const).map((a, n) => num(`${k}.${a}`, wp[a], "deg", `paths.${i}.waypoints.${j}.rpy.${n}`, `${ww} ${a}`) ?? 0) as [number, number, number],
        };
      }),
    };
  });

  const sequences = form.sequences.map((q, i) => {
    const w = `sequence ${i + 1}${q.name.trim() ? ` (${q.name.trim()})` : ""}`;
    const steps = q.steps.map((st, k): Sequence["steps"][number] => {
      const ws = `${w} step ${k + 1}`;
      if (st.kind === "move") {
        const dwell = num(`${st.key}.dwell`, st.dwell, "same", `sequences.${i}.steps.${k}.dwell`, `${ws} dwell`, false);
        return { kind: "move", target: st.target, ...(dwell !== undefined ? { dwell } : {}) };
      }
      if (st.kind === "path") return { kind: "path", path: st.path };
      return { kind: "wait", seconds: num(`${st.key}.seconds`, st.seconds, "same", `sequences.${i}.steps.${k}.seconds`, `${ws} wait`) ?? 0 };
    });
    const out: Sequence = { name: q.name, steps };
    const reqPath = `sequences.${i}.required`;
    if (q.requiredMode === "time") {
      const r = num(`${q.key}.required`, q.required, "same", reqPath, `${w} required cycle time`);
      if (r !== undefined) out.required = r;
    } else if (q.requiredMode === "rate") {
      const rate = num("", q.rate, "same", reqPath, `${w} required rate`);
      if (rate !== undefined) {
        if (rate > 0 && Number.isFinite(rate)) out.required = 3600 / rate;
        else errors.push({ path: reqPath, message: `${w} required rate ${show(rate)} parts per hour must be > 0` });
      }
    }
    return out;
  });

  const specs = form.specs.map((s, i) => {
    const kind = SPEC_FIELDS[s.field].kind;
    const w = `spec requirement ${i + 1} (${SPEC_FIELDS[s.field].label})`;
    let value: number | string | boolean;
    if (kind === "number") value = num(`${s.key}.value`, s.value, SPEC_FIELDS[s.field].unit === "m" ? "mm" : "same", `specs.${i}.value`, `${w} value`) ?? 0;
    else if (kind === "boolean") value = s.value === "yes";
    else value = kind === "ip" ? s.value.trim().toUpperCase() : s.value.trim();
    const out: RequirementSet["specs"][number] = { field: s.field, comparator: s.comparator, value, priority: s.priority };
    if (s.note.trim()) out.note = s.note.trim();
    return out;
  });

  const weights = Object.fromEntries(WEIGHT_KEYS.map((k) => [k, num(`w.${k}`, form.weights[k], "same", `weights.${k}`, `${WEIGHT_LABEL[k]} weight`) ?? 0])) as Weights;

  const tool: RequirementSet["tool"] = {
    tcp: pose("tcp", form.tcp, "tool.tcp", "TCP offset"),
    mass: num("toolMass", form.toolMass, "same", "tool.mass", "tool mass") ?? 0,
    cog: vec(["toolCog.0", "toolCog.1", "toolCog.2"], form.toolCog, "mm", "tool.cog", "tool CoG", false)!,
  };
  if (form.keep.toolInertia) tool.inertia = form.keep.toolInertia;
  if (form.toolShapes.length) tool.collision = form.toolShapes.map((r, i) => shapeRowToDoc(r, `tool.collision.${i}`, `tool shape ${i + 1}`, errors, { named: false }) as NonNullable<RequirementSet["tool"]["collision"]>[number]);
  const payload: RequirementSet["payload"] = {
    mass: num("payloadMass", form.payloadMass, "same", "payload.mass", "payload mass") ?? 0,
    cog: vec(["payloadCog.0", "payloadCog.1", "payloadCog.2"], form.payloadCog, "mm", "payload.cog", "payload CoG", false)!,
  };
  if (form.keep.payloadInertia) payload.inertia = form.keep.payloadInertia;
  if (form.payloadShapes.length) payload.collision = form.payloadShapes.map((r, i) => shapeRowToDoc(r, `payload.collision.${i}`, `payload shape ${i + 1}`, errors, { named: false }) as NonNullable<RequirementSet["payload"]["collision"]>[number]);
  const cell: RequirementSet["cell"] = {
    obstacles: form.obstacles.map((r, i) => shapeRowToDoc(r, `cell.obstacles.${i}`, `obstacle ${i + 1}${r.name.trim() ? ` (${r.name.trim()})` : ""}`, errors, { named: true }) as RequirementSet["cell"]["obstacles"][number]),
    clearance: num("clearance", form.clearance, "mm", "cell.clearance", "required clearance") ?? DEFAULT_CLEARANCE,
  };

  const doc: RequirementSet = {
    name: form.name,
    base: pose("base", form.base, "base", "base placement"),
    tool,
    payload,
    targets,
    paths,
    specs,
    cell,
    weights,
  };
  if (sequences.length) doc.sequences = sequences;
  const mounting = mountingToDoc(form, num, errors);
  if (mounting) doc.mounting = mounting;
  if (form.description.trim()) doc.description = form.description;
  return { doc, errors };
}

/** Names typed as a comma-separated list (empty entries dropped). */
function nameList(text: string): string[] {
  return text.split(",").map((x) => x.trim()).filter(Boolean);
}

export function validateReqForm(form: ReqForm): { doc: RequirementSet; errors: FieldError[] } {
  return checkFormDoc(requirementSetSchema, reqFormToDoc(form));
}

/** A readable name for an error path, e.g. "targets.2.rpy.0" → "target 3 roll". */
export function reqPathLabel(path: string): string {
  const p = path.split(".");
  const axis = (s: string | undefined, names = "xyz") => (s === undefined ? "" : " " + (names[Number(s)] ?? s));
  switch (p[0]) {
    case "targets": {
      if (p.length < 2) return "targets";
      const n = `target ${Number(p[1]) + 1}`;
      if (p[2] === "rpy") return n + axis(p[3], "rpy").replace(" r", " roll").replace(" p", " pitch").replace(" y", " yaw");
      if (p[2] === "position") return `${n} position${axis(p[3])}`;
      if (p[2] === "positionTolerance") return `${n} position tolerance`;
      if (p[2] === "rotationTolerance") return `${n} rotation tolerance`;
      if (p[2] === "contact") return `${n} contact`;
      return p[2] ? `${n} ${p[2]}${axis(p[3])}` : n;
    }
    case "paths": {
      if (p.length < 2) return "paths";
      const n = `path ${Number(p[1]) + 1}`;
      if (p[2] === "waypoints" && p[3] !== undefined) return `${n} waypoint ${Number(p[3]) + 1}${p[4] ? " " + p[4] : ""}`;
      return p[2] ? `${n} ${p[2] === "step" ? "sample step" : p[2] === "speed" ? "tool speed" : p[2]}` : n;
    }
    case "sequences": {
      if (p.length < 2) return "sequences";
      const n = `sequence ${Number(p[1]) + 1}`;
      if (p[2] === "steps" && p[3] !== undefined) return `${n} step ${Number(p[3]) + 1}${p[4] ? " " + (p[4] === "seconds" ? "wait" : p[4]) : ""}`;
      if (p[2] === "required") return `${n} required cycle time`;
      return p[2] ? `${n} ${p[2]}` : n;
    }
    case "specs":
      return p.length > 1 ? `spec requirement ${Number(p[1]) + 1}${p[2] ? " " + p[2] : ""}` : "spec requirements";
    case "weights":
      return p[1] ? `${WEIGHT_LABEL[p[1] as WeightKey] ?? p[1]} weight` : "weights";
    case "tool":
    case "payload":
      if (p[1] === "collision" && p.length >= 3) return `${p[0]} shape ${Number(p[2]) + 1}${p[3] ? " " + shapeField(p.slice(3)) : ""}`;
      if (p[0] === "tool" && p[1] === "tcp") return "TCP offset";
      return `${p[0]} ${p[1] === "cog" ? "CoG" + axis(p[2]) : p[1] ?? ""}`.trim();
    case "base":
      return "base placement";
    case "cell": {
      if (p[1] === "clearance") return "required clearance";
      if (p[1] !== "obstacles" || p.length < 3) return "cell obstacles";
      return `obstacle ${Number(p[2]) + 1}${p[3] ? " " + shapeField(p.slice(3)) : ""}`;
    }
    default:
      return p[0] || "requirement set";
  }
}

/** "size 2", "radius", "centre x", "x", … for the tail of a shape's error path. */
function shapeField(rest: string[]): string {
  const [f, k] = rest;
  if (f === "size") return k === undefined ? "size" : `${["x", "y", "z"][Number(k)] ?? k} side`;
  if (f === "center" || f === "from" || f === "to") return `${f === "center" ? "centre" : f}${k === undefined ? "" : " " + (["x", "y", "z"][Number(k)] ?? k)}`;
  if (f === "pose") return "placement";
  return f;
}

/** Readable values for the conflict list. */
export function formatReqValue(path: string, value: unknown): string {
  if (value === undefined || value === null) return "(not set)";
  const p = path.split(".");
  if (Array.isArray(value) && value.length === 16 && value.every((v) => typeof v === "number")) {
    const { p: pos, rpy } = matrixPose(value as number[]);
    return `x y z ${pos.map((v) => show(mToMm(v))).join(" ")} mm, rpy ${rpy.map((v) => show(radToDeg(v))).join(" ")}°`;
  }
  if (typeof value === "number") {
    const last = p[p.length - 1];
    const parent = p[p.length - 2];
    if (parent === "rpy" || last === "rotationTolerance") return `${show(radToDeg(value))}°`;
    if (parent === "position" || parent === "cog" || last === "positionTolerance" || last === "step") return `${show(mToMm(value))} mm`;
    if (last === "clearance" || last === "radius" || last === "length" || parent === "size" || parent === "center" || parent === "from" || parent === "to") return `${show(mToMm(value))} mm`;
    if (last === "speed") return `${show(mToMm(value))} mm/s`;
    if (p[0] === "sequences" && (last === "required" || last === "dwell" || last === "seconds")) return `${show(value)} s`;
    if (parent === "force") return `${show(value)} N`;
    if (parent === "moment") return `${show(value)} N·m`;
    if (last === "mass") return `${show(value)} kg`;
    return show(value);
  }
  if (typeof value === "string") return value;
  return JSON.stringify(value);
}

export { COMPARATORS };
