/**
 * General joint chains: the rigid-transform helpers of the `chain` convention (origin xyz + rpy,
 * URDF semantics) and the one-way conversion of a DH table (`dh` or `mdh`) into an equivalent
 * chain with the same forward kinematics.
 *
 * Conversion (common practice; the regrouping follows Craig, "Introduction to Robotics", §3.4):
 * - `mdh`: link i = Rx(α₍ᵢ₋₁₎)·Tx(a₍ᵢ₋₁₎)·Rz(θᵢ)·Tz(dᵢ) · Rz(qᵢ) (or · Tz(qᵢ)), because Rz and Tz
 *   commute. So chain joint i has origin Oᵢ = Rx(α)·Tx(a)·Rz(θ)·Tz(d), axis z, and every link frame
 *   is the same frame as in the table: `com`, collision shapes and `tool` are unchanged.
 * - `dh`: link i = Rz(θᵢ + qᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ) = Rz(qᵢ)·Kᵢ with Kᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ)
 *   (Tz(dᵢ + qᵢ) = Tz(qᵢ)·Tz(dᵢ) for a prismatic joint). The joint moves about z of the frame
 *   *before* it, so the chain's link frame i is Cᵢ = Fᵢ₋₁·Rz(qᵢ), the DH frame i−1 turned by the
 *   joint, and Fᵢ = Cᵢ·Kᵢ. Hence origin O₁ = identity, Oᵢ = Kᵢ₋₁, the arm's tool becomes Kₙ·tool,
 *   and a point p given in DH frame i (com, collision capsule ends) becomes Kᵢ·p in link frame i.
 *
 * Both keep `base`, the joint types, limits, speeds, torques and masses.
 */
import type { ChainJointSpec, DhArmKinematics, JointOrigin, JointSpec } from "@/shared/schemas/arm";
import { writeRpyPose } from "@/shared/pose";
import { mat4MulRigid } from "./math/mat4";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

/** Row-major rigid product a·b (plain arrays, allocates). */
export function mulRigid(a: ArrayLike<number>, b: ArrayLike<number>): number[] {
  return Array.from(mat4MulRigid(new Float64Array(16), a, b));
}

/** Applies the rigid transform m to the point p (allocates). */
export function transformPointRigid(m: ArrayLike<number>, p: ArrayLike<number>): [number, number, number] {
  return [
    m[0] * p[0] + m[1] * p[1] + m[2] * p[2] + m[3],
    m[4] * p[0] + m[5] * p[1] + m[6] * p[2] + m[7],
    m[8] * p[0] + m[9] * p[1] + m[10] * p[2] + m[11],
  ];
}

/** T(origin) = Trans(xyz)·Rz(yaw)·Ry(pitch)·Rx(roll), row-major 4×4 (allocates). */
export function originMatrix(origin: JointOrigin): number[] {
  return writeRpyPose(new Array<number>(16).fill(0), origin.xyz, origin.rpy);
}

function rotationMismatch(m: ArrayLike<number>, rpy: readonly number[]): number {
  const r = writeRpyPose(new Array<number>(16).fill(0), [0, 0, 0], rpy);
  let e = 0;
  for (const k of [0, 1, 2, 4, 5, 6, 8, 9, 10]) e = Math.max(e, Math.abs(r[k] - m[k]));
  return e;
}

/**
 * The origin {xyz, rpy} of a rigid transform (the inverse of `originMatrix`). Near pitch ±90°
 * the general formula loses digits, so both it and the pitch-±90° form are tried and the one
 * that rebuilds the rotation more closely is kept (rebuilt to about 1e-16).
 */
export function originFromMatrix(m: ArrayLike<number>): JointOrigin {
  const cp = Math.hypot(m[0], m[4]);
  const pitch = Math.atan2(-m[8], cp);
  const general: [number, number, number] = [Math.atan2(m[9], m[10]), pitch, Math.atan2(m[4], m[0])];
  // Gimbal form: roll 0, yaw from the first two entries of the second column.
  const gimbal: [number, number, number] = [0, pitch, Math.atan2(-m[1], m[5])];
  const rpy = cp > 1e-6 || rotationMismatch(m, general) <= rotationMismatch(m, gimbal) ? general : gimbal;
  return { xyz: [m[3], m[7], m[11]], rpy: rpy.map((v) => (Object.is(v, -0) ? 0 : v)) as [number, number, number] };
}

