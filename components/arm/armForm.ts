/**
 * Form state of the arm editor and its conversion to and from the interchange ArmDocument.
 * The form shows mm, degrees, kg, N·m (N for prismatic), and keeps every value as typed text;
 * values that were loaded and not edited are sent back exactly as loaded (no rounding drift).
 */
import { armSchema, type ArmDocument, type ArmSource, type ChainJointSpec, type Convention, type FieldError, type JointSpec, type Mounting } from "@/shared/schemas";
import { degToRad, jointFromDisplay, jointToDisplay, jointUnit, mmToM, mToMm, radToDeg } from "@/shared/units";
import { checkFormDoc } from "../formDoc";
import { parseNum, parsePose, poseMatrix, poseTextFromMatrix, rowKey, samePose, show, isZeroPose, type PoseText } from "../pose";
import { applyCollisionForm, capsuleRowsFromDoc, ignoredPairsText, type CapsuleRow } from "./collisionForm";

export type JointType = "revolute" | "prismatic";
const JOINT_NUM_FIELDS = [
  "a", "alpha", "d", "theta",
  "ox", "oy", "oz", "roll", "pitch", "yaw", "axisX", "axisY", "axisZ",
  "min", "max", "maxSpeed", "maxAcceleration", "maxTorque", "mass", "comX", "comY", "comZ", "radius",
] as const;
export type JointNumField = (typeof JOINT_NUM_FIELDS)[number];
/** The DH table columns (`dh`, `mdh`). */
const DH_FIELDS = ["a", "alpha", "d", "theta"] as const;
/** The chain columns: origin x y z (mm), roll pitch yaw (°), axis x y z (no unit). */
export const ORIGIN_FIELDS = ["ox", "oy", "oz", "roll", "pitch", "yaw"] as const;
export const AXIS_FIELDS = ["axisX", "axisY", "axisZ"] as const;
type ChainField = (typeof ORIGIN_FIELDS)[number] | (typeof AXIS_FIELDS)[number];
/** Document path of a chain column, e.g. "origin.xyz.0" or "axis.2". */
export const CHAIN_FIELD_PATH: Record<ChainField, string> = {
  ox: "origin.xyz.0", oy: "origin.xyz.1", oz: "origin.xyz.2",
  roll: "origin.rpy.0", pitch: "origin.rpy.1", yaw: "origin.rpy.2",
  axisX: "axis.0", axisY: "axis.1", axisZ: "axis.2",
};

export interface JointRow {
  key: string;
  type: JointType;
  a: string;
  alpha: string;
  d: string;
  theta: string;
  /** Chain joints: origin translation (mm) and roll, pitch, yaw (°), axis components. */
  ox: string;
  oy: string;
  oz: string;
  roll: string;
  pitch: string;
  yaw: string;
  axisX: string;
  axisY: string;
  axisZ: string;
  min: string;
  max: string;
  maxSpeed: string;
  /** Joint acceleration limit (°/s² or mm/s²); empty: not stated (the cycle time then assumes one). */
  maxAcceleration: string;
  maxTorque: string;
  mass: string;
  comX: string;
  comY: string;
  comZ: string;
  radius: string;
  /** Chain joints: inertia tensor as loaded (not edited in the form, kept on save). */
  inertia?: [number, number, number, number, number, number];
  /** Values as loaded: text shown and the SI value behind it, with the joint type then. */
  orig?: { type: JointType; values: Partial<Record<JointNumField, { text: string; si: number }>> };
}

interface WristRow {
  key: string;
  joint: string;
  moment: string;
  inertia: string;
}

export interface ArmForm {
  name: string;
  maker: string;
  modelCode: string;
  description: string;
  convention: Convention;
  joints: JointRow[];
  /** The file the arm was imported from (kept on save, not edited). */
  source?: ArmSource;
  base: PoseText;
  tool: PoseText;
  /** Collision capsules of the base and the links (one table) and the ignored pairs ("1-3, 2-4"). */
  capsules: CapsuleRow[];
  ignoredPairs: string;
  baseOrig?: { text: PoseText; matrix: number[] };
  toolOrig?: { text: PoseText; matrix: number[] };
  specs: {
    ratedPayload: string;
    reach: string;
    repeatability: string;
    armMass: string;
    ipCode: string;
    mounting: Mounting[];
    wristAllowables: WristRow[];
    collaborative: "" | "yes" | "no";
    price: string;
    currency: string;
    leadTimeWeeks: string;
  };
  /** Spec numbers as loaded (text, SI). */
  specOrig?: Partial<Record<string, { text: string; si: number }>>;
}

