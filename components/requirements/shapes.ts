/**
 * Form rows for shapes (cell obstacles, tool and payload shapes) and their conversion to and from
 * the file form (SI). Every shape is entered the same way: a centre x y z (mm), an orientation as
 * roll pitch yaw (°) and up to three sizes (mm):
 * - box: full sides along its x, y, z;
 * - sphere: radius (no orientation);
 * - cylinder: radius and full length along its z;
 * - capsule: radius and the length of its axis segment along its z (the file keeps the segment's
 *   ends `from` and `to`: centre ∓ length/2 along z).
 * A row loaded from a file and not edited goes back exactly as loaded.
 */
import type { BodyShape, FieldError, Obstacle, ObstacleShape } from "@/shared/schemas";
import { degToRad, mmToM, mToMm, radToDeg } from "@/shared/units";
import { matrixPose, parseNum, poseMatrix, rowKey, show } from "../pose";

const SHAPE_TEXT_KEYS = ["x", "y", "z", "roll", "pitch", "yaw", "s1", "s2", "s3"] as const;
export type ShapeTextKey = (typeof SHAPE_TEXT_KEYS)[number];

export interface ShapeRow {
  key: string;
  name: string;
  shape: ObstacleShape;
  x: string; y: string; z: string;
  roll: string; pitch: string; yaw: string;
  s1: string; s2: string; s3: string;
  /** As loaded: the texts shown then and the shape they came from. */
  orig?: { texts: string; value: Obstacle | BodyShape };
}

/** What the size cells mean for a shape (null: not used). */
export const SIZE_LABELS: Record<ObstacleShape, [string, string | null, string | null]> = {
  box: ["x side", "y side", "z side"],
  sphere: ["radius", null, null],
  cylinder: ["radius", "length", null],
  capsule: ["radius", "length", null],
};

const textsOf = (r: ShapeRow) => JSON.stringify([r.name.trim(), r.shape, ...SHAPE_TEXT_KEYS.map((k) => r[k].trim())]);

export function newShapeRow(shape: ObstacleShape, name: string): ShapeRow {
  const sizes: Record<ObstacleShape, [string, string, string]> = { box: ["200", "200", "200"], sphere: ["100", "", ""], cylinder: ["100", "300", ""], capsule: ["50", "200", ""] };
  const [s1, s2, s3] = sizes[shape];
  return { key: rowKey(), name, shape, x: "0", y: "0", z: "0", roll: "0", pitch: "0", yaw: "0", s1, s2, s3 };
}

/** Changes a row's shape, keeping the centre and orientation and filling sizes that have no value. */
export function withShape(row: ShapeRow, shape: ObstacleShape): ShapeRow {
  const fresh = newShapeRow(shape, row.name);
  const used = SIZE_LABELS[shape];
  return {
    ...row, shape,
    s1: row.s1.trim() ? row.s1 : fresh.s1,
    s2: used[1] ? (row.s2.trim() ? row.s2 : fresh.s2) : "",
    s3: used[2] ? (row.s3.trim() ? row.s3 : fresh.s3) : "",
  };
}

/** The row of a shape from a file. */
export function shapeRowFromDoc(value: Obstacle | BodyShape): ShapeRow {
  const mm = (v: number) => show(mToMm(v));
  const deg = (v: number) => show(radToDeg(v));
  let row: ShapeRow;
  const base = { key: rowKey(), name: value.name ?? "" };
  if (value.shape === "sphere") {
    row = { ...base, shape: "sphere", x: mm(value.center[0]), y: mm(value.center[1]), z: mm(value.center[2]), roll: "", pitch: "", yaw: "", s1: mm(value.radius), s2: "", s3: "" };
  } else if (value.shape === "capsule") {
    const d = [value.to[0] - value.from[0], value.to[1] - value.from[1], value.to[2] - value.from[2]];
    const len = Math.hypot(d[0], d[1], d[2]);
    // the z axis along from → to: yaw about z, then pitch about y (roll is free)
    const yaw = len > 0 ? Math.atan2(d[1], d[0]) : 0, pitch = len > 0 ? Math.atan2(Math.hypot(d[0], d[1]), d[2]) : 0;
    const c = [0, 1, 2].map((i) => 0.5 * (value.from[i] + value.to[i]));
    row = { ...base, shape: "capsule", x: mm(c[0]), y: mm(c[1]), z: mm(c[2]), roll: "0", pitch: deg(pitch), yaw: deg(Math.abs(pitch) < 1e-12 ? 0 : yaw), s1: mm(value.radius), s2: mm(len), s3: "" };
  } else {
    const { p, rpy } = matrixPose(value.pose);
    const sizes = value.shape === "box" ? value.size.map(mm) : [mm(value.radius), mm(value.length), ""];
    row = { ...base, shape: value.shape, x: mm(p[0]), y: mm(p[1]), z: mm(p[2]), roll: deg(rpy[0]), pitch: deg(rpy[1]), yaw: deg(rpy[2]), s1: sizes[0], s2: sizes[1], s3: sizes[2] };
  }
  row.orig = { texts: textsOf(row), value };
  return row;
}

