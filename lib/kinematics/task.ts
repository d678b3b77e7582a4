/**
 * The task rows of the three constraint modes, in one place for inverse kinematics, path speed
 * and dexterity (so the three cannot drift apart).
 *
 * A task is what a target or path sample constrains of the tool (frames as in types.ts: world
 * frame, rows vx vy vz wx wy wz of the geometric Jacobian at the tool point):
 * - `pose`: all six rows, J_task = J (6×n);
 * - `axis`: the tool point and the direction of the tool z axis; the spin about that axis is free.
 *   A rotation ω changes the z axis by ω × z, which is zero exactly for ω along z, so the
 *   constrained rotations are the components along the tool's current x and y axes:
 *   J_task = [J_v; xᵀ·J_ω; yᵀ·J_ω] (5×n);
 * - `point`: the tool point only, J_task = J_v (3×n).
 * The task velocity of a twist (v, ω) is the same projection: (v, xᵀω, yᵀω) for `axis`.
 * Units: rows 0–2 m/s per joint unit (m/rad or m/m), rows 3–5 rad/s per joint unit; never mixed
 * in one norm by these functions.
 */
import type { IkMode } from "./types";

/** Number of task rows of a mode: pose 6, axis 5, point 3. */
export function taskRowCount(mode: IkMode): 3 | 5 | 6 {
  return mode === "pose" ? 6 : mode === "axis" ? 5 : 3;
}

/**
 * Writes the task Jacobian (taskRowCount(mode) × n, row-major) of `mode` into `out` from the 6×n
 * geometric Jacobian `jac` (rows vx vy vz wx wy wz, world frame) and the tool pose `toolPose`
 * (row-major 4×4; only its x and y axes are read, and only in `axis` mode). Rows 3–5 of `jac` may
 * be any 3×n rotational block: the dexterity passes the rotations that keep the tool point still.
 * `out` needs at least taskRowCount(mode)·n entries and must not alias `jac`. Does not allocate;
 * returns the row count.
 */
export function taskJacobianInto(mode: IkMode, jac: ArrayLike<number>, n: number, toolPose: ArrayLike<number>, out: Float64Array): number {
  const m = taskRowCount(mode);
  if (mode === "pose") {
    for (let k = 0; k < 6 * n; k++) out[k] = jac[k];
    return m;
  }
  for (let k = 0; k < 3 * n; k++) out[k] = jac[k];
  if (mode === "axis") {
    const xx = toolPose[0], xy = toolPose[4], xz = toolPose[8], yx = toolPose[1], yy = toolPose[5], yz = toolPose[9];
    for (let j = 0; j < n; j++) {
      const wx = jac[3 * n + j], wy = jac[4 * n + j], wz = jac[5 * n + j];
      out[3 * n + j] = xx * wx + xy * wy + xz * wz;
      out[4 * n + j] = yx * wx + yy * wy + yz * wz;
    }
  }
  return m;
}

/**
 * Writes the task velocity of the twist (v, ω) (`twist`: 6 numbers, world frame, m/s and rad/s)
 * into `out` (taskRowCount(mode) numbers): v for `point`, (v, xᵀω, yᵀω) for `axis` with the tool's
 * x and y axes from `toolPose`, (v, ω) for `pose`. Does not allocate; returns the row count.
 */
export function taskVelocityInto(mode: IkMode, twist: ArrayLike<number>, toolPose: ArrayLike<number>, out: Float64Array | number[]): number {
  const m = taskRowCount(mode);
  out[0] = twist[0]; out[1] = twist[1]; out[2] = twist[2];
  if (mode === "pose") {
    out[3] = twist[3]; out[4] = twist[4]; out[5] = twist[5];
  } else if (mode === "axis") {
    out[3] = toolPose[0] * twist[3] + toolPose[4] * twist[4] + toolPose[8] * twist[5];
    out[4] = toolPose[1] * twist[3] + toolPose[5] * twist[4] + toolPose[9] * twist[5];
  }
  return m;
}
