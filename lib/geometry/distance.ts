/**
 * Distance between two convex primitives: the dispatcher over the closed forms (closest.ts)
 * and GJK/EPA (gjk.ts), on packed shapes (allocation-free) or on plain {@link Shape}s.
 *
 * | A \ B    | sphere  | capsule | box     | cylinder |
 * |----------|---------|---------|---------|----------|
 * | sphere   | closed  | closed  | closed  | closed   |
 * | capsule  |         | closed  | closed  | GJK      |
 * | box      |         |         | GJK     | GJK      |
 * | cylinder |         |         |         | GJK      |
 *
 * Spheres and capsules enter GJK as their core (centre, segment) with the radius added
 * afterwards, so the iteration only sees polytopes, segments and cylinders.
 */
import * as closest from "./closest";
import * as gjk from "./gjk";
import { packShape } from "./packed";
import { createDistanceResult, type DistanceResult, type Shape } from "./types";
// Layout constants of packed.ts, repeated as local constants so the hot code reads literals
// (an imported binding is a property load on every use).
const KIND_BOX = 2;
const KIND_CAPSULE = 1;
const KIND_CYLINDER = 3;
const KIND_SPHERE = 0;
const O_RADIUS = 1;
const STRIDE = 24;
/** Same as closest.ts CORE_TOUCH. */
const CORE_TOUCH = 1e-15;
// The functions as local bindings: an imported binding is a property load on every use.
const { capsuleBox, capsuleCapsule, finishFromCores, sphereCylinder } = closest;
const { epaCore, gjkCore, gjkOut } = gjk;

/** Swaps A and B in a result (points exchanged, normal reversed). */
function swapResult(out: DistanceResult): void {
  for (let c = 0; c < 3; c++) {
    const t = out.pointA[c];
    out.pointA[c] = out.pointB[c];
    out.pointB[c] = t;
    out.normal[c] = -out.normal[c];
  }
}

/**
 * Distance between the packed shapes A[ao] and B[bo] (same frame). Writes `out` (see
 * {@link DistanceResult}) and returns the separation (0 when touching or overlapping).
 * Allocates nothing.
 */
export function distancePacked(A: Float64Array, ao: number, B: Float64Array, bo: number, out: DistanceResult): number {
  const ka = A[ao], kb = B[bo];
  if (ka > kb) {
    distancePacked(B, bo, A, ao, out);
    swapResult(out);
    return out.distance;
  }
  if (kb <= KIND_CAPSULE) return capsuleCapsule(A, ao, B, bo, out);
  if (kb === KIND_BOX && ka <= KIND_CAPSULE) return capsuleBox(A, ao, B, bo, out);
  if (kb === KIND_CYLINDER && ka === KIND_SPHERE) return sphereCylinder(A, ao, B, bo, out);
  return gjkPacked(A, ao, B, bo, out);
}

/**
 * The same query by GJK/EPA for any pair (the closed forms are checked against it in the tests).
 */
export function gjkPacked(A: Float64Array, ao: number, B: Float64Array, bo: number, out: DistanceResult): number {
  out.method = "gjk";
  const rA = A[ao] <= KIND_CAPSULE ? A[ao + O_RADIUS] : 0;
  const rB = B[bo] <= KIND_CAPSULE ? B[bo + O_RADIUS] : 0;
  gjkCore(A, ao, B, bo);
  if (!gjkOut.intersect && gjkOut.distance > CORE_TOUCH) {
    const p = gjkOut.pa, q = gjkOut.pb;
    return finishFromCores(p[0], p[1], p[2], q[0], q[1], q[2], gjkOut.distance, rA, rB, out);
  }
  epaCore(A, ao, B, bo);
  const n = gjkOut.normal, depth = gjkOut.depth + rA + rB;
  for (let c = 0; c < 3; c++) {
    out.normal[c] = n[c];
    out.pointA[c] = gjkOut.pa[c] + rA * n[c];
    out.pointB[c] = out.pointA[c] - depth * n[c];
  }
  out.distance = 0;
  out.depth = depth;
  return 0;
}

const scratchA = new Float64Array(STRIDE), scratchB = new Float64Array(STRIDE);

/**
 * Distance between two plain shapes given in the same frame (allocates the result; for tests,
 * the command line and drawing).
 */
export function shapeDistance(a: Shape, b: Shape, out: DistanceResult = createDistanceResult()): DistanceResult {
  packShape(a, scratchA, 0);
  packShape(b, scratchB, 0);
  distancePacked(scratchA, 0, scratchB, 0, out);
  return out;
}
