/**
 * An independent forward kinematics and pose-error measure for tests, written here from the
 * textbook formulas with plain nested arrays and no product code, so a test can judge the
 * product's inverse kinematics without using the product's own forward kinematics or error
 * functions.
 *
 * - Standard DH (Denavit & Hartenberg 1955; Spong, Hutchinson & Vidyasagar, "Robot Modeling and
 *   Control", ch. 3): link i = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ).
 * - Modified DH (Craig, "Introduction to Robotics", 3rd ed., ch. 3): link i =
 *   Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ).
 * - q adds to θ (revolute) or d (prismatic); tool point = base · link₁ ⋯ linkₙ · tool
 *   (docs/formats.md#arm-file).
 * - Rotation error: the angle of R_aᵀ·R_b from its trace, θ = acos((tr − 1)/2), evaluated as
 *   atan2(‖axial vector‖, (tr − 1)/2) for accuracy near 0 and π (common practice).
 */

type M4 = number[][];

interface DhJoint {
  type: "revolute" | "prismatic";
  a: number;
  alpha: number;
  d: number;
  theta: number;
}

export interface DhArmLike {
  convention: "dh" | "mdh";
  joints: readonly DhJoint[];
  base?: readonly number[];
  tool?: readonly number[];
}

const identity = (): M4 => [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]];

function matmul(a: M4, b: M4): M4 {
  const c: M4 = [[0, 0, 0, 0], [0, 0, 0, 0], [0, 0, 0, 0], [0, 0, 0, 0]];
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) for (let k = 0; k < 4; k++) c[i][j] += a[i][k] * b[k][j];
  return c;
}

const fromRowMajor = (m: readonly number[]): M4 => [m.slice(0, 4), m.slice(4, 8), m.slice(8, 12), m.slice(12, 16)];
const rz = (t: number): M4 => [[Math.cos(t), -Math.sin(t), 0, 0], [Math.sin(t), Math.cos(t), 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]];
const rx = (t: number): M4 => [[1, 0, 0, 0], [0, Math.cos(t), -Math.sin(t), 0], [0, Math.sin(t), Math.cos(t), 0], [0, 0, 0, 1]];
const tz = (d: number): M4 => [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, d], [0, 0, 0, 1]];
const tx = (a: number): M4 => [[1, 0, 0, a], [0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]];

/** Tool-point pose (row-major 16 numbers) of a dh/mdh arm at q, from the formulas above. */
export function referenceToolPose(arm: DhArmLike, q: ArrayLike<number>): number[] {
  let t = arm.base ? fromRowMajor(arm.base) : identity();
  arm.joints.forEach((j, i) => {
    const theta = j.theta + (j.type === "revolute" ? q[i] : 0);
    const d = j.d + (j.type === "prismatic" ? q[i] : 0);
    const link = arm.convention === "dh"
      ? matmul(matmul(matmul(rz(theta), tz(d)), tx(j.a)), rx(j.alpha))
      : matmul(matmul(matmul(rx(j.alpha), tx(j.a)), rz(theta)), tz(d));
    t = matmul(t, link);
  });
  if (arm.tool) t = matmul(t, fromRowMajor(arm.tool));
  return t.flat();
}

/** Distance between the positions of two row-major poses (m). */
export function referencePositionError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return Math.hypot(a[3] - b[3], a[7] - b[7], a[11] - b[11]);
}

/** Angle of the relative rotation of two row-major poses (rad), in [0, π]. */
export function referenceRotationError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  // R = R_aᵀ R_b
  const r = (i: number, j: number) => a[i] * b[j] + a[4 + i] * b[4 + j] + a[8 + i] * b[8 + j];
  const trace = r(0, 0) + r(1, 1) + r(2, 2);
  const sx = r(2, 1) - r(1, 2), sy = r(0, 2) - r(2, 0), sz = r(1, 0) - r(0, 1);
  return Math.atan2(0.5 * Math.hypot(sx, sy, sz), 0.5 * (trace - 1));
}

/** Angle between the z axes (third columns) of two row-major poses (rad). */
export function referenceAxisError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const dot = a[2] * b[2] + a[6] * b[6] + a[10] * b[10];
  const cx = a[6] * b[10] - a[10] * b[6], cy = a[10] * b[2] - a[2] * b[10], cz = a[2] * b[6] - a[6] * b[2];
  return Math.atan2(Math.hypot(cx, cy, cz), dot);
}

/** True when every q lies within [min, max] of its joint (tolerance 1e-12). */
export function referenceWithinLimits(joints: readonly { min: number; max: number }[], q: ArrayLike<number>): boolean {
  return joints.every((j, i) => q[i] >= j.min - 1e-12 && q[i] <= j.max + 1e-12);
}