/** Document paths whose errors belong to a cell of row i under `prefix` (e.g. "cell.obstacles"). */
export function shapeCellPaths(prefix: string, i: number, row: ShapeRow, key: ShapeTextKey | "name" | "shape"): string[] {
  const p = `${prefix}.${i}`;
  const axis = { x: 0, y: 1, z: 2 } as Record<string, number>;
  switch (key) {
    case "name": return [`${p}.name`];
    case "shape": return [`${p}.shape`, p];
    case "x": case "y": case "z": {
      const a = axis[key];
      return [`${p}.${key}`, `${p}.center.${a}`, `${p}.from.${a}`, `${p}.to.${a}`, ...(a === 0 ? [`${p}.pose`, `${p}.center`, `${p}.from`, `${p}.to`] : [])];
    }
    case "roll": return [`${p}.roll`, `${p}.pose`];
    case "pitch": case "yaw": return [`${p}.${key}`];
    case "s1": return row.shape === "box" ? [`${p}.size.0`, `${p}.size`] : [`${p}.radius`];
    case "s2": return row.shape === "box" ? [`${p}.size.1`] : [`${p}.length`];
    default: return [`${p}.size.2`];
  }
}

/**
 * The shape of a row in the file form. Entries that are not numbers, or missing, are reported in
 * `errors` at the paths {@link shapeCellPaths} looks up; `what` names the row in messages.
 */
export function shapeRowToDoc(row: ShapeRow, path: string, what: string, errors: FieldError[], opts: { named: boolean }): Obstacle | BodyShape {
  if (row.orig && row.orig.texts === textsOf(row)) return row.orig.value;
  const num = (key: ShapeTextKey, label: string, conv: (v: number) => number, required: boolean, at: string = `${path}.${key}`): number => {
    const v = parseNum(row[key]);
    if (v === "bad") { errors.push({ path: at, message: `${what} ${label} '${row[key].trim()}' is not a number` }); return 0; }
    if (v === undefined) {
      if (required) errors.push({ path: at, message: `${what} ${label} is required` });
      return 0;
    }
    return conv(v);
  };
  const c: [number, number, number] = [num("x", "x", mmToM, true), num("y", "y", mmToM, true), num("z", "z", mmToM, true)];
  // an obstacle always has a name (an empty one is reported by the schema); a tool shape may have none
  const name = row.name.trim();
  const named = name || opts.named ? { name } : {};
  if (row.shape === "sphere") return { ...named, shape: "sphere", center: c, radius: num("s1", "radius", mmToM, true, `${path}.radius`) } as Obstacle;
  const rpy: [number, number, number] = [num("roll", "roll", degToRad, false), num("pitch", "pitch", degToRad, false), num("yaw", "yaw", degToRad, false)];
  const pose = poseMatrix(c, rpy);
  if (row.shape === "box") {
    const size: [number, number, number] = [num("s1", "x side", mmToM, true, `${path}.size.0`), num("s2", "y side", mmToM, true, `${path}.size.1`), num("s3", "z side", mmToM, true, `${path}.size.2`)];
    return { ...named, shape: "box", pose, size } as BodyShape;
  }
  const radius = num("s1", "radius", mmToM, true, `${path}.radius`);
  const length = num("s2", "length", mmToM, true, `${path}.length`);
  if (row.shape === "cylinder") return { ...named, shape: "cylinder", pose, radius, length } as Obstacle;
  if (length < 0) errors.push({ path: `${path}.length`, message: `${what} length must be ≥ 0` });
  const h = length / 2;
  const zx = pose[2], zy = pose[6], zz = pose[10];
  const from: [number, number, number] = [c[0] - h * zx, c[1] - h * zy, c[2] - h * zz];
  const to: [number, number, number] = [c[0] + h * zx, c[1] + h * zy, c[2] + h * zz];
  return { ...named, shape: "capsule", from, to, radius } as BodyShape;
}
