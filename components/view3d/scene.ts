/**
 * What the 3-D view draws, as plain data (no three.js, no React): the arm's stick figure, joint
 * axes and frames from the kinematics library's forward kinematics, targets, paths, obstacles and
 * the force ellipsoid at the payload point. The engine (engine.ts) turns this into meshes; tests
 * check this module against the library directly.
 *
 * What is drawn and why: docs/design.md#3-d-view.
 *
 * Frames and units: everything is in the view's world frame in metres, poses row-major 4×4 as in
 * the files. On the shortlist page and in the requirement-set editor the world is the cell frame;
 * in the arm editor it is the arm's own base frame (the frame the arm file's `base` is given in).
 */
import { createData, createModel, forwardKinematics, jointAxisWorld, neutralConfiguration, type ArmData, type ArmKinematics, type ArmModel } from "@/lib/kinematics";
import type { Verdict } from "@/lib/analysis/types";
import type { LinkGeometry } from "@/lib/geometry/arm";
import type { ArmCapsule } from "@/shared/schemas/cell";
import { fixed, significant } from "@/shared/format";

export type Vec3 = [number, number, number];
/** Row-major 4×4 (16 numbers). */
export type Pose = number[];

const IDENTITY: readonly number[] = Object.freeze([1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);

export const originOf = (t: ArrayLike<number>, o = 0): Vec3 => [t[o + 3], t[o + 7], t[o + 11]];
/** Column c (0 = x, 1 = y, 2 = z axis) of the rotation block of the pose stored at offset o. */
export const axisOf = (t: ArrayLike<number>, c: 0 | 1 | 2, o = 0): Vec3 => [t[o + c], t[o + 4 + c], t[o + 8 + c]];
const add = (a: Vec3, b: Vec3, s = 1): Vec3 => [a[0] + s * b[0], a[1] + s * b[1], a[2] + s * b[2]];
const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const norm = (a: readonly number[]): number => Math.hypot(a[0], a[1], a[2]);
const slice16 = (t: ArrayLike<number>, o = 0): Pose => Array.from({ length: 16 }, (_, i) => t[o + i]);

/** One joint of the figure: where its axis is, which way it points, and the frame shown for it. */
interface JointMark {
  /** 1-based joint number. */
  number: number;
  type: "revolute" | "prismatic";
  /** A point on the joint axis (m) and the axis direction (unit), world frame. */
  origin: Vec3;
  axis: Vec3;
  /**
   * The frame the joint's axis is fixed in (row-major 4×4): for `dh` and `mdh` arms the frame
   * whose z axis is the joint axis; for `chain` arms the link frame after the joint.
   */
  frame: Pose;
}

/** A capsule of link geometry in the world frame (m). */
interface CapsuleMark {
  /** 0 = base, i = link i. */
  link: number;
  from: Vec3;
  to: Vec3;
  radius: number;
}

/** The arm at one configuration, ready to draw. */
export interface ArmFigure {
  /** Stick figure from the mounting point through every joint to the tool point (m). */
  segments: [Vec3, Vec3][];
  /** The body each segment belongs to: 0 = base (mount to frame 0), k = link k (the last link runs to the tool point). */
  segmentLinks: number[];
  /** Link capsules where the arm gives a collision radius (or geometry); empty otherwise. */
  capsules: CapsuleMark[];
  joints: JointMark[];
  /** Where the arm is bolted (its base frame), frame 0 of the chain, the flange and the tool point. */
  mount: Pose;
  frame0: Pose;
  flange: Pose;
  tool: Pose;
  /** A length scale of the arm (m), for marker sizes. */
  size: number;
}

/** Everything needed to pose one arm: the compiled model, its workspace and where it is mounted. */
export interface ArmRig {
  model: ArmModel;
  data: ArmData;
  mount: Pose;
  /** Link collision geometry (lib/geometry `linkGeometry`), and the base's capsules in the mount frame. */
  links: LinkGeometry[] | null;
  baseCapsules: ArmCapsule[];
}

/**
 * Compiles an arm for drawing (the same createModel the analysis uses); throws RangeError on a
 * bad arm. With `geometry` the capsules drawn are the geometry library's; without it, a capsule
 * along each stick segment of a link that has a collision radius.
 */
export function createRig(kin: ArmKinematics, mount: readonly number[] = IDENTITY, geometry?: { links: LinkGeometry[]; base?: ArmCapsule[] }): ArmRig {
  const model = createModel(kin);
  return { model, data: createData(model), mount: mount.slice(), links: geometry?.links ?? null, baseCapsules: geometry?.base ?? [] };
}

/** A point fixed in frame `k` of the posed chain (frames 0…n), in the world. */
const inFrame = (f: ArrayLike<number>, k: number, p: ArrayLike<number>): Vec3 => {
  const o = 16 * k;
  return [
    f[o] * p[0] + f[o + 1] * p[1] + f[o + 2] * p[2] + f[o + 3],
    f[o + 4] * p[0] + f[o + 5] * p[1] + f[o + 6] * p[2] + f[o + 7],
    f[o + 8] * p[0] + f[o + 9] * p[1] + f[o + 10] * p[2] + f[o + 11],
  ];
};

/** The home configuration: q = 0 where the limits allow it, else mid-range (the library's neutral configuration). */
export function homeConfiguration(rig: ArmRig): number[] {
  return Array.from(neutralConfiguration(rig.model));
}

/**
 * Poses the arm at q with the kinematics library's forward kinematics and returns the figure.
 *
 * The stick figure follows the table: for `dh` (link i = Rz(θ)·Tz(d)·Tx(a)·Rx(α)) it runs from
 * frame i−1 along its z axis by d to the point m = oᵢ − aᵢ·xᵢ, then along xᵢ by a to frame i; for
 * `mdh` (link i = Rx(α)·Tx(a)·Rz(θ)·Tz(d)) from frame i−1 along xᵢ₋₁ by a, then along zᵢ by d. So
 * a sign or an offset error in the table shows as a link that points the wrong way. `chain` arms
 * (origin and axis per joint) are drawn straight from each link frame's origin to the next. The
 * joint axes come from the model's per-joint frames (`jointAxisWorld`): z of frame i−1 (`dh`) or
 * frame i (`mdh`), the joint's own axis in link frame i (`chain`).
 */
export function poseArm(rig: ArmRig, q: ArrayLike<number>): ArmFigure {
  const { model, data } = rig;
  forwardKinematics(model, data, q);
  const f = data.frames;
  const n = model.n;
  const segments: [Vec3, Vec3][] = [];
  const segmentLinks: number[] = [];
  const capsules: CapsuleMark[] = [];
  const joints: JointMark[] = [];
  const axisBuf = new Float64Array(6);
  const mountOrigin = originOf(rig.mount);
  const o0 = originOf(f, 0);
  if (norm(sub(o0, mountOrigin)) > 1e-9) {
    segments.push([mountOrigin, o0]);
    segmentLinks.push(0);
  }
  for (let i = 1; i <= n; i++) {
    const prev = originOf(f, 16 * (i - 1));
    const cur = originOf(f, 16 * i);
    const mid = model.convention === "dh"
      ? add(cur, axisOf(f, 0, 16 * i), -model.a[i - 1])
      : model.convention === "mdh"
        ? add(prev, axisOf(f, 0, 16 * (i - 1)), model.a[i - 1])
        : prev;
    const pieces: [Vec3, Vec3][] = [];
    if (norm(sub(mid, prev)) > 1e-9) pieces.push([prev, mid]);
    if (norm(sub(cur, mid)) > 1e-9) pieces.push([mid, cur]);
    for (const piece of pieces) {
      segments.push(piece);
      segmentLinks.push(i);
    }
    const r = model.radius[i - 1];
    if (!rig.links && r > 0) for (const [a, b] of pieces) capsules.push({ link: i, from: a, to: b, radius: r });
    const k = i - 1 + model.axisFrameOffset;
    jointAxisWorld(model, data, i, axisBuf);
    joints.push({ number: i, type: model.types[i - 1], origin: [axisBuf[3], axisBuf[4], axisBuf[5]], axis: [axisBuf[0], axisBuf[1], axisBuf[2]], frame: slice16(f, 16 * k) });
  }
  for (const g of rig.links ?? []) {
    for (const c of g.attached) capsules.push({ link: g.link, from: inFrame(f, c.from.frame, c.from.point), to: inFrame(f, c.to.frame, c.to.point), radius: c.radius });
  }
  for (const c of rig.baseCapsules) capsules.push({ link: 0, from: inFrame(rig.mount, 0, c.from), to: inFrame(rig.mount, 0, c.to), radius: c.radius });
  const flange = slice16(data.flange);
  const tool = slice16(data.toolPose);
  if (norm(sub(originOf(tool), originOf(flange))) > 1e-9) {
    segments.push([originOf(flange), originOf(tool)]);
    segmentLinks.push(n);
  }
  let size = 0;
  for (const [a, b] of segments) size += norm(sub(b, a));
  return { segments, segmentLinks, capsules, joints, mount: rig.mount.slice(), frame0: slice16(f, 0), flange, tool, size: size > 0 ? size : model.lengthScale };
}

/** A target as drawn: its frame, name and (on the shortlist page) its verdict. */
export interface TargetMark {
  name: string;
  pose: Pose;
  /** From the analysis: reached or not, with the task matrix's verdict. Absent in the editor. */
  status?: { reached: boolean; verdict: Verdict };
  selected?: boolean;
  /** false: no name label (the marker and its shape stay). */
  label?: boolean;
}

/** A path as drawn: the waypoint polyline and direction marks along it (m). */
export interface PathMark {
  name: string;
  points: Vec3[];
  /** Arrowheads: a point on the polyline and the unit direction of travel there. */
  marks: { at: Vec3; dir: Vec3 }[];
  selected?: boolean;
}

/** Direction marks about every `spacing` metres along the polyline (at least one per segment, at its middle when short). */
export function pathMarks(points: readonly Vec3[], spacing: number): PathMark["marks"] {
  const marks: PathMark["marks"] = [];
  for (let k = 0; k + 1 < points.length; k++) {
    const d = sub(points[k + 1], points[k]);
    const len = norm(d);
    if (len < 1e-9) continue;
    const dir: Vec3 = [d[0] / len, d[1] / len, d[2] / len];
    const count = Math.max(1, Math.min(20, Math.round(len / spacing)));
    for (let j = 0; j < count; j++) marks.push({ at: add(points[k], d, (j + 0.5) / count), dir });
  }
  return marks;
}

/** The point at arc length s (m) along a polyline (clamped to its ends). */
export function pointAtArcLength(points: readonly Vec3[], s: number): Vec3 {
  if (points.length === 0) return [0, 0, 0];
  let left = Math.max(0, s);
  for (let k = 0; k + 1 < points.length; k++) {
    const d = sub(points[k + 1], points[k]);
    const len = norm(d);
    if (left <= len && len > 0) return add(points[k], d, left / len);
    left -= len;
  }
  return points[points.length - 1].slice() as Vec3;
}

/** An obstacle as drawn (cell frame, m). */
export type ObstacleMark =
  | { name: string; shape: "box"; pose: Pose; size: Vec3 }
  | { name: string; shape: "sphere"; center: Vec3; radius: number }
  | { name: string; shape: "cylinder"; pose: Pose; radius: number; length: number }
  | { name: string; shape: "capsule"; from: Vec3; to: Vec3; radius: number };

/** A box given by its centre and side lengths (edges along the cell axes). */
export function boxAt(name: string, center: readonly number[], size: readonly number[]): ObstacleMark {
  return { name, shape: "box", pose: [1, 0, 0, center[0], 0, 1, 0, center[1], 0, 0, 1, center[2], 0, 0, 0, 1], size: [size[0], size[1], size[2]] };
}

/** Force ellipsoid and required force at the payload point, drawn to one stated scale. */
export interface ForceMark {
  /** The payload point (cell frame, m). */
  point: Vec3;
  /** Principal axes: unit direction and semi-axis (N), null where unbounded. */
  axes: { dir: Vec3; radius: number | null }[];
  /** True when the joints' torque limits weight the ellipsoid (radii in N); else N per unit torque. */
  weighted: boolean;
  /** Required force applied by the tool (N, cell frame), drawn from the TCP. */
  force: Vec3 | null;
  /** Where the force arrow starts (the TCP, m). */
  forceAt: Vec3 | null;
  /** Drawing scale: metres per newton, and the same as words. */
  metresPerNewton: number;
  scaleText: string;
}

/** 1, 2, 5 × 10^k at or above x. */
export function niceStep(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const e = Math.floor(Math.log10(x));
  const m = x / 10 ** e;
  const f = m <= 1 + 1e-9 ? 1 : m <= 2 + 1e-9 ? 2 : m <= 5 + 1e-9 ? 5 : 10;
  return f * 10 ** e;
}

const fmtN = (v: number) => (v >= 100 ? fixed(v, 0) : v >= 10 ? fixed(v, 1) : significant(v, 2));

/**
 * The drawing scale of the force marks: the largest finite semi-axis (or the required force, if
 * larger) is drawn about `length` metres long, rounded so that 1 mm stands for a round number of
 * newtons (1, 2 or 5 × 10^k N).
 */
export function forceScale(radii: readonly (number | null)[], force: readonly number[] | null, length: number): { metresPerNewton: number; scaleText: string } {
  const finite = radii.filter((r): r is number => r !== null && r > 0);
  const biggest = Math.max(0, ...finite, force ? norm(force) : 0);
  if (!(biggest > 0) || !(length > 0)) return { metresPerNewton: 0, scaleText: "no force to draw" };
  const newtonsPerMm = niceStep(biggest / (length * 1000));
  return { metresPerNewton: 1 / (newtonsPerMm * 1000), scaleText: `1 mm stands for ${fmtN(newtonsPerMm)} N` };
}

/** Grid spacing (m) for a scene of the given size: a round (1, 2, 5 × 10^k) step giving 5 to 12 squares across it. */
export function gridStep(size: number): number {
  return niceStep(Math.max(size, 1e-3) / 12);
}

/** Bounding box of a set of points (m); a unit box around the origin when there are none. */
export function bounds(points: readonly Vec3[]): { min: Vec3; max: Vec3; size: number; center: Vec3 } {
  if (points.length === 0) return { min: [-0.5, -0.5, 0], max: [0.5, 0.5, 0.5], size: 1, center: [0, 0, 0.25] };
  const min: Vec3 = [Infinity, Infinity, Infinity], max: Vec3 = [-Infinity, -Infinity, -Infinity];
  for (const p of points) for (let k = 0; k < 3; k++) { min[k] = Math.min(min[k], p[k]); max[k] = Math.max(max[k], p[k]); }
  const size = Math.max(norm(sub(max, min)), 0.05);
  return { min, max, size, center: [(min[0] + max[0]) / 2, (min[1] + max[1]) / 2, (min[2] + max[2]) / 2] };
}

/**
 * The closest pair of bodies (or the deepest overlap) at the configuration shown, as the
 * analysis' clearance check names them: "base", "link k", "tool", "payload" or an obstacle's name.
 */
export interface PairMark {
  a: string;
  b: string;
  /** Separation (m); 0 when the bodies touch or overlap. */
  distance: number;
  /** Overlap depth (m) when they collide, else null. */
  depth: number | null;
  /** Closest points (cell frame, m) when the analysis gives them. */
  pointA: Vec3 | null;
  pointB: Vec3 | null;
  /** The words shown beside it. */
  text: string;
}

/** What to draw over a pair's two bodies: the arm's rods and capsules of a named link, matching tool or payload shapes, an obstacle. */
export function pairBodies(pair: Pick<PairMark, "a" | "b">, arm: ArmFigure | null, obstacles: readonly ObstacleMark[], bodies: readonly ObstacleMark[]): { segments: [Vec3, Vec3][]; capsules: CapsuleMark[]; shapes: ObstacleMark[] } {
  const out = { segments: [] as [Vec3, Vec3][], capsules: [] as CapsuleMark[], shapes: [] as ObstacleMark[] };
  for (const name of [pair.a, pair.b]) {
    const m = /^link (\d+)$/.exec(name);
    const link = name === "base" ? 0 : m ? Number(m[1]) : null;
    if (link !== null && arm) {
      arm.segments.forEach((sg, i) => { if (arm.segmentLinks[i] === link) out.segments.push(sg); });
      out.capsules.push(...arm.capsules.filter((c) => c.link === link));
    } else if (name === "tool" || name === "payload") {
      out.shapes.push(...bodies.filter((b) => b.name === name || b.name.startsWith(`${name}:`) || b.name.startsWith(`${name} `)));
    } else {
      out.shapes.push(...obstacles.filter((o) => o.name === name));
    }
  }
  return out;
}

/** Everything in one view. Parts are compared by identity: keep unchanged parts the same object. */
export interface SceneContent {
  arm?: ArmFigure | null;
  /** Other IK branches, drawn faint. */
  ghosts?: ArmFigure[];
  /** The arm's placement in the cell (requirement-set editor: there is no arm yet). */
  mount?: Pose | null;
  targets?: TargetMark[];
  paths?: PathMark[];
  obstacles?: ObstacleMark[];
  /** Tool and payload shapes where the arm holds them (world frame), drawn apart from the cell. */
  bodies?: ObstacleMark[];
  force?: ForceMark | null;
  /** The closest pair of bodies (or the deepest overlap) at the configuration shown. */
  pair?: PairMark | null;
  /** The current path sample (m), with its words. */
  cursor?: { at: Vec3; text: string } | null;
  /** Label of the tool-point frame ("tool point", "TCP"). */
  toolLabel?: string;
  /** Label of the world frame drawn at the origin ("cell origin"); null draws none. */
  originLabel?: string | null;
  /** Height of the grid plane (m, world z); 0 when absent. */
  floorZ?: number;
}

/**
 * The points the camera frames: the arm, targets, paths and force marks; the obstacles only when
 * there is nothing else (a large cell around a small arm would otherwise shrink the arm).
 */
export function focusPoints(c: SceneContent): Vec3[] {
  const pts = contentPoints({ ...c, obstacles: [] });
  return pts.length > 0 ? pts : contentPoints(c);
}

/** Every point of the content (for the grid's extent). */
export function contentPoints(c: SceneContent): Vec3[] {
  const pts: Vec3[] = [];
  const fig = (a: ArmFigure) => {
    for (const [p, q] of a.segments) pts.push(p, q);
    pts.push(originOf(a.mount), originOf(a.tool));
  };
  if (c.arm) fig(c.arm);
  c.ghosts?.forEach(fig);
  if (c.mount) pts.push(originOf(c.mount));
  c.targets?.forEach((t) => pts.push(originOf(t.pose)));
  c.paths?.forEach((p) => pts.push(...p.points));
  for (const o of c.obstacles ?? []) {
    if (o.shape === "sphere") pts.push(add(o.center, [o.radius, o.radius, o.radius]), add(o.center, [-o.radius, -o.radius, -o.radius]));
    else if (o.shape === "capsule") pts.push(o.from, o.to);
    else {
      const c0 = originOf(o.pose);
      const r = o.shape === "box" ? norm(o.size) / 2 : Math.hypot(o.radius, o.length / 2);
      pts.push(add(c0, [r, r, r]), add(c0, [-r, -r, -r]));
    }
  }
  if (c.force) pts.push(c.force.point);
  return pts;
}
