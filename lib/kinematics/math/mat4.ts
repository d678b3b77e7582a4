/**
 * Row-major 4×4 homogeneous transforms (`T[4*r + c]`), gl-matrix style: `op(out, a, b)` returns
 * `out` and is correct when `out` is also an input. Only `mat4Identity`-style constructors that say
 * so allocate.
 */
import { writeRpyPose } from "@/shared/pose";
import type { Mat4 } from "../types";

/**
 * out = a · b for rigid transforms (last rows assumed 0 0 0 1). Offsets allow working inside a
 * packed array of frames. Alias-safe (reads all inputs into locals first).
 */
export function mat4MulRigid(
  out: Float64Array,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  outOffset = 0,
  aOffset = 0,
  bOffset = 0,
): Float64Array {
  const a00 = a[aOffset], a01 = a[aOffset + 1], a02 = a[aOffset + 2], a03 = a[aOffset + 3];
  const a10 = a[aOffset + 4], a11 = a[aOffset + 5], a12 = a[aOffset + 6], a13 = a[aOffset + 7];
  const a20 = a[aOffset + 8], a21 = a[aOffset + 9], a22 = a[aOffset + 10], a23 = a[aOffset + 11];
  const b00 = b[bOffset], b01 = b[bOffset + 1], b02 = b[bOffset + 2], b03 = b[bOffset + 3];
  const b10 = b[bOffset + 4], b11 = b[bOffset + 5], b12 = b[bOffset + 6], b13 = b[bOffset + 7];
  const b20 = b[bOffset + 8], b21 = b[bOffset + 9], b22 = b[bOffset + 10], b23 = b[bOffset + 11];
  const o = outOffset;
  out[o] = a00 * b00 + a01 * b10 + a02 * b20;
  out[o + 1] = a00 * b01 + a01 * b11 + a02 * b21;
  out[o + 2] = a00 * b02 + a01 * b12 + a02 * b22;
  out[o + 3] = a00 * b03 + a01 * b13 + a02 * b23 + a03;
  out[o + 4] = a10 * b00 + a11 * b10 + a12 * b20;
  out[o + 5] = a10 * b01 + a11 * b11 + a12 * b21;
  out[o + 6] = a10 * b02 + a11 * b12 + a12 * b22;
  out[o + 7] = a10 * b03 + a11 * b13 + a12 * b23 + a13;
  out[o + 8] = a20 * b00 + a21 * b10 + a22 * b20;
  out[o + 9] = a20 * b01 + a21 * b11 + a22 * b21;
  out[o + 10] = a20 * b02 + a21 * b12 + a22 * b22;
  out[o + 11] = a20 * b03 + a21 * b13 + a22 * b23 + a23;
  out[o + 12] = 0;
  out[o + 13] = 0;
  out[o + 14] = 0;
  out[o + 15] = 1;
  return out;
}

/** out = a⁻¹ for a rigid transform (Rᵀ, −Rᵀp). Alias-safe. */
export function mat4InvertRigid(out: Mat4, a: ArrayLike<number>): Mat4 {
  const r00 = a[0], r01 = a[1], r02 = a[2], px = a[3];
  const r10 = a[4], r11 = a[5], r12 = a[6], py = a[7];
  const r20 = a[8], r21 = a[9], r22 = a[10], pz = a[11];
  out[0] = r00; out[1] = r10; out[2] = r20; out[3] = -(r00 * px + r10 * py + r20 * pz);
  out[4] = r01; out[5] = r11; out[6] = r21; out[7] = -(r01 * px + r11 * py + r21 * pz);
  out[8] = r02; out[9] = r12; out[10] = r22; out[11] = -(r02 * px + r12 * py + r22 * pz);
  out[12] = 0; out[13] = 0; out[14] = 0; out[15] = 1;
  return out;
}