/** Rz(θ)·Tz(d)·Tx(a)·Rx(α), row-major. */
function dhLink(a: number, alpha: number, d: number, theta: number): number[] {
  const ct = Math.cos(theta), st = Math.sin(theta), ca = Math.cos(alpha), sa = Math.sin(alpha);
  return [ct, -st * ca, st * sa, a * ct, st, ct * ca, -ct * sa, a * st, 0, sa, ca, d, 0, 0, 0, 1];
}

/** Rx(α)·Tx(a)·Rz(θ)·Tz(d), row-major. */
function mdhLink(a: number, alpha: number, d: number, theta: number): number[] {
  const ct = Math.cos(theta), st = Math.sin(theta), ca = Math.cos(alpha), sa = Math.sin(alpha);
  return [ct, -st, 0, a, st * ca, ct * ca, -sa, -sa * d, st * sa, ct * sa, ca, ca * d, 0, 0, 0, 1];
}

type Capsule = { from: [number, number, number]; to: [number, number, number]; radius: number };

/** Joint fields other than the DH parameters, with points re-expressed by `m` (link frame change). */
function carryOver(j: JointSpec, m: number[] | null): Omit<ChainJointSpec, "type" | "origin" | "axis" | "min" | "max"> {
  const { a: _a, alpha: _al, d: _d, theta: _t, type: _ty, min: _mi, max: _ma, ...rest } = j as JointSpec & { collision?: Capsule[] };
  void _a; void _al; void _d; void _t; void _ty; void _mi; void _ma;
  const out: Record<string, unknown> = { ...rest };
  if (m && j.com) out.com = transformPointRigid(m, j.com);
  const collision = (j as { collision?: unknown }).collision;
  if (m && Array.isArray(collision)) {
    out.collision = collision.map((c: Capsule) => ({ ...c, from: transformPointRigid(m, c.from), to: transformPointRigid(m, c.to) }));
  }
  return out;
}

/**
 * The chain equivalent of a DH arm (see the file comment): same forward kinematics (to rounding,
 * about 1e-15 m), same Jacobians, link frames as described, every other field of the arm kept.
 */
export function dhToChain<A extends DhArmKinematics>(arm: A): Omit<A, "convention" | "joints"> & { convention: "chain"; joints: ChainJointSpec[] } {
  const n = arm.joints.length;
  const joints: ChainJointSpec[] = [];
  let tool = arm.tool ? Array.from(arm.tool) : undefined;
  if (arm.convention === "mdh") {
    for (const j of arm.joints) {
      joints.push({ type: j.type, origin: originFromMatrix(mdhLink(j.a, j.alpha, j.d, j.theta)), axis: [0, 0, 1], min: j.min, max: j.max, ...carryOver(j, null) });
    }
  } else {
    const K = arm.joints.map((j) => dhLink(j.a, j.alpha, j.d, j.theta));
    arm.joints.forEach((j, i) => {
      const origin = i === 0 ? { xyz: [0, 0, 0] as [number, number, number], rpy: [0, 0, 0] as [number, number, number] } : originFromMatrix(K[i - 1]);
      joints.push({ type: j.type, origin, axis: [0, 0, 1], min: j.min, max: j.max, ...carryOver(j, K[i]) });
    });
    tool = mulRigid(K[n - 1], tool ?? I4);
  }
  const { convention: _c, joints: _j, ...rest } = arm;
  void _c; void _j;
  const out = { ...rest, convention: "chain" as const, joints } as Omit<A, "convention" | "joints"> & { convention: "chain"; joints: ChainJointSpec[]; tool?: number[] };
  if (tool) out.tool = tool;
  return out;
}
