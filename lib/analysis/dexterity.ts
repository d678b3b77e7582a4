/**
 * Dexterity at a configuration, from the geometric Jacobian (6×n, row-major, rows vx vy vz wx wy wz,
 * cell frame) and the joint limits.
 *
 * Translation (rows 0–2, m/rad) and rotation (rows 3–5, rad/rad) are always treated separately:
 * a condition number of the mixed 6×n matrix would depend on the length unit (Angeles; the
 * warning in docs/references.md#condition-number-and-isotropy). Measures offered per block:
 * - singular values σ₁ ≥ σ₂ ≥ σ₃ and principal directions (the velocity ellipsoid's axes);
 * - Yoshikawa manipulability w = σ₁σ₂…σ_r = sqrt(det(J Jᵀ)) over the block's rank r
 *   (Yoshikawa, "Manipulability of robotic mechanisms", IJRR 4(2), 1985);
 * - inverse condition number 1/κ = σ_r/σ₁ ∈ [0, 1] (Salisbury & Craig 1982; the local
 *   conditioning index of Gosselin & Angeles 1991);
 * - smallest singular value σ_r;
 * - scale-free affine-invariant distance of J Jᵀ to the nearest isotropic matrix c·I (below).
 */
import { taskJacobianInto } from "@/lib/kinematics";
import { svdRows, symmetricEigen, cholesky, type SvdRows } from "./linalg";

/** Singular values below this fraction of the block's σ₁ count as zero when ranks are counted. */
const RANK_TOLERANCE = 1e-6;

/** Dexterity margins below this are `marginal` (see {@link dexterityMargin} for the reasoning). */
export const DEXTERITY_MARGINAL_THRESHOLD = 0.2;

/**
 * A joint closer to a limit than this normalised margin (i.e. within 12.5 % of its range of
 * either end) lowers the dexterity margin; beyond it, the joint-limit factor is 1.
 */
const JOINT_MARGIN_SATURATION = 0.25;

/** Measures of one 3×n block (translational or rotational) of a Jacobian. */
interface BlockMeasures {
  /**
   * Singular values, descending (3 numbers, 2 for the axis-target block; m/rad for translation,
   * dimensionless for rotation).
   */
  singularValues: number[];
  /** Principal directions (unit 3-vectors, cell frame), one per entry of `singularValues`. */
  directions: number[][];
  /**
   * Rank counted from the arm's structure (the generic rank r this block can have; ≤ 3). 0 means
   * the structure cannot move in this block at all; the block is then neutral (1/κ reported as 1).
   */
  rank: number;
  /** Yoshikawa manipulability σ₁…σ_r (m^r for translation). */
  manipulability: number;
  /** σ_r/σ₁ ∈ [0, 1]; 1 = isotropic. 0 when σ₁ = 0. */
  inverseCondition: number;
  /** σ_r, the smallest singular value within the rank (m/rad for translation). */
  minSingularValue: number;
  /**
   * Scale-free affine-invariant distance of J Jᵀ (restricted to its r principal directions) to the
   * nearest c·I: sqrt(Σᵢ (ln σᵢ² − mean_j ln σⱼ²)²); null when σ_r = 0 (infinitely far: singular).
   * For isotropic references the log-Euclidean distance is the same number (c·I commutes with
   * every matrix), so only one is given here; {@link spdDistanceLogEuclidean} compares two
   * general ellipsoids.
   */
  isotropyDistance: number | null;
}

/**
 * Measures of a 3×n block given its SVD. `rank` is the generic rank to use (structural: e.g. 1 for
 * the rotation of a 4-axis SCARA); defaults to the numerical rank of this matrix.
 */