/** Column labels with units; one source for the table header, paste preview and messages. */
export const JOINT_LABEL: Record<JointNumField, string> = {
  a: "a",
  alpha: "α",
  d: "d",
  theta: "θ",
  ox: "origin x",
  oy: "origin y",
  oz: "origin z",
  roll: "origin roll",
  pitch: "origin pitch",
  yaw: "origin yaw",
  axisX: "axis x",
  axisY: "axis y",
  axisZ: "axis z",
  min: "min",
  max: "max",
  maxSpeed: "max speed",
  maxAcceleration: "max acceleration",
  maxTorque: "max torque",
  mass: "link mass",
  comX: "CoM x",
  comY: "CoM y",
  comZ: "CoM z",
  radius: "collision radius",
};

/** Unit shown for a joint column. */
export function jointFieldUnit(field: JointNumField, type: JointType): string {
  switch (field) {
    case "alpha":
    case "theta":
    case "roll":
    case "pitch":
    case "yaw":
      return "°";
    case "axisX":
    case "axisY":
    case "axisZ":
      return "";
    case "min":
    case "max":
      return jointUnit(type);
    case "maxSpeed":
      return type === "revolute" ? "°/s" : "mm/s";
    case "maxAcceleration":
      return type === "revolute" ? "°/s²" : "mm/s²";
    case "maxTorque":
      return type === "revolute" ? "N·m" : "N";
    case "mass":
      return "kg";
    default:
      return "mm";
  }
}

/** SI → shown number for a joint field. */
export function jointFieldToDisplay(field: JointNumField, type: JointType, si: number): number {
  switch (field) {
    case "alpha":
    case "theta":
    case "roll":
    case "pitch":
    case "yaw":
      return radToDeg(si);
    case "min":
    case "max":
    case "maxSpeed":
    case "maxAcceleration":
      return jointToDisplay(type, si);
    case "maxTorque":
    case "mass":
    case "axisX":
    case "axisY":
    case "axisZ":
      return si;
    default:
      return mToMm(si);
  }
}

function jointFieldFromDisplay(field: JointNumField, type: JointType, shown: number): number {
  switch (field) {
    case "alpha":
    case "theta":
    case "roll":
    case "pitch":
    case "yaw":
      return degToRad(shown);
    case "min":
    case "max":
    case "maxSpeed":
    case "maxAcceleration":
      return jointFromDisplay(type, shown);
    case "maxTorque":
    case "mass":
    case "axisX":
    case "axisY":
    case "axisZ":
      return shown;
    default:
      return mmToM(shown);
  }
}

export function newJointRow(type: JointType = "revolute"): JointRow {
  return {
    key: rowKey(),
    type,
    a: "0",
    alpha: "0",
    d: "0",
    theta: "0",
    ox: "0",
    oy: "0",
    oz: "0",
    roll: "0",
    pitch: "0",
    yaw: "0",
    axisX: "0",
    axisY: "0",
    axisZ: "1",
    min: type === "revolute" ? "-180" : "0",
    max: type === "revolute" ? "180" : "500",
    maxSpeed: "",
    maxAcceleration: "",
    maxTorque: "",
    mass: "",
    comX: "",
    comY: "",
    comZ: "",
    radius: "",
  };
}

export function emptyArmForm(): ArmForm {
  return {
    name: "",
    maker: "",
    modelCode: "",
    description: "",
    convention: "dh",
    joints: [newJointRow()],
    base: { x: "0", y: "0", z: "0", roll: "0", pitch: "0", yaw: "0" },
    tool: { x: "0", y: "0", z: "0", roll: "0", pitch: "0", yaw: "0" },
    capsules: [],
    ignoredPairs: "",
    specs: {
      ratedPayload: "",
      reach: "",
      repeatability: "",
      armMass: "",
      ipCode: "",
      mounting: [],
      wristAllowables: [],
      collaborative: "",
      price: "",
      currency: "EUR",
      leadTimeWeeks: "",
    },
  };
}

const SPEC_TO_DISPLAY: Record<string, (si: number) => number> = {
  ratedPayload: (v) => v,
  reach: mToMm,
  repeatability: mToMm,
  armMass: (v) => v,
  price: (v) => v,
  leadTimeWeeks: (v) => v,
};
const SPEC_FROM_DISPLAY: Record<string, (v: number) => number> = {
  ratedPayload: (v) => v,
  reach: mmToM,
  repeatability: mmToM,
  armMass: (v) => v,
  price: (v) => v,
  leadTimeWeeks: (v) => v,
};

