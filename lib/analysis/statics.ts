/**
 * Statics at a configuration (SI: N, N·m, kg, m; cell frame = the model's world frame, gravity
 * along −z of it, g = 9.80665 m/s²).
 *
 * Relations (Craig, "Introduction to Robotics", 3rd ed., ch. 5; Spong, Hutchinson & Vidyasagar,
 * "Robot Modeling and Control", ch. 4): the joint torques that balance a wrench W applied by the
 * tool to the environment at a point are τ = Jᵀ W (J the geometric Jacobian at that point). The
 * torque that holds masses mᵢ at points cᵢ still is τ_hold = Σ J_cᵢᵀ (0, 0, mᵢ g) (docs/design.md#statics).
 */
import { STANDARD_GRAVITY } from "@/shared/units";
import { computeJacobian, computeLinkPointJacobian, type ArmData, type ArmModel } from "@/lib/kinematics";
import { svdRows } from "./linalg";

export { STANDARD_GRAVITY };

/** Result of the exact one-direction force (or wrench) capability test. */
export interface CapacityResult {
  /**
   * Largest scale s ≥ 0 of the wrench direction u such that |τ_hold,i + (Jᵀu)ᵢ·s| ≤ maxTorqueᵢ for
   * every joint with a limit. null when no joint with a limit resists u (unbounded in this rigid
   * model: the structure carries it) or when no joint has a limit at all (see `status`).
   */
  capacity: number | null;
  /**
   * `bounded`: capacity is a number; `overloaded`: τ_hold alone exceeds a limit (capacity 0);
   * `unbounded`: no limited joint feels u; `no-limits`: no joint has a maxTorque.
   */
  status: "bounded" | "overloaded" | "unbounded" | "no-limits";
  /** 1-based joint that binds (the argmin of the ratio test, or the most overloaded joint). */
  limitingJoint: number | null;
  /** Per joint: the bound it imposes on s (null where the joint has no limit or does not feel u). */
  perJoint: (number | null)[];
}

/**
 * Exact capability along one wrench direction under box torque limits after gravity: the linear
 * program max{s ≥ 0 : −T ≤ τ_hold + b·s ≤ T} with b = Jᵀu, solved in closed form by a ratio test
 * per joint (bᵢ > 0: s ≤ (Tᵢ − aᵢ)/bᵢ; bᵢ < 0: s ≤ (Tᵢ + aᵢ)/|bᵢ|; bᵢ = 0: no bound). When some
 * |τ_hold,i| already exceeds Tᵢ the answer is 0 with that joint binding. Joints whose limit is NaN
 * (absent) impose nothing. This is the exact answer, unlike the force ellipsoid's estimate.
 *
 * @param tauHold joint torques holding the arm and its loads (length n)
 * @param b       Jᵀu, joint torques per unit of s (length n)
 * @param maxTorque limits Tᵢ > 0, NaN where absent (length n)
 */
export function capacityAlong(tauHold: ArrayLike<number>, b: ArrayLike<number>, maxTorque: ArrayLike<number>): CapacityResult {
  const n = tauHold.length;
  const perJoint: (number | null)[] = new Array(n).fill(null);
  let anyLimit = false, worstOver = 1, overJoint: number | null = null;
  for (let i = 0; i < n; i++) {
    const t = maxTorque[i];
    if (!(t > 0)) continue;
    anyLimit = true;
    const ratio = Math.abs(tauHold[i]) / t;
    if (ratio > 1 + 1e-12 && ratio > worstOver) { worstOver = ratio; overJoint = i + 1; }
  }
  if (!anyLimit) return { capacity: null, status: "no-limits", limitingJoint: null, perJoint };
  if (overJoint !== null) {
    for (let i = 0; i < n; i++) if (maxTorque[i] > 0) perJoint[i] = Math.abs(tauHold[i]) > maxTorque[i] * (1 + 1e-12) ? 0 : null;
    return { capacity: 0, status: "overloaded", limitingJoint: overJoint, perJoint };
  }
  let best = Infinity, joint: number | null = null;
  for (let i = 0; i < n; i++) {
    const t = maxTorque[i];
    if (!(t > 0)) continue;
    const bi = b[i], a = tauHold[i];
    if (Math.abs(bi) <= 1e-12) continue;
    const s = Math.max(0, bi > 0 ? (t - a) / bi : (t + a) / -bi);
    perJoint[i] = s;
    if (s < best) { best = s; joint = i + 1; }
  }
  if (joint === null) return { capacity: null, status: "unbounded", limitingJoint: null, perJoint };
  return { capacity: best, status: "bounded", limitingJoint: joint, perJoint };
}