function blockMeasuresFromSvd(svd: SvdRows, rank?: number, reference = 0): BlockMeasures {
  const s = svd.sigma;
  const directions: number[][] = [];
  for (let j = 0; j < 3; j++) directions.push([svd.u[j], svd.u[3 + j], svd.u[6 + j]]);
  if (rank === 0) {
    // The structure cannot move in this block at all (e.g. no rotation for a Cartesian gantry):
    // nothing to condition, so the block is neutral (factor 1) rather than singular.
    return { singularValues: [s[0], s[1], s[2]], directions, rank: 0, manipulability: 1, inverseCondition: 1, minSingularValue: 0, isotropyDistance: 0 };
  }
  // A derived block that is only rounding noise against its reference is structurally absent.
  if (rank === undefined && reference > 0 && numericalRank(s, reference) === 0) return blockMeasuresFromSvd(svd, 0);
  const r = Math.max(1, Math.min(3, rank ?? numericalRank(s)));
  let w = 1;
  for (let i = 0; i < r; i++) w *= s[i];
  const smin = s[r - 1];
  const inv = s[0] > 0 ? smin / s[0] : 0;
  return {
    singularValues: [s[0], s[1], s[2]],
    directions,
    rank: r,
    manipulability: w,
    inverseCondition: inv,
    minSingularValue: smin,
    isotropyDistance: isotropyDistance(Array.from(s.subarray(0, r))),
  };
}

/**
 * Count of singular values above {@link RANK_TOLERANCE}·max(σ₁, reference) (descending input).
 * `reference` is the scale of the matrix a block was derived from (σ₁ of the rotational block for
 * the orientation blocks): a block that is zero in exact arithmetic holds only rounding noise, and
 * against its own σ₁ that noise would count as full rank.
 */
function numericalRank(sigma: ArrayLike<number>, reference = 0): number {
  const scale = Math.max(sigma[0], reference);
  if (!(scale > 0)) return 0;
  let r = 0;
  for (let i = 0; i < sigma.length; i++) if (sigma[i] > RANK_TOLERANCE * scale) r++;
  return r;
}

/**
 * Scale-free affine-invariant Riemannian distance of M = diag(σᵢ²) (i.e. of J Jᵀ in its own
 * principal axes) to the nearest isotropic matrix c·I:
 *   min_c d_AI(M, c·I) = sqrt(Σᵢ (ln σᵢ² − mean_j ln σⱼ²)²),
 * where d_AI(A, B) = ‖logm(A^{-1/2} B A^{-1/2})‖_F (Pennec, Fillard & Ayache, IJCV 66(1), 2006).
 * The minimum is at ln c = mean ln σⱼ², so the value is free of units and scale. For two singular
 * values it equals √2·ln κ. Returns null when some σ is 0 (M is singular: the distance is ∞).
 */
export function isotropyDistance(sigma: ArrayLike<number>): number | null {
  const k = sigma.length;
  let mean = 0;
  for (let i = 0; i < k; i++) {
    if (!(sigma[i] > 0)) return null;
    mean += Math.log(sigma[i] * sigma[i]);
  }
  mean /= k;
  let sum = 0;
  for (let i = 0; i < k; i++) {
    const d = Math.log(sigma[i] * sigma[i]) - mean;
    sum += d * d;
  }
  return Math.sqrt(sum);
}

/**
 * Affine-invariant Riemannian distance between SPD k×k matrices (row-major):
 * d_AI(A, B) = ‖logm(A^{-1/2} B A^{-1/2})‖_F = sqrt(Σ ln² λᵢ), λᵢ the eigenvalues of A⁻¹B
 * (Pennec, Fillard & Ayache 2006; Bhatia, "Positive Definite Matrices", 2007, ch. 6). Invariant
 * under A, B → G A Gᵀ, G B Gᵀ for any invertible G. Computed as the eigenvalues of L⁻¹ B L⁻ᵀ with
 * A = L Lᵀ (Cholesky). Returns null when A or B is not positive definite.
 */
