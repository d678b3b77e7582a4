import { z } from "zod";
import { finite, mat4 } from "./common";
import type { Mounting } from "./arm";

/**
 * The mounting region of a requirement set (docs/formats.md#mounting): where the arm's base frame
 * may be placed in the cell frame, for the placement search (docs/design.md#mount-placement).
 *
 * The base pose of a placement (x, y, z, yaw) is T_C_B = Trans(x, y, z) · Rz(yaw) · O, with O the
 * rotation `orientation` (identity = floor mount, base z up): the mount orientation comes first,
 * then the yaw about the cell's z axis, then the position. SI units: m, rad.
 */

/** A closed interval [lo, hi] (m or rad). */
const range = z.tuple([finite, finite], { error: "must be [lo, hi], two numbers" });

/** Most fixed pedestal heights listed. */
export const MAX_PEDESTAL_HEIGHTS = 20;

/** How far beyond what the cell holds a mounting region may reach (m); see {@link cellExtent}. */
export const CELL_MARGIN = 5;

/** Largest orientation tilt (rad) still called a floor mount, and likewise for ceiling and wall: 1°. */
export const MOUNT_CLASS_TOLERANCE = Math.PI / 180;

const mountingObject = z.object({
  region: z.object({
    /** Base origin x in the cell frame (m). */
    x: range,
    /** Base origin y in the cell frame (m). */
    y: range,
    /** Base origin z in the cell frame (m); may be left out when `heights` is given. */
    z: range.optional(),
    /** Yaw about the cell z axis after the orientation (rad), at most one full turn. */
    yaw: range,
  }),
  /** The base's rotation before the yaw (row-major 4×4 with zero translation); identity = floor. */
  orientation: mat4,
  /** Fixed pedestal heights (m): z takes only these values instead of a continuous range. */
  heights: z.array(finite).min(1, "list at least one height, or leave the field out").max(MAX_PEDESTAL_HEIGHTS, `at most ${MAX_PEDESTAL_HEIGHTS} heights`).optional(),
});

/** The mounting region with its own checks (the cell extent is checked by the requirement set). */
export const mountingSchema = mountingObject.superRefine((m, ctx) => {
  const bad = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
  for (const axis of ["x", "y", "z", "yaw"] as const) {
    const r = m.region[axis];
    if (!r) continue;
    const unit = axis === "yaw" ? (v: number) => `${(v * 180 / Math.PI).toFixed(1)}°` : (v: number) => `${(v * 1000).toFixed(1)} mm`;
    if (r[0] > r[1]) bad(["region", axis], `lo (${unit(r[0])}) is above hi (${unit(r[1])})`);
  }
  const yaw = m.region.yaw;
  if (yaw[1] - yaw[0] > 2 * Math.PI + 1e-9) bad(["region", "yaw"], `spans ${((yaw[1] - yaw[0]) * 180 / Math.PI).toFixed(1)}°, more than one full turn (360°)`);
  if (!m.region.z && !m.heights) bad(["region", "z"], "give a z range or a list of pedestal heights");
  if (m.region.z && m.heights) {
    const [lo, hi] = m.region.z;
    m.heights.forEach((h, i) => {
      if (h < lo - 1e-12 || h > hi + 1e-12) bad(["heights", i], `height ${(h * 1000).toFixed(1)} mm lies outside region.z (${(lo * 1000).toFixed(1)} … ${(hi * 1000).toFixed(1)} mm)`);
    });
  }
  const o = m.orientation;
  const t = Math.hypot(o[3], o[7], o[11]);
  if (t > 1e-9) bad(["orientation"], `gives the rotation only: its translation must be 0, got ${(t * 1000).toFixed(3)} mm (the position comes from the region)`);
});
export type MountingSpec = z.infer<typeof mountingSchema>;

/**
 * The z values searched: the pedestal heights (sorted, repeats dropped) or null for the
 * continuous range region.z.
 */
export function pedestalHeights(m: MountingSpec): number[] | null {
  if (!m.heights) return null;
  return [...new Set(m.heights)].sort((a, b) => a - b);
}

/** The z range covered: region.z, or the span of the heights. */
export function zRange(m: MountingSpec): [number, number] {
  if (m.region.z) return [m.region.z[0], m.region.z[1]];
  const h = pedestalHeights(m)!;
  return [h[0], h[h.length - 1]];
}

/**
 * The base pose T_C_B = Trans(x, y, z) · Rz(yaw) · O of a placement (row-major 4×4, plain array).
 */
export function placementPose(orientation: ArrayLike<number>, x: number, y: number, z: number, yaw: number): number[] {
  const c = Math.cos(yaw), s = Math.sin(yaw), o = orientation;
  const out = new Array<number>(16).fill(0);
  for (let col = 0; col < 3; col++) {
    out[col] = c * o[col] - s * o[4 + col];
    out[4 + col] = s * o[col] + c * o[4 + col];
    out[8 + col] = o[8 + col];
  }
  out[3] = x; out[7] = y; out[11] = z; out[15] = 1;
  return out;
}

/**
 * The angle (rad) between the base's z axis and the cell's z axis for a mount orientation
 * (the yaw about the cell z axis does not change it): 0 floor, π ceiling, π/2 wall.
 */
export function mountTilt(orientation: ArrayLike<number>): number {
  return Math.acos(Math.max(-1, Math.min(1, orientation[10])));
}

