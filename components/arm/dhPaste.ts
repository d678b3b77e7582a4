/**
 * Parsing a DH table pasted from a spreadsheet: tab-, comma- or semicolon-separated, with a
 * header row naming the columns, or in the documented column order
 *   type, a (mm), α (°), d (mm), θ (°), min, max (° or mm), max speed (°/s or mm/s),
 *   max torque (N·m or N), link mass (kg), CoM x, CoM y, CoM z (mm)
 * where the type column may be left out (all joints revolute then).
 * Every row is checked on its own; messages read "row 3: α 'abc' is not a number".
 */
import { JOINT_LABEL, newJointRow, jointFieldUnit, type JointNumField, type JointRow, type JointType } from "./armForm";
import { parseNum, show } from "../pose";

const DOCUMENTED_ORDER: (JointNumField | "type")[] = ["type", "a", "alpha", "d", "theta", "min", "max", "maxSpeed", "maxTorque", "mass", "comX", "comY", "comZ"];
const REQUIRED: JointNumField[] = ["a", "alpha", "d", "theta", "min", "max"];

const HEADER_ALIASES: Record<string, JointNumField | "type" | "ignore"> = {
  type: "type", "joint type": "type", kind: "type",
  joint: "ignore", "#": "ignore", i: "ignore", no: "ignore", "no.": "ignore", index: "ignore", name: "ignore",
  a: "a", "a (mm)": "a", "a_mm": "a", "a[mm]": "a",
  alpha: "alpha", "α": "alpha", "alpha (deg)": "alpha", "α (°)": "alpha", "alpha_deg": "alpha",
  d: "d", "d (mm)": "d", "d_mm": "d",
  theta: "theta", "θ": "theta", "theta (deg)": "theta", "θ (°)": "theta", "theta_deg": "theta", offset: "theta",
  min: "min", lower: "min", "q min": "min", qmin: "min",
  max: "max", upper: "max", "q max": "max", qmax: "max",
  "max speed": "maxSpeed", maxspeed: "maxSpeed", speed: "maxSpeed", vmax: "maxSpeed", velocity: "maxSpeed",
  "max acceleration": "maxAcceleration", maxacceleration: "maxAcceleration", acceleration: "maxAcceleration", amax: "maxAcceleration",
  "max torque": "maxTorque", maxtorque: "maxTorque", torque: "maxTorque", "max force": "maxTorque",
  mass: "mass", "link mass": "mass", m: "mass",
  "com x": "comX", comx: "comX", com_x: "comX", cx: "comX",
  "com y": "comY", comy: "comY", com_y: "comY", cy: "comY",
  "com z": "comZ", comz: "comZ", com_z: "comZ", cz: "comZ",
  radius: "radius", "collision radius": "radius",
};

/** Header cell → column, ignoring a trailing unit in brackets such as "a [mm]" or "alpha (°)". */
function headerColumn(cell: string): JointNumField | "type" | "ignore" | undefined {
  const c = cell.trim().toLowerCase().replace(/\s+/g, " ");
  if (c in HEADER_ALIASES) return HEADER_ALIASES[c];
  const bare = c.replace(/\s*[([].*?[)\]]\s*$/, "").trim();
  return HEADER_ALIASES[bare];
}

function parseType(cell: string): JointType | undefined {
  const c = cell.trim().toLowerCase();
  if (["r", "rev", "revolute", "rot", "rotary"].includes(c)) return "revolute";
  if (["p", "pri", "prismatic", "lin", "linear"].includes(c)) return "prismatic";
  return undefined;
}

interface PasteRow {
  /** 1-based data row number (the header row is not counted). */
  row: number;
  cells: string[];
  joint?: JointRow;
  errors: string[];
}

interface PasteResult {
  columns: (JointNumField | "type" | "ignore")[];
  header: boolean;
  delimiter: "tab" | "comma" | "semicolon";
  rows: PasteRow[];
  /** A problem with the whole paste (e.g. an unknown header). */
  problem?: string;
}