export function spdDistanceAffineInvariant(a: ArrayLike<number>, b: ArrayLike<number>, k: number): number | null {
  const l = cholesky(a, k);
  if (!l || !cholesky(b, k)) return null;
  // X = L⁻¹ B (forward substitution per column), then C = X L⁻ᵀ = (L⁻¹ Xᵀ)ᵀ.
  const x = new Float64Array(k * k);
  for (let c = 0; c < k; c++) {
    for (let r = 0; r < k; r++) {
      let s = b[r * k + c];
      for (let p = 0; p < r; p++) s -= l[r * k + p] * x[p * k + c];
      x[r * k + c] = s / l[r * k + r];
    }
  }
  const cm = new Float64Array(k * k);
  for (let rr = 0; rr < k; rr++) {
    // Row rr of C = (L⁻¹ (row rr of X)ᵀ)ᵀ.
    for (let c = 0; c < k; c++) {
      let s = x[rr * k + c];
      for (let p = 0; p < c; p++) s -= l[c * k + p] * cm[rr * k + p];
      cm[rr * k + c] = s / l[c * k + c];
    }
  }
  const { values } = symmetricEigen(cm, k);
  let sum = 0;
  for (let i = 0; i < k; i++) {
    if (!(values[i] > 0)) return null;
    const lg = Math.log(values[i]);
    sum += lg * lg;
  }
  return Math.sqrt(sum);
}

/**
 * Log-Euclidean distance between SPD k×k matrices: d_LE(A, B) = ‖logm A − logm B‖_F (Arsigny,
 * Fillard, Pennec & Ayache, Magn. Reson. Med. 56(2), 2006). Invariant under rotations and
 * scaling, not under general affine maps (unlike {@link spdDistanceAffineInvariant}); cheaper.
 * Returns null when A or B is not positive definite.
 */
export function spdDistanceLogEuclidean(a: ArrayLike<number>, b: ArrayLike<number>, k: number): number | null {
  const la = spdLog(a, k), lb = spdLog(b, k);
  if (!la || !lb) return null;
  let sum = 0;
  for (let i = 0; i < k * k; i++) sum += (la[i] - lb[i]) ** 2;
  return Math.sqrt(sum);
}

/** Matrix logarithm of an SPD matrix via its eigen-decomposition; null if not positive definite. */
function spdLog(a: ArrayLike<number>, k: number): Float64Array | null {
  const { values, vectors } = symmetricEigen(a, k);
  const out = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    if (!(values[j] > 0)) return null;
    const lg = Math.log(values[j]);
    for (let r = 0; r < k; r++) for (let c = 0; c < k; c++) out[r * k + c] += vectors[r * k + j] * lg * vectors[c * k + j];
  }
  return out;
}

/** Joint limits as the dexterity needs them (an `ArmModel` satisfies this). */
interface JointLimits {
  readonly n: number;
  readonly lower: ArrayLike<number>;
  readonly upper: ArrayLike<number>;
}

/** Joint-limit margin at q. */
interface JointLimitMargin {
  /** min over joints of mᵢ ∈ [0, 1]; 1 when no joint has a range (all locked). */
  margin: number;
  /** 1-based joint giving the minimum, or null when no joint has a range. */
  joint: number | null;
  /** Per joint mᵢ = 2·min(q − lower, upper − q)/(upper − lower): 0 at a limit, 1 at mid-range. */
  perJoint: number[];
}

/**
 * Joint-limit margin (common practice, no source): per joint the distance to the nearer limit as
 * a fraction of half the range, clamped to [0, 1]. Joints whose range is zero (locked by design)
 * are reported as 1 and do not count.
 */
export function jointLimitMargin(limits: JointLimits, q: ArrayLike<number>): JointLimitMargin {
  let margin = 1, joint: number | null = null;
  const perJoint: number[] = [];
  for (let i = 0; i < limits.n; i++) {
    const lo = limits.lower[i], hi = limits.upper[i], range = hi - lo;
    if (!(range > 1e-12)) { perJoint.push(1); continue; }
    const m = Math.min(1, Math.max(0, (2 * Math.min(q[i] - lo, hi - q[i])) / range));
    perJoint.push(m);
    if (joint === null || m < margin) { margin = m; joint = i + 1; }
  }
  return { margin, joint, perJoint };
}

