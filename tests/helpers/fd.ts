/**
 * Central finite-difference Jacobian of forward kinematics (as KDL's solver tests and Pinocchio's
 * finite-difference unit tests do): linear rows from (p(q+h) − p(q−h))/2h, angular rows from the
 * rotation vector of R(q+h)·R(q−h)ᵀ divided by 2h. Truncation error O(h²).
 */
import { createData, forwardKinematics, type ArmModel } from "@/lib/kinematics";

function rotVec(a: Float64Array, b: Float64Array): [number, number, number] {
  // small-angle rotation vector of Ra·Rbᵀ (vee of its skew part; exact to O(θ³))
  const r = (i: number, j: number) => a[4 * i] * b[4 * j] + a[4 * i + 1] * b[4 * j + 1] + a[4 * i + 2] * b[4 * j + 2];
  return [0.5 * (r(2, 1) - r(1, 2)), 0.5 * (r(0, 2) - r(2, 0)), 0.5 * (r(1, 0) - r(0, 1))];
}

/**
 * FD Jacobian (6×n row-major) of a point given by `point(frames, toolPose)` (world coordinates)
 * with the orientation of `frameOf(frames, toolPose)`; default: the tool point and tool frame.
 */
export function fdJacobian(
  model: ArmModel,
  q: ArrayLike<number>,
  h = 1e-6,
  pick: (frames: Float64Array, tool: Float64Array) => Float64Array = (_f, t) => t,
  point?: (pose: Float64Array) => [number, number, number],
): Float64Array {
  const n = model.n;
  const data = createData(model);
  const out = new Float64Array(6 * n);
  const qq = Float64Array.from(q);
  const at = (v: number, j: number) => {
    qq[j] = v;
    forwardKinematics(model, data, qq);
    const pose = Float64Array.from(pick(data.frames, data.toolPose));
    const p = point ? point(pose) : ([pose[3], pose[7], pose[11]] as [number, number, number]);
    return { pose, p };
  };
  for (let j = 0; j < n; j++) {
    const q0 = q[j];
    const plus = at(q0 + h, j);
    const minus = at(q0 - h, j);
    qq[j] = q0;
    for (let r = 0; r < 3; r++) out[r * n + j] = (plus.p[r] - minus.p[r]) / (2 * h);
    const w = rotVec(plus.pose, minus.pose);
    for (let r = 0; r < 3; r++) out[(3 + r) * n + j] = w[r] / (2 * h);
  }
  return out;
}

/** Largest absolute entry difference of two arrays. */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return Math.max(m, a.length === b.length ? 0 : Infinity);
}