/**
 * The datasheet class of a mount orientation, by its tilt: floor (≤ 1°), ceiling (≥ 179°), wall
 * (90° ± 1°), angled (any other tilt). The 1° band is our own choice (common practice, no source).
 */
export function mountingClass(orientation: ArrayLike<number>): Mounting {
  const tilt = mountTilt(orientation);
  if (tilt <= MOUNT_CLASS_TOLERANCE) return "floor";
  if (tilt >= Math.PI - MOUNT_CLASS_TOLERANCE) return "ceiling";
  if (Math.abs(tilt - Math.PI / 2) <= MOUNT_CLASS_TOLERANCE) return "wall";
  return "angled";
}

/**
 * Whether an arm's datasheet mountings allow a mount class: listed, or "angled" listed for a wall
 * or an angled mount (an arm rated for any angle may stand at 90°). Unknown (null) when the
 * datasheet lists no mountings.
 */
export function mountingAllowed(listed: readonly Mounting[] | undefined, cls: Mounting): boolean | null {
  if (!listed || listed.length === 0) return null;
  if (listed.includes(cls)) return true;
  return (cls === "wall" || cls === "angled") && listed.includes("angled");
}

/** Editor presets of the mount orientation (rotation before the yaw), row-major 4×4. */
export const MOUNT_PRESETS: Readonly<Record<Exclude<Mounting, "angled">, readonly number[]>> = {
  /** base z up. */
  floor: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
  /** base z down: a half turn about the cell x axis. */
  ceiling: [1, 0, 0, 0, 0, -1, 0, 0, 0, 0, -1, 0, 0, 0, 0, 1],
  /** base z along the cell's +x (a wall behind the arm at lower x): a quarter turn about the cell y axis. */
  wall: [0, 0, 1, 0, 0, 1, 0, 0, -1, 0, 0, 0, 0, 0, 0, 1],
};

/** An axis-aligned box in the cell frame (m). */
export interface CellExtent {
  lo: [number, number, number];
  hi: [number, number, number];
}

/** What the requirement set places in the cell, as the extent check needs it. */
interface CellContents {
  base: readonly number[];
  targets: readonly { position: readonly number[] }[];
  paths: readonly { waypoints: readonly { position: readonly number[] }[] }[];
  obstacles: readonly (
    | { shape: "box"; pose: readonly number[]; size: readonly number[] }
    | { shape: "sphere"; center: readonly number[]; radius: number }
    | { shape: "cylinder"; pose: readonly number[]; radius: number; length: number }
    | { shape: "capsule"; from: readonly number[]; to: readonly number[]; radius: number }
  )[];
}

/**
 * The cell's extent: the file format gives a cell no walls, so the cell is taken to be the
 * axis-aligned box around everything the set places in it (the nominal base, the targets, the
 * path waypoints and the obstacles, each by a sphere around it), grown by {@link CELL_MARGIN} on
 * every side. A mounting region must lie inside it.
 */
export function cellExtent(c: CellContents): CellExtent {
  const lo: [number, number, number] = [Infinity, Infinity, Infinity], hi: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  const add = (p: readonly number[], r = 0) => {
    for (let k = 0; k < 3; k++) { lo[k] = Math.min(lo[k], p[k] - r); hi[k] = Math.max(hi[k], p[k] + r); }
  };
  add([c.base[3], c.base[7], c.base[11]]);
  c.targets.forEach((t) => add(t.position));
  c.paths.forEach((p) => p.waypoints.forEach((w) => add(w.position)));
  for (const o of c.obstacles) {
    switch (o.shape) {
      case "box": add([o.pose[3], o.pose[7], o.pose[11]], Math.hypot(o.size[0], o.size[1], o.size[2]) / 2); break;
      case "sphere": add(o.center, o.radius); break;
      case "cylinder": add([o.pose[3], o.pose[7], o.pose[11]], Math.hypot(o.radius, o.length / 2)); break;
      case "capsule": add(o.from, o.radius); add(o.to, o.radius); break;
    }
  }
  for (let k = 0; k < 3; k++) { lo[k] -= CELL_MARGIN; hi[k] += CELL_MARGIN; }
  return { lo, hi };
}

/** Field problems of a region against the cell's extent: [path within the mounting, message] pairs. */
export function regionOutsideCell(m: MountingSpec, extent: CellExtent): [string[], string][] {
  const out: [string[], string][] = [];
  const hasZ = m.region.z !== undefined || (m.heights !== undefined && m.heights.length > 0);
  const axes = [["x", m.region.x], ["y", m.region.y], ["z", hasZ ? zRange(m) : null]] as const;
  axes.forEach(([axis, r], k) => {
    if (r === null) return;
    if (r[0] < extent.lo[k] - 1e-9 || r[1] > extent.hi[k] + 1e-9) {
      const f = (v: number) => `${(v * 1000).toFixed(0)} mm`;
      const path = axis === "z" && !m.region.z ? ["heights"] : ["region", axis];
      out.push([path, `${axis === "z" && !m.region.z ? "heights span " : ""}[${f(r[0])}, ${f(r[1])}] lies outside the cell, which spans ${axis} ${f(extent.lo[k])} … ${f(extent.hi[k])} (what the set places in it: nominal base, targets, paths, obstacles, and ${CELL_MARGIN} m around them)`]);
    }
  });
  return out;
}