/** Generic (structural) ranks of an arm's Jacobian blocks; see {@link dexterityAt}. */
export interface StructuralRanks {
  /** Rank of the translational block at a general configuration (≤ 3). */
  translation: number;
  /** Rank of the rotational block restricted to the null space of the translational block (≤ 3). */
  orientation: number;
  /** Rank of the plain rotational block (≤ 3). */
  rotation: number;
  /**
   * Rank of that orientation block projected on the tool's x and y axes (≤ 2): the rotations an
   * `axis` target constrains (0 for an arm whose tool can only spin about its own z axis).
   */
  axisOrientation: number;
}

/** Which factor limits the dexterity margin. */
type DexterityLimit = "translation" | "orientation" | "joint-limit";

/** Everything the dexterity analysis reports at one configuration. */
export interface DexterityReport {
  /** Translational block (rows vx vy vz) of the Jacobian. */
  translation: BlockMeasures;
  /** Rotational block (rows wx wy wz) of the Jacobian. */
  rotation: BlockMeasures;
  /**
   * Rotational block restricted to the joint motions that leave the point still (the null space of
   * the translational block): how well the tool can be re-oriented about a fixed point. Catches
   * wrist singularities, which neither block shows alone.
   */
  orientation: BlockMeasures;
  /**
   * `axis` mode only (null otherwise): the orientation block projected on the tool's x and y
   * axes, the 2×n matrix [xᵀ·J_o; yᵀ·J_o] (J_o the block above). An axis target leaves the spin
   * about the tool z axis free, so only these two rotations are constrained; its orientation factor
   * is this block's σ₂/σ₁. Directions are cell-frame unit vectors in the tool's x-y plane.
   */
  axisOrientation: BlockMeasures | null;
  jointLimits: JointLimitMargin;
  /** Joint-limit factor h = min(1, m / JOINT_MARGIN_SATURATION). */
  jointLimitFactor: number;
  /** The dexterity margin D ∈ [0, 1] (see {@link dexterityMargin}). */
  margin: number;
  /** Smallest factor of D (with the joint for `joint-limit`). */
  limiting: { factor: DexterityLimit; value: number; joint: number | null };
  /** True when D < DEXTERITY_MARGINAL_THRESHOLD. */
  marginal: boolean;
}

/**
 * The dexterity margin D ∈ [0, 1], dimensionless. Design (ours; documented for the page):
 * - ι_t = 1/κ of the translational block: how evenly the tool point can move in all directions
 *   (0 at a position singularity: arm stretched or folded).
 * - ι_o = 1/κ of the rotational block restricted to the null space of the translational block:
 *   how evenly the tool can turn about the fixed point (0 at a wrist singularity). For `axis`
 *   targets only the rotations about the tool's x and y axes are constrained (the spin about z is
 *   free), so ι_o = σ₂/σ₁ of that block projected on x and y, [xᵀ·J_o; yᵀ·J_o] (2×n); the full
 *   three-direction block is still reported beside it.
 * - h = min(1, m/0.25), m the joint-limit margin: a joint within 12.5 % of its range from a limit
 *   lowers D, linearly to 0 at the limit; being nearer mid-range than that adds nothing.
 * - D = (ι_t·ι_o·h)^(1/3) for `pose` and `axis` targets, D = (ι_t·h)^(1/2) for `point` targets
 *   (whose orientation is free, so the wrist conditioning does not matter).
 * The geometric mean keeps the units out (each factor is a ratio), sends D to 0 when any factor
 * reaches 0 (a singularity or a limit), and rewards balance. Inverse condition numbers are
 * counted over the arm's structural rank (a 4-axis SCARA can turn about one axis only: its
 * orientation factor uses that one singular value, so it is 1, not 0).
 * Threshold: D < 0.2 is `marginal`. That is reached, for example, by all three factors at 0.2
 * (κ = 5 in both blocks with a joint within 2.5 % of its range from a limit), or by a single
 * factor at 0.008 (κ ≈ 125) with the others perfect: both are poses an application engineer would
 * not commission without a closer look.
 */
