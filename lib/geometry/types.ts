/**
 * Types of the geometry library: convex primitives, their placement, and distance answers.
 *
 * ## Units and frames
 * - SI units: every length is in metres.
 * - A shape is given in some frame F (the cell frame for obstacles, a link's frame for a link's
 *   capsules, the tool-point or TCP frame for tool and payload shapes). Placing a shape with a
 *   pose T_W_F (row-major 4×4) expresses it in W. Distance queries take two shapes expressed in
 *   the same frame and answer in that frame.
 * - 4×4 poses are row-major (16 numbers, `T[4*r + c]`), as in the interchange files.
 *
 * ## The shapes (the same fields as the requirement-set and arm files)
 * - sphere: `center`, `radius`.
 * - capsule: the points within `radius` of the segment `from` → `to` (a sphere when from = to).
 * - box: centred at the origin of `pose`, edges along its x, y, z axes, full side lengths `size`.
 * - cylinder: centred at the origin of `pose`, axis along its z, `radius`, full `length`.
 */

type Vec3 = readonly [number, number, number] | number[];

interface SphereShape {
  shape: "sphere";
  name?: string;
  /** Centre (m). */
  center: Vec3;
  /** Radius (m, ≥ 0). */
  radius: number;
}

interface CapsuleShape {
  shape: "capsule";
  name?: string;
  /** Segment start and end (m). */
  from: Vec3;
  to: Vec3;
  /** Radius (m, ≥ 0). */
  radius: number;
}

interface BoxShape {
  shape: "box";
  name?: string;
  /** Centre and orientation: row-major 4×4 rigid transform (edges along its axes). */
  pose: readonly number[] | Float64Array;
  /** Full side lengths along the pose's x, y, z (m, > 0). */
  size: Vec3;
}

interface CylinderShape {
  shape: "cylinder";
  name?: string;
  /** Centre and orientation: row-major 4×4 rigid transform; the axis is the pose's z. */
  pose: readonly number[] | Float64Array;
  /** Radius (m, > 0). */
  radius: number;
  /** Full length along the axis (m, > 0). */
  length: number;
}

/** A convex primitive in one frame. */
export type Shape = SphereShape | CapsuleShape | BoxShape | CylinderShape;

/**
 * The answer of a distance query between shapes A and B (all in the frame of the query).
 *
 * - Apart: `distance` > 0 is the separation (the smallest distance between a point of A and a
 *   point of B), `depth` = 0, `pointA`/`pointB` are the closest points on A and B, and `normal`
 *   is the unit vector from `pointA` to `pointB`.
 * - Touching or overlapping: `distance` = 0 and `depth` ≥ 0 is the penetration depth (the length
 *   of the shortest translation of B that separates the two); moving B by `depth · normal`
 *   separates them, and `pointA − pointB = depth · normal` (pointA is A's deepest point into B).
 */
export interface DistanceResult {
  distance: number;
  depth: number;
  pointA: Float64Array;
  pointB: Float64Array;
  normal: Float64Array;
  /** How the answer was found: a closed form ("closed") or the GJK/EPA iteration ("gjk"). */
  method: "closed" | "gjk";
}

/** A new, zeroed {@link DistanceResult} (to be reused by the allocation-free queries). */
export function createDistanceResult(): DistanceResult {
  return { distance: 0, depth: 0, pointA: new Float64Array(3), pointB: new Float64Array(3), normal: new Float64Array(3), method: "closed" };
}