/** Jᵀu for a row-major 6×n (or rows×n) matrix and a vector u of `rows` entries. */
export function transposeTimes(jac: ArrayLike<number>, rows: number, n: number, u: ArrayLike<number>, rowStart = 0): Float64Array {
  const out = new Float64Array(n);
  for (let r = 0; r < rows; r++) {
    const ur = u[r];
    if (ur === 0) continue;
    const off = (rowStart + r) * n;
    for (let c = 0; c < n; c++) out[c] += jac[off + c] * ur;
  }
  return out;
}

/** The force ellipsoid of a point, weighted by the joint torque limits. */
export interface ForceEllipsoid {
  /**
   * True when torque limits weight the ellipsoid: {F : Fᵀ (J W⁻² Jᵀ) F ≤ 1} with W = diag(maxTorque)
   * (joints without a limit left out, as if unlimited), i.e. the image of the normalised torque
   * ball ‖W⁻¹τ‖ ≤ 1. False when no joint has a limit: then W = I and the radii are N per N·m of a
   * unit torque ball.
   */
  weighted: boolean;
  /** Principal directions (unit, cell frame), in the order of `radii`. */
  directions: number[][];
  /** Semi-axes 1/σᵢ of J W⁻¹ (N when weighted), ascending; null where σᵢ = 0 (unbounded axis). */
  radii: (number | null)[];
}

/**
 * Force ellipsoid at a point from its translational Jacobian block (rows 0–2 of `jac`, 3×n) and
 * torque limits (Yoshikawa 1985; Chiacchio, Bouffard-Vercelli & Pierrot 1997 for the weighting).
 * It inscribes the torque box by a ball, so it ignores gravity and under- or over-states what the
 * joints can do in a given direction; see {@link capacityAlong} for the exact answer.
 */
export function forceEllipsoid(jac: ArrayLike<number>, n: number, maxTorque: ArrayLike<number>): ForceEllipsoid {
  const scaled = scaledTranslational(jac, n, maxTorque);
  const svd = svdRows(scaled.matrix, 3, n, 0);
  const directions: number[][] = [], radii: (number | null)[] = [];
  for (let j = 0; j < 3; j++) {
    directions.push([svd.u[j], svd.u[3 + j], svd.u[6 + j]]);
    const s = svd.sigma[j];
    radii.push(s > 1e-12 ? 1 / s : null);
  }
  return { weighted: scaled.weighted, directions, radii };
}

/**
 * The ellipsoid's estimate of the wrench scale along u (rows × n Jacobian `jac`, u of `rows`
 * entries): 1/‖W⁻¹Jᵀu‖, the radius of {W : Wᵀ J W⁻² Jᵀ W ≤ 1} along u. Ignores gravity. null when
 * no limited joint feels u, or no joint has a limit.
 */
export function ellipsoidEstimateAlong(jac: ArrayLike<number>, rows: number, n: number, maxTorque: ArrayLike<number>, u: ArrayLike<number>): number | null {
  const b = transposeTimes(jac, rows, n, u);
  let sum = 0, any = false;
  for (let i = 0; i < n; i++) {
    if (!(maxTorque[i] > 0)) continue;
    any = true;
    sum += (b[i] / maxTorque[i]) ** 2;
  }
  if (!any || !(sum > 1e-24)) return null;
  return 1 / Math.sqrt(sum);
}

function scaledTranslational(jac: ArrayLike<number>, n: number, maxTorque: ArrayLike<number>): { matrix: Float64Array; weighted: boolean } {
  let weighted = false;
  for (let i = 0; i < n; i++) if (maxTorque[i] > 0) weighted = true;
  const m = new Float64Array(3 * n);
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < n; c++) {
      const w = weighted ? (maxTorque[c] > 0 ? 1 / maxTorque[c] : 0) : 1;
      m[r * n + c] = jac[r * n + c] * w;
    }
  }
  return { matrix: m, weighted };
}

/** A point mass carried by the last link, located in the TOOL frame of the model (m, kg). */
export interface PointLoad {
  mass: number;
  pointInTool: ArrayLike<number>;
}

/**
 * τ_hold(q) = Σ J_cᵢᵀ (0, 0, mᵢ g) over the model's links with a mass (at their `com`) and over
 * `loads` (docs/design.md#statics): the joint torques that hold the arm still against gravity along
 * −z of the model's world (the cell frame). Uses `jacBuf` (6n) as scratch; allocates the result.
 */