export function dexterityMargin(iotaT: number, iotaO: number, h: number, mode: "pose" | "axis" | "point"): number {
  const v = mode === "point" ? Math.sqrt(Math.max(0, iotaT * h)) : Math.cbrt(Math.max(0, iotaT * iotaO * h));
  return Math.min(1, Math.max(0, v));
}

/**
 * Dexterity report at q from a 6×n Jacobian `jac` (row-major, cell frame). `ranks` are the arm's
 * structural ranks (default: the numerical ranks at this q, which understate nothing at a general
 * pose but miss a singularity at a singular one, so pass them). Allocates its result.
 */
export function dexterityAt(
  jac: ArrayLike<number>,
  n: number,
  limits: JointLimits,
  q: ArrayLike<number>,
  mode: "pose" | "axis" | "point",
  ranks?: StructuralRanks,
  toolPose?: ArrayLike<number>,
): DexterityReport {
  if (mode === "axis" && (!toolPose || toolPose.length < 12)) throw new RangeError("toolPose: the tool pose (row-major 4×4) is needed for an axis target");
  const svdT = svdRows(jac, 3, n, 0);
  const svdR = svdRows(jac, 3, n, 3);
  const translation = blockMeasuresFromSvd(svdT, ranks?.translation);
  const rotation = blockMeasuresFromSvd(svdR, ranks?.rotation);
  const jo = orientationBlock(jac, n, svdT);
  const svdO = svdRows(jo, 3, n, 0);
  const rScale = svdR.sigma[0];
  const orientation = blockMeasuresFromSvd(svdO, ranks?.orientation, rScale);
  let axisOrientation: BlockMeasures | null = null;
  if (mode === "axis") {
    const svdA = svdRows(axisOrientationBlock(jac, jo, n, toolPose!), 2, n, 0);
    axisOrientation = axisBlockMeasures(svdA, toolPose!, ranks?.axisOrientation ?? numericalRank(svdA.sigma, rScale));
  }
  const jointLimits = jointLimitMargin(limits, q);
  const h = Math.min(1, jointLimits.margin / JOINT_MARGIN_SATURATION);
  const iotaT = translation.inverseCondition, iotaO = (axisOrientation ?? orientation).inverseCondition;
  const margin = dexterityMargin(iotaT, iotaO, h, mode);
  const candidates: { factor: DexterityLimit; value: number; joint: number | null }[] = [
    { factor: "translation", value: iotaT, joint: null },
  ];
  if (mode !== "point") candidates.push({ factor: "orientation", value: iotaO, joint: null });
  candidates.push({ factor: "joint-limit", value: h, joint: jointLimits.joint });
  let limiting = candidates[0];
  for (const c of candidates) if (c.value < limiting.value) limiting = c;
  return {
    translation, rotation, orientation, axisOrientation, jointLimits, jointLimitFactor: h, margin, limiting,
    marginal: margin < DEXTERITY_MARGINAL_THRESHOLD,
  };
}

/**
 * J_r·P with P = I − Σ vⱼvⱼᵀ the projector onto the null space of the translational block (vⱼ its
 * right singular vectors with σⱼ above the rank tolerance). Returns a 3×n row-major matrix.
 */
