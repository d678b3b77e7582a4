/**
 * Row-major 4×4 rigid transforms, roll-pitch-yaw and quaternions for the analysis (allocating,
 * not a hot path). Conventions as in the requirement sets: R = Rz(yaw)·Ry(pitch)·Rx(roll).
 */
import { mat4InvertRigid, mat4MulRigid } from "@/lib/kinematics";
import { writeRpyPose } from "@/shared/pose";

/** a·b for row-major rigid 4×4 transforms (new array). */
export function mul4(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  return mat4MulRigid(new Float64Array(16), a, b);
}

/** Inverse of a rigid transform [R p; 0 1] → [Rᵀ −Rᵀp; 0 1] (new array). */
export function invertRigid(t: ArrayLike<number>): Float64Array {
  return mat4InvertRigid(new Float64Array(16), t);
}

/** Rotation block of a 4×4 as a row-major 3×3. */
export function rotationOf(t: ArrayLike<number>): Float64Array {
  return Float64Array.from([t[0], t[1], t[2], t[4], t[5], t[6], t[8], t[9], t[10]]);
}

/** 4×4 from position and roll-pitch-yaw about fixed axes (R = Rz(y)·Ry(p)·Rx(r)). */
export function poseFromRpy(position: ArrayLike<number>, rpy: ArrayLike<number>): Float64Array {
  return writeRpyPose(new Float64Array(16), position, rpy);
}

/** Unit quaternion (w, x, y, z) of the rotation block of a 4×4 (Shepperd's method). */
export function quaternionOf(t: ArrayLike<number>): [number, number, number, number] {
  const m00 = t[0], m01 = t[1], m02 = t[2], m10 = t[4], m11 = t[5], m12 = t[6], m20 = t[8], m21 = t[9], m22 = t[10];
  const tr = m00 + m11 + m22;
  let w: number, x: number, y: number, z: number;
  if (tr > 0) {
    const s = 2 * Math.sqrt(tr + 1);
    w = s / 4; x = (m21 - m12) / s; y = (m02 - m20) / s; z = (m10 - m01) / s;
  } else if (m00 > m11 && m00 > m22) {
    const s = 2 * Math.sqrt(1 + m00 - m11 - m22);
    w = (m21 - m12) / s; x = s / 4; y = (m01 + m10) / s; z = (m02 + m20) / s;
  } else if (m11 > m22) {
    const s = 2 * Math.sqrt(1 + m11 - m00 - m22);
    w = (m02 - m20) / s; x = (m01 + m10) / s; y = s / 4; z = (m12 + m21) / s;
  } else {
    const s = 2 * Math.sqrt(1 + m22 - m00 - m11);
    w = (m10 - m01) / s; x = (m02 + m20) / s; y = (m12 + m21) / s; z = s / 4;
  }
  const nrm = Math.hypot(w, x, y, z);
  return [w / nrm, x / nrm, y / nrm, z / nrm];
}

/**
 * Spherical linear interpolation between unit quaternions along the shorter arc (Shoemake,
 * "Animating rotation with quaternion curves", SIGGRAPH 1985), t ∈ [0, 1].
 */
export function slerp(a: readonly number[], b: readonly number[], t: number): [number, number, number, number] {
  let dot = a[0] * b[0] + a[1] * b[1] + a[2] * b[2] + a[3] * b[3];
  let bb = b;
  if (dot < 0) { bb = [-b[0], -b[1], -b[2], -b[3]]; dot = -dot; }
  if (dot > 0.9999995) {
    const r = [0, 1, 2, 3].map((i) => a[i] + t * (bb[i] - a[i]));
    const nrm = Math.hypot(r[0], r[1], r[2], r[3]);
    return [r[0] / nrm, r[1] / nrm, r[2] / nrm, r[3] / nrm];
  }
  const theta = Math.acos(dot), s = Math.sin(theta);
  const fa = Math.sin((1 - t) * theta) / s, fb = Math.sin(t * theta) / s;
  return [fa * a[0] + fb * bb[0], fa * a[1] + fb * bb[1], fa * a[2] + fb * bb[2], fa * a[3] + fb * bb[3]];
}

/** Rotation angle (rad, [0, π]) and unit axis (world) taking orientation a to b: R_b = Rot(axis, angle)·R_a. */
export function relativeRotation(a: readonly number[], b: readonly number[]): { angle: number; axis: [number, number, number] } {
  // q_rel = q_b · conj(q_a)
  const [aw, ax, ay, az] = a, [bw, bx, by, bz] = b;
  let w = bw * aw + bx * ax + by * ay + bz * az;
  let x = -bw * ax + bx * aw - by * az + bz * ay;
  let y = -bw * ay + by * aw - bz * ax + bx * az;
  let z = -bw * az + bz * aw - bx * ay + by * ax;
  if (w < 0) { w = -w; x = -x; y = -y; z = -z; }
  const sn = Math.hypot(x, y, z);
  const angle = 2 * Math.atan2(sn, w);
  if (sn < 1e-15) return { angle: 0, axis: [0, 0, 1] };
  return { angle, axis: [x / sn, y / sn, z / sn] };
}

/** 4×4 from a position and a unit quaternion (w, x, y, z). */
export function poseFromQuaternion(p: ArrayLike<number>, q: readonly number[]): Float64Array {
  const [w, x, y, z] = q;
  return Float64Array.from([
    1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w), p[0],
    2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w), p[1],
    2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y), p[2],
    0, 0, 0, 1,
  ]);
}

export const IDENTITY_4: readonly number[] = Object.freeze([1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