export function gravityTorque(
  model: ArmModel,
  data: ArmData,
  q: ArrayLike<number>,
  loads: readonly PointLoad[],
  jacBuf: Float64Array,
  includeLinks = true,
): Float64Array {
  const n = model.n, g = STANDARD_GRAVITY;
  const tau = new Float64Array(n);
  if (includeLinks) {
    for (let i = 0; i < n; i++) {
      const m = model.mass[i];
      if (!(m > 0)) continue;
      computeLinkPointJacobian(model, data, q, i + 1, model.com.subarray(3 * i, 3 * i + 3), jacBuf);
      for (let c = 0; c < n; c++) tau[c] += jacBuf[2 * n + c] * m * g;
    }
  }
  for (const load of loads) {
    if (!(load.mass > 0)) continue;
    computeJacobian(model, data, q, jacBuf, load.pointInTool);
    for (let c = 0; c < n; c++) tau[c] += jacBuf[2 * n + c] * load.mass * g;
  }
  return tau;
}

/** Static payload capacity at a point. */
interface PayloadCapacity {
  /** Largest extra mass (kg) at the point the joints can hold on top of τ_hold; null as in {@link CapacityResult}. */
  extraMass: number | null;
  status: CapacityResult["status"];
  limitingJoint: number | null;
}

/**
 * Largest mass m ≥ 0 at the point whose weight the joints can hold on top of `tauHold`: the ratio
 * test with b = J_pᵀ(0, 0, g) (docs/references.md#2r-gravity-and-payload-check-values: m_max = minᵢ headroomᵢ / (∂τᵢ/∂m), signs handled).
 * `jac` is the 6×n Jacobian at the point.
 */
export function payloadCapacity(tauHold: ArrayLike<number>, jac: ArrayLike<number>, n: number, maxTorque: ArrayLike<number>): PayloadCapacity {
  const b = new Float64Array(n);
  for (let c = 0; c < n; c++) b[c] = jac[2 * n + c] * STANDARD_GRAVITY;
  const r = capacityAlong(tauHold, b, maxTorque);
  return { extraMass: r.capacity, status: r.status, limitingJoint: r.limitingJoint };
}

/** A rigid load on the wrist for the load-diagram check: mass, CoG and inertia in the cell frame. */
export interface WristBody {
  mass: number;
  /** CoG in the cell frame (m). */
  cog: ArrayLike<number>;
  /** Rotation (row-major 3×3, cell frame) of the axes the principal inertia is given in. */
  rotation: ArrayLike<number>;
  /** Principal inertia about the CoG (kg·m²), or null when not given. */
  inertia: readonly [number, number, number] | null;
}

/** Loads about one wrist axis. */
interface WristAxisLoad {
  /** |moment| of the loads' weight about the axis at this pose (N·m). */
  momentAtPose: number;
  /** g·‖Σ mᵢ r⊥ᵢ‖: the moment when gravity is perpendicular to the offset (the load-diagram case), N·m. */
  momentWorstCase: number;
  /** Σ (zᵀ Rᵢ Iᵢ Rᵢᵀ z + mᵢ‖r⊥ᵢ‖²) about the axis (kg·m²); a point-mass lower bound when some inertia is missing. */
  inertia: number;
  /** False when some body with mass has no inertia given (then `inertia` is only a lower bound). */
  inertiaComplete: boolean;
}

/**
 * Moment and inertia of `bodies` about the joint axis through `origin` along unit `axis` (cell
 * frame). The moment at the pose equals that joint's share of τ_hold from these bodies.
 */
export function wristAxisLoad(axis: ArrayLike<number>, origin: ArrayLike<number>, bodies: readonly WristBody[]): WristAxisLoad {
  const g = STANDARD_GRAVITY;
  let moment = 0, inertia = 0, complete = true;
  let sx = 0, sy = 0, sz = 0;
  const zx = axis[0], zy = axis[1], zz = axis[2];
  for (const b of bodies) {
    if (!(b.mass > 0)) continue;
    const rx = b.cog[0] - origin[0], ry = b.cog[1] - origin[1], rz = b.cog[2] - origin[2];
    const along = rx * zx + ry * zy + rz * zz;
    const px = rx - along * zx, py = ry - along * zy, pz = rz - along * zz;
    // z · (r × (0, 0, −m g)) = −m g (z · (r × ẑ)) = −m g (zx·ry − zy·rx)
    moment += -b.mass * g * (zx * ry - zy * rx);
    sx += b.mass * px; sy += b.mass * py; sz += b.mass * pz;
    inertia += b.mass * (px * px + py * py + pz * pz);
    if (b.inertia) {
      const R = b.rotation;
      for (let k = 0; k < 3; k++) {
        // Component of z along the body's k-th principal axis (column k of R).
        const c = R[k] * zx + R[3 + k] * zy + R[6 + k] * zz;
        inertia += b.inertia[k] * c * c;
      }
    } else {
      complete = false;
    }
  }
  return { momentAtPose: Math.abs(moment), momentWorstCase: g * Math.hypot(sx, sy, sz), inertia, inertiaComplete: complete };
}