/**
 * Rotation vector (axis·angle, angle in [0, π]) of R = Ra · Rbᵀ, written to out[outOffset..+2];
 * Ra and Rb are the rotation blocks of the row-major transforms `a` and `b`. Returns the angle.
 * Robust near 0 and near π. Does not allocate.
 */
export function rotationErrorVector(out: Float64Array, a: ArrayLike<number>, b: ArrayLike<number>, outOffset = 0): number {
  // R = Ra·Rbᵀ: R[r][c] = Σ_k Ra[r][k] Rb[c][k]
  const r00 = a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
  const r01 = a[0] * b[4] + a[1] * b[5] + a[2] * b[6];
  const r02 = a[0] * b[8] + a[1] * b[9] + a[2] * b[10];
  const r10 = a[4] * b[0] + a[5] * b[1] + a[6] * b[2];
  const r11 = a[4] * b[4] + a[5] * b[5] + a[6] * b[6];
  const r12 = a[4] * b[8] + a[5] * b[9] + a[6] * b[10];
  const r20 = a[8] * b[0] + a[9] * b[1] + a[10] * b[2];
  const r21 = a[8] * b[4] + a[9] * b[5] + a[10] * b[6];
  const r22 = a[8] * b[8] + a[9] * b[9] + a[10] * b[10];
  const wx = 0.5 * (r21 - r12);
  const wy = 0.5 * (r02 - r20);
  const wz = 0.5 * (r10 - r01);
  const s = Math.sqrt(wx * wx + wy * wy + wz * wz);
  const c = 0.5 * (r00 + r11 + r22 - 1);
  const angle = Math.atan2(s, c);
  if (s > 1e-7 || c > 0) {
    // Near 0 (c ≈ 1): angle/s → 1. Otherwise the usual log map.
    const k = s > 1e-12 ? angle / s : 1;
    out[outOffset] = wx * k;
    out[outOffset + 1] = wy * k;
    out[outOffset + 2] = wz * k;
    return angle;
  }
  // Near π: R ≈ 2uuᵀ − I, so u_i² = (R_ii + 1)/2; signs from the off-diagonal terms.
  let ux = Math.sqrt(Math.max(0, 0.5 * (r00 + 1)));
  let uy = Math.sqrt(Math.max(0, 0.5 * (r11 + 1)));
  let uz = Math.sqrt(Math.max(0, 0.5 * (r22 + 1)));
  if (ux >= uy && ux >= uz) {
    uy = r01 + r10 < 0 ? -uy : uy;
    uz = r02 + r20 < 0 ? -uz : uz;
  } else if (uy >= uz) {
    ux = r01 + r10 < 0 ? -ux : ux;
    uz = r12 + r21 < 0 ? -uz : uz;
  } else {
    ux = r02 + r20 < 0 ? -ux : ux;
    uy = r12 + r21 < 0 ? -uy : uy;
  }
  const norm = Math.sqrt(ux * ux + uy * uy + uz * uz) || 1;
  out[outOffset] = (ux / norm) * angle;
  out[outOffset + 1] = (uy / norm) * angle;
  out[outOffset + 2] = (uz / norm) * angle;
  return angle;
}

const angleScratch = new Float64Array(3);

/** Rotation angle (rad, [0, π]) between the rotation blocks of two row-major transforms. */
export function rotationAngleBetween(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return rotationErrorVector(angleScratch, a, b);
}

/** Translation distance (m) between two row-major transforms. */
export function positionDistance(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const dx = a[3] - b[3], dy = a[7] - b[7], dz = a[11] - b[11];
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/**
 * Row-major transform from a position and roll-pitch-yaw about fixed axes
 * (R = Rz(yaw)·Ry(pitch)·Rx(roll), as in the requirement sets). Writes `out`.
 */
export function mat4FromPositionRpy(out: Mat4, position: ArrayLike<number>, rpy: ArrayLike<number>): Mat4 {
  return writeRpyPose(out, position, rpy);
}