function orientationBlock(jac: ArrayLike<number>, n: number, svdT: SvdRows): Float64Array {
  const out = new Float64Array(3 * n);
  for (let r = 0; r < 3; r++) for (let c = 0; c < n; c++) out[r * n + c] = jac[(3 + r) * n + c];
  const s0 = svdT.sigma[0];
  for (let j = 0; j < 3; j++) {
    const s = svdT.sigma[j];
    if (!(s > RANK_TOLERANCE * s0)) continue;
    // v = w_j / σ_j
    for (let r = 0; r < 3; r++) {
      let dot = 0;
      for (let c = 0; c < n; c++) dot += out[r * n + c] * svdT.w[j * n + c];
      const f = dot / (s * s);
      for (let c = 0; c < n; c++) out[r * n + c] -= f * svdT.w[j * n + c];
    }
  }
  return out;
}

/**
 * The 2×n block [xᵀ·J_o; yᵀ·J_o] of an axis target: the orientation block `jo` (3×n, from
 * {@link orientationBlock}) projected on the tool's x and y axes by the task construction that IK
 * and paths use (lib/kinematics/task.ts, `axis` rows 3–4). `jac` supplies the translational rows.
 */
function axisOrientationBlock(jac: ArrayLike<number>, jo: ArrayLike<number>, n: number, toolPose: ArrayLike<number>): Float64Array {
  const stacked = new Float64Array(6 * n);
  for (let k = 0; k < 3 * n; k++) { stacked[k] = jac[k]; stacked[3 * n + k] = jo[k]; }
  const task = new Float64Array(5 * n);
  taskJacobianInto("axis", stacked, n, toolPose, task);
  return task.subarray(3 * n, 5 * n);
}

/** Measures of the 2-row axis block of rank `rank`; directions mapped from the tool's x-y plane to the cell frame. */
function axisBlockMeasures(svd: SvdRows, toolPose: ArrayLike<number>, rank: number): BlockMeasures {
  const s = svd.sigma;
  const x = [toolPose[0], toolPose[4], toolPose[8]], y = [toolPose[1], toolPose[5], toolPose[9]];
  const directions: number[][] = [];
  for (let j = 0; j < 2; j++) {
    const a = svd.u[j], b = svd.u[2 + j];
    directions.push([a * x[0] + b * y[0], a * x[1] + b * y[1], a * x[2] + b * y[2]]);
  }
  const singularValues = [s[0], s[1]];
  if (rank === 0) return { singularValues, directions, rank: 0, manipulability: 1, inverseCondition: 1, minSingularValue: 0, isotropyDistance: 0 };
  const r = Math.max(1, Math.min(2, rank));
  const smin = s[r - 1];
  return {
    singularValues, directions, rank: r,
    manipulability: r === 2 ? s[0] * s[1] : s[0],
    inverseCondition: s[0] > 0 ? smin / s[0] : 0,
    minSingularValue: smin,
    isotropyDistance: isotropyDistance(Array.from(s.subarray(0, r))),
  };
}

/**
 * Structural ranks from Jacobians at a few general configurations (the largest numerical ranks).
 * `toolPoses` (the tool pose at each of those configurations) give the axis-target rank; without
 * them it is taken as min(2, orientation rank), an upper bound.
 */
export function structuralRanksFromJacobians(jacs: ArrayLike<number>[], n: number, toolPoses?: ArrayLike<number>[]): StructuralRanks {
  let t = 0, o = 0, r = 0, a = 0;
  jacs.forEach((jac, i) => {
    const svdT = svdRows(jac, 3, n, 0);
    t = Math.max(t, numericalRank(svdT.sigma));
    const svdR = svdRows(jac, 3, n, 3);
    r = Math.max(r, numericalRank(svdR.sigma));
    const jo = orientationBlock(jac, n, svdT);
    o = Math.max(o, numericalRank(svdRows(jo, 3, n, 0).sigma, svdR.sigma[0]));
    if (toolPoses) a = Math.max(a, numericalRank(svdRows(axisOrientationBlock(jac, jo, n, toolPoses[i]), 2, n, 0).sigma, svdR.sigma[0]));
  });
  return { translation: t, orientation: o, rotation: r, axisOrientation: toolPoses ? a : Math.min(2, o) };
}
