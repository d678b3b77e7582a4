/** Configuration-space helpers over the model's joint limits (Pinocchio's joint-configuration). */
import type { ArmModel } from "./types";
import type { Rng } from "./rng";

const TWO_PI = 2 * Math.PI;
/** Slack (rad or m) allowed when testing limits, against rounding after a 2π wrap. */
export const LIMIT_EPSILON = 1e-12;

/**
 * Neutral configuration: 0 for every joint whose limits include 0, the middle of the range
 * otherwise. Allocates the returned array.
 */
export function neutralConfiguration(model: ArmModel): Float64Array {
  const q = new Float64Array(model.n);
  for (let i = 0; i < model.n; i++) {
    q[i] = model.lower[i] <= 0 && model.upper[i] >= 0 ? 0 : 0.5 * (model.lower[i] + model.upper[i]);
  }
  return q;
}

/**
 * Uniformly random configuration within the limits, drawn from `rng` (one draw per joint, in
 * joint order). Writes `out` if given (no allocation), else allocates.
 */
export function randomConfiguration(model: ArmModel, rng: Rng, out?: Float64Array): Float64Array {
  const q = out ?? new Float64Array(model.n);
  for (let i = 0; i < model.n; i++) q[i] = model.lower[i] + rng() * (model.upper[i] - model.lower[i]);
  return q;
}

/**
 * Writes q into `out` with each revolute joint moved by a multiple of 2π into its limits where
 * possible (the same physical pose); prismatic joints and joints that cannot be wrapped in are
 * copied unchanged. Returns true when every joint of `out` is within its limits. `out` may be `q`.
 */
export function wrapToLimits(model: ArmModel, q: ArrayLike<number>, out: Float64Array): boolean {
  let ok = true;
  for (let i = 0; i < model.n; i++) {
    let v = q[i];
    const lo = model.lower[i], hi = model.upper[i];
    if (model.prismatic[i] === 0 && (v < lo - LIMIT_EPSILON || v > hi + LIMIT_EPSILON)) {
      const w = lo + (((v - lo) % TWO_PI) + TWO_PI) % TWO_PI;
      if (w <= hi + LIMIT_EPSILON) v = w;
      else if (w - TWO_PI >= lo - LIMIT_EPSILON) v = w - TWO_PI;
    }
    out[i] = v;
    if (v < lo - LIMIT_EPSILON || v > hi + LIMIT_EPSILON) ok = false;
  }
  return ok;
}

/** True when every joint of q is within [lower, upper] (slack `LIMIT_EPSILON`). */
export function withinLimits(model: ArmModel, q: ArrayLike<number>): boolean {
  for (let i = 0; i < model.n; i++) {
    if (!(q[i] >= model.lower[i] - LIMIT_EPSILON && q[i] <= model.upper[i] + LIMIT_EPSILON)) return false;
  }
  return true;
}

/**
 * Projects joint i's value onto its limits: a revolute value is first wrapped by 2π into the
 * range if it fits, else moved to the nearer limit on the circle; a prismatic value is clamped.
 */
export function projectJoint(model: ArmModel, i: number, v: number): number {
  const lo = model.lower[i], hi = model.upper[i];
  if (v >= lo && v <= hi) return v;
  if (model.prismatic[i] === 1) return v < lo ? lo : hi;
  const w = lo + (((v - lo) % TWO_PI) + TWO_PI) % TWO_PI; // in [lo, lo + 2π)
  if (w <= hi) return w;
  // In the gap (hi, lo + 2π): go to the nearer end.
  return w - hi <= lo + TWO_PI - w ? hi : lo;
}

/**
 * Difference between two configurations joint by joint, revolute joints modulo 2π (result in
 * (−π, π]); returns the largest absolute difference (rad or m).
 */
export function maxJointDistance(model: ArmModel, a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < model.n; i++) {
    let d = a[i] - b[i];
    if (model.prismatic[i] === 0) {
      d = ((d % TWO_PI) + TWO_PI) % TWO_PI;
      if (d > Math.PI) d -= TWO_PI;
    }
    const ad = Math.abs(d);
    if (ad > m) m = ad;
  }
  return m;
}