export function armFormFromDoc(doc: ArmDocument): ArmForm {
  const joints: JointRow[] = (doc.joints as (JointSpec | ChainJointSpec)[]).map((j) => {
    const dh = "a" in j ? j : undefined;
    const ch = "origin" in j ? j : undefined;
    const si: Record<JointNumField, number | undefined> = {
      a: dh?.a,
      alpha: dh?.alpha,
      d: dh?.d,
      theta: dh?.theta,
      ox: ch?.origin.xyz[0],
      oy: ch?.origin.xyz[1],
      oz: ch?.origin.xyz[2],
      roll: ch?.origin.rpy[0],
      pitch: ch?.origin.rpy[1],
      yaw: ch?.origin.rpy[2],
      axisX: ch?.axis[0],
      axisY: ch?.axis[1],
      axisZ: ch?.axis[2],
      min: j.min,
      max: j.max,
      maxSpeed: j.maxSpeed,
      maxAcceleration: j.maxAcceleration,
      maxTorque: j.maxTorque,
      mass: j.mass,
      comX: j.com?.[0],
      comY: j.com?.[1],
      comZ: j.com?.[2],
      radius: j.radius,
    };
    const row: JointRow = { ...newJointRow(j.type), orig: { type: j.type, values: {} } };
    for (const f of JOINT_NUM_FIELDS) {
      const v = si[f];
      const text = v === undefined ? "" : show(jointFieldToDisplay(f, j.type, v));
      // Columns of the other convention keep their defaults (used if the convention is switched).
      if (v === undefined && ((ch && (DH_FIELDS as readonly string[]).includes(f)) || (dh && f in CHAIN_FIELD_PATH))) continue;
      row[f] = text;
      if (v !== undefined) row.orig!.values[f] = { text, si: v };
    }
    if (ch?.inertia) row.inertia = [...ch.inertia];
    return row;
  });
  const s = doc.specs ?? {};
  const specOrig: NonNullable<ArmForm["specOrig"]> = {};
  const specText = (k: keyof typeof SPEC_TO_DISPLAY): string => {
    const v = (s as Record<string, unknown>)[k];
    if (typeof v !== "number") return "";
    const text = show(SPEC_TO_DISPLAY[k](v));
    specOrig[k] = { text, si: v };
    return text;
  };
  const base = poseTextFromMatrix(doc.base);
  const tool = poseTextFromMatrix(doc.tool);
  return {
    name: doc.name,
    maker: doc.maker ?? "",
    modelCode: doc.modelCode ?? "",
    description: doc.description ?? "",
    convention: doc.convention,
    joints,
    source: doc.source ? { ...doc.source } : undefined,
    base,
    tool,
    capsules: capsuleRowsFromDoc(doc),
    ignoredPairs: ignoredPairsText(doc),
    baseOrig: doc.base ? { text: { ...base }, matrix: doc.base.slice() } : undefined,
    toolOrig: doc.tool ? { text: { ...tool }, matrix: doc.tool.slice() } : undefined,
    specs: {
      ratedPayload: specText("ratedPayload"),
      reach: specText("reach"),
      repeatability: specText("repeatability"),
      armMass: specText("armMass"),
      ipCode: s.ipCode ?? "",
      mounting: (s.mounting ?? []).slice(),
      wristAllowables: (s.wristAllowables ?? []).map((w) => ({
        key: rowKey(),
        joint: String(w.joint),
        moment: w.moment === undefined ? "" : show(w.moment),
        inertia: w.inertia === undefined ? "" : show(w.inertia),
      })),
      collaborative: s.collaborative === undefined ? "" : s.collaborative ? "yes" : "no",
      price: specText("price"),
      currency: s.currency ?? "",
      leadTimeWeeks: specText("leadTimeWeeks"),
    },
    specOrig,
  };
}

const SPEC_LABEL: Record<string, string> = {
  ratedPayload: "rated payload",
  reach: "reach",
  repeatability: "pose repeatability",
  armMass: "arm mass",
  price: "price",
  leadTimeWeeks: "lead time",
};

/**
 * Converts the form to an ArmDocument. `errors` holds values that are not numbers (with the
 * document path they would have had); the document is only complete when errors is empty.
 */