export function parseDhPaste(text: string): PasteResult {
  const lines = text.replace(/\r\n?/g, "\n").split("\n").filter((l) => l.trim() !== "");
  const delimiter: PasteResult["delimiter"] = text.includes("\t") ? "tab" : text.includes(";") && !text.includes(",") ? "semicolon" : "comma";
  const sep = delimiter === "tab" ? "\t" : delimiter === "semicolon" ? ";" : ",";
  const split = (l: string) => l.split(sep).map((c) => c.trim().replace(/^"(.*)"$/, "$1"));
  if (lines.length === 0) return { columns: [], header: false, delimiter, rows: [] };

  const first = split(lines[0]);
  const firstNumeric = first.some((c) => typeof parseNum(c) === "number");
  const mapped = first.map(headerColumn);
  const header = !firstNumeric && mapped.some((m) => m !== undefined && m !== "ignore" && m !== "type") && first.some((c) => parseType(c) === undefined);
  let columns: PasteResult["columns"];
  let problem: string | undefined;
  if (header) {
    const unknown = first.filter((_, i) => mapped[i] === undefined);
    if (unknown.length) problem = `unknown column${unknown.length > 1 ? "s" : ""} ${unknown.map((u) => `'${u}'`).join(", ")} (ignored)`;
    columns = mapped.map((m) => m ?? "ignore");
    const missing = REQUIRED.filter((r) => !columns.includes(r));
    if (missing.length) problem = `the header has no column for ${missing.map((m) => JOINT_LABEL[m]).join(", ")}`;
  } else {
    // Documented order; the type column may be left out.
    const dataFirst = split(lines[0]);
    columns = parseType(dataFirst[0]) !== undefined || dataFirst[0] === "" ? DOCUMENTED_ORDER.slice() : DOCUMENTED_ORDER.slice(1);
  }

  const dataLines = header ? lines.slice(1) : lines;
  const rows: PasteRow[] = dataLines.map((line, idx) => {
    const cells = split(line);
    const row = idx + 1;
    const errors: string[] = [];
    if (cells.length > columns.length) errors.push(`row ${row}: ${cells.length} cells, but ${columns.length} columns are known`);
    const typeIdx = columns.indexOf("type");
    let type: JointType = "revolute";
    if (typeIdx >= 0) {
      const t = cells[typeIdx] ?? "";
      const parsed = parseType(t);
      if (parsed) type = parsed;
      else if (t.trim() !== "") errors.push(`row ${row}: type '${t}' is not revolute or prismatic`);
    }
    const joint = newJointRow(type);
    for (const f of ["maxSpeed", "maxAcceleration", "maxTorque", "mass", "comX", "comY", "comZ", "radius"] as const) joint[f] = "";
    const values: Partial<Record<JointNumField, number>> = {};
    columns.forEach((col, ci) => {
      if (col === "type" || col === "ignore") return;
      const cell = cells[ci] ?? "";
      const v = parseNum(cell);
      if (v === "bad") errors.push(`row ${row}: ${JOINT_LABEL[col]} '${cell}' is not a number`);
      else if (v === undefined) {
        if (REQUIRED.includes(col)) errors.push(`row ${row}: ${JOINT_LABEL[col]} is missing`);
        joint[col] = "";
      } else {
        values[col] = v;
        joint[col] = show(v);
      }
    });
    for (const r of REQUIRED) if (!columns.includes(r)) errors.push(`row ${row}: ${JOINT_LABEL[r]} is missing`);
    if (values.min !== undefined && values.max !== undefined && values.min > values.max) {
      const u = jointFieldUnit("max", type);
      errors.push(`row ${row}: max (${show(values.max)}${u}) is below min (${show(values.min)}${u})`);
    }
    for (const f of ["maxSpeed", "maxAcceleration", "maxTorque"] as const)
      if (values[f] !== undefined && values[f]! <= 0) errors.push(`row ${row}: ${JOINT_LABEL[f]} (${show(values[f])}) must be > 0`);
    if (values.mass !== undefined && values.mass < 0) errors.push(`row ${row}: link mass (${show(values.mass)} kg) must be ≥ 0`);
    return { row, cells, joint: errors.length ? undefined : joint, errors };
  });
  return { columns, header, delimiter, rows, problem };
}