export function armFormToDoc(form: ArmForm): { doc: ArmDocument; errors: FieldError[] } {
  const errors: FieldError[] = [];
  const joints = form.joints.map((row, i) => {
    const get = (f: JointNumField, path: string): number | undefined => {
      const o = row.orig?.type === row.type ? row.orig.values[f] : undefined;
      if (o && o.text === row[f].trim()) return o.si;
      const v = parseNum(row[f]);
      if (v === "bad") {
        errors.push({ path, message: `joint ${i + 1} ${JOINT_LABEL[f]} '${row[f].trim()}' is not a number` });
        return undefined;
      }
      return v === undefined ? undefined : jointFieldFromDisplay(f, row.type, v);
    };
    const need = (f: JointNumField): number => {
      const v = get(f, `joints.${i}.${f}`);
      if (v === undefined && row[f].trim() === "") errors.push({ path: `joints.${i}.${f}`, message: `joint ${i + 1} ${JOINT_LABEL[f]} is required` });
      return v ?? 0;
    };
    const needAt = (f: ChainField): number => {
      const path = `joints.${i}.${CHAIN_FIELD_PATH[f]}`;
      const v = get(f, path);
      if (v === undefined && row[f].trim() === "") errors.push({ path, message: `joint ${i + 1} ${JOINT_LABEL[f]} is required` });
      return v ?? 0;
    };
    const joint: JointSpec | ChainJointSpec =
      form.convention === "chain"
        ? {
            type: row.type,
            origin: { xyz: [needAt("ox"), needAt("oy"), needAt("oz")], rpy: [needAt("roll"), needAt("pitch"), needAt("yaw")] },
            axis: [needAt("axisX"), needAt("axisY"), needAt("axisZ")],
            min: need("min"),
            max: need("max"),
          }
        : {
            type: row.type,
            a: need("a"),
            alpha: need("alpha"),
            d: need("d"),
            theta: need("theta"),
            min: need("min"),
            max: need("max"),
          };
    const maxSpeed = get("maxSpeed", `joints.${i}.maxSpeed`);
    if (maxSpeed !== undefined) joint.maxSpeed = maxSpeed;
    const maxAcceleration = get("maxAcceleration", `joints.${i}.maxAcceleration`);
    if (maxAcceleration !== undefined) joint.maxAcceleration = maxAcceleration;
    const maxTorque = get("maxTorque", `joints.${i}.maxTorque`);
    if (maxTorque !== undefined) joint.maxTorque = maxTorque;
    const mass = get("mass", `joints.${i}.mass`);
    if (mass !== undefined) joint.mass = mass;
    const radius = get("radius", `joints.${i}.radius`);
    if (radius !== undefined) joint.radius = radius;
    const cx = get("comX", `joints.${i}.com.0`);
    const cy = get("comY", `joints.${i}.com.1`);
    const cz = get("comZ", `joints.${i}.com.2`);
    if (cx !== undefined || cy !== undefined || cz !== undefined) joint.com = [cx ?? 0, cy ?? 0, cz ?? 0];
    if (row.inertia && "origin" in joint) joint.inertia = [...row.inertia];
    return joint;
  });

  const transform = (text: PoseText, orig: ArmForm["baseOrig"], key: "base" | "tool"): number[] | undefined => {
    if (orig && samePose(orig.text, text)) return orig.matrix;
    const parsed = parsePose(text, key);
    if (!parsed.ok) {
      for (const [k, message] of Object.entries(parsed.errors)) errors.push({ path: `${key}.${k}`, message: message! });
      return undefined;
    }
    if (isZeroPose(text)) return undefined;
    return poseMatrix(parsed.p, parsed.rpy);
  };

  const sp = form.specs;
  const specs: NonNullable<ArmDocument["specs"]> = {};
  for (const k of Object.keys(SPEC_FROM_DISPLAY) as (keyof typeof SPEC_FROM_DISPLAY)[]) {
    const text = (sp as unknown as Record<string, string>)[k];
    const o = form.specOrig?.[k];
    if (o && o.text === text.trim()) {
      (specs as Record<string, number>)[k] = o.si;
      continue;
    }
    const v = parseNum(text);
    if (v === "bad") errors.push({ path: `specs.${k}`, message: `${SPEC_LABEL[k]} '${text.trim()}' is not a number` });
    else if (v !== undefined) (specs as Record<string, number>)[k] = SPEC_FROM_DISPLAY[k](v);
  }
  if (sp.ipCode.trim()) specs.ipCode = sp.ipCode.trim();
  if (sp.mounting.length) specs.mounting = sp.mounting.slice();
  if (sp.collaborative) specs.collaborative = sp.collaborative === "yes";
  if (sp.currency.trim()) specs.currency = sp.currency.trim().toUpperCase();
  if (sp.wristAllowables.length) {
    specs.wristAllowables = sp.wristAllowables.map((w, i) => {
      const out: { joint: number; moment?: number; inertia?: number } = { joint: 0 };
      const j = parseNum(w.joint);
      if (j === "bad" || j === undefined || !Number.isInteger(j))
        errors.push({ path: `specs.wristAllowables.${i}.joint`, message: `wrist row ${i + 1} joint '${w.joint.trim()}' is not a joint number` });
      else out.joint = j;
      const m = parseNum(w.moment);
      if (m === "bad") errors.push({ path: `specs.wristAllowables.${i}.moment`, message: `wrist row ${i + 1} moment '${w.moment.trim()}' is not a number` });
      else if (m !== undefined) out.moment = m;
      const n = parseNum(w.inertia);
      if (n === "bad") errors.push({ path: `specs.wristAllowables.${i}.inertia`, message: `wrist row ${i + 1} inertia '${w.inertia.trim()}' is not a number` });
      else if (n !== undefined) out.inertia = n;
      return out;
    });
  }

  const doc = {
    name: form.name,
    convention: form.convention,
    joints,
  } as ArmDocument;
  if (form.source) doc.source = { ...form.source };
  if (form.maker.trim()) doc.maker = form.maker.trim();
  if (form.modelCode.trim()) doc.modelCode = form.modelCode.trim();
  if (form.description.trim()) doc.description = form.description;
  const base = transform(form.base, form.baseOrig, "base");
  if (base) doc.base = base;
  const tool = transform(form.tool, form.toolOrig, "tool");
  if (tool) doc.tool = tool;
  if (Object.keys(specs).length) doc.specs = specs;
  applyCollisionForm(doc, form.capsules, form.ignoredPairs, errors);
  return { doc, errors };
}

/** Client-side check with the shared schema, plus the not-a-number errors of the form. */
export function validateArmForm(form: ArmForm): { doc: ArmDocument; errors: FieldError[] } {
  return checkFormDoc(armSchema, armFormToDoc(form));
}

/** A readable name for an error path, e.g. "joints.2.max" → "joint 3 max". */
export function armPathLabel(path: string): string {
  const p = path.split(".");
  if (p[0] === "joints" && p.length >= 2) {
    const n = Number(p[1]) + 1;
    if (p.length === 2) return `joint ${n}`;
    const xyz = (k: string | undefined) => (k !== undefined ? " " + ("xyz"[Number(k)] ?? k) : "");
    const f =
      p[2] === "com"
        ? "CoM" + xyz(p[3])
        : p[2] === "axis"
          ? "axis" + xyz(p[3])
          : p[2] === "origin"
            ? "origin" + (p[3] === "rpy" ? (p[4] !== undefined ? " " + (["roll", "pitch", "yaw"][Number(p[4])] ?? p[4]) : " rpy") : xyz(p[4]))
            : p[2] === "collision"
              ? `capsule${p[3] !== undefined ? ` ${Number(p[3]) + 1}` : "s"}${capsuleField(p.slice(4))}`
              : (JOINT_LABEL as Record<string, string>)[p[2]] ?? p[2];
    return `joint ${n} ${f}`;
  }
  if (p[0] === "specs") {
    if (p[1] === "wristAllowables" && p.length >= 3) return `wrist row ${Number(p[2]) + 1}${p[3] ? " " + p[3] : ""}`;
    return SPEC_LABEL[p[1]] ?? p[1] ?? "specs";
  }
  if (p[0] === "baseCollision") return `base capsule${p[1] !== undefined ? ` ${Number(p[1]) + 1}` : "s"}${capsuleField(p.slice(2))}`;
  if (p[0] === "collision") return `capsule ${Number(p[1]) + 1}${p[2] ? " " + (CAPSULE_CELL_LABEL[p[2]] ?? p[2]) : ""}`;
  if (p[0] === "ignoredPairs") return `ignored pair${p[1] !== undefined ? ` ${Number(p[1]) + 1}` : "s"}`;
  if (p[0] === "base") return "base transform";
  if (p[0] === "tool") return "tool transform";
  return p[0] === "modelCode" ? "model code" : p[0] || "arm";
}

const CAPSULE_CELL_LABEL: Record<string, string> = { link: "body", fx: "from x", fy: "from y", fz: "from z", tx: "to x", ty: "to y", tz: "to z", r: "radius" };

/** " from x", " radius", … for the tail of a capsule's error path. */
function capsuleField(rest: string[]): string {
  if (rest.length === 0) return "";
  const [f, k] = rest;
  return ` ${f}${k !== undefined ? " " + ("xyz"[Number(k)] ?? k) : ""}`;
}

export { describeError } from "../formDoc";
