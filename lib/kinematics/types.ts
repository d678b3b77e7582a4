/**
 * Types of the kinematics library.
 *
 * ## Notation and memory order
 * - Every matrix is a `Float64Array` in ROW-MAJOR order (the same order as the interchange files):
 *   a 4×4 pose `T` has `T[4*r + c]`; a 6×n Jacobian `J` has `J[n*r + c]`.
 * - Poses are homogeneous transforms `T_a_b` (pose of frame b expressed in frame a; Pinocchio's
 *   `aMb`). `frames[i]` is `T_world_i`, where "world" is the arm's base frame before `model.base`
 *   (the frame the arm is bolted to) and frame i is the frame after joint i's link transform.
 * - Jacobians are geometric (not analytic): rows vx vy vz wx wy wz, expressed in the world frame,
 *   linear velocity of a reference point (the tool point unless another is given).
 * - SI units throughout: m, rad, kg, N·m.
 */
import type { ArmKinematics, ChainArmKinematics, DhArmKinematics } from "@/shared/schemas/arm";

export type { ArmKinematics, ChainArmKinematics, DhArmKinematics };

/** Row-major 4×4 homogeneous transform, length 16. */
export type Mat4 = Float64Array;
export type JointType = "revolute" | "prismatic";
type DhConvention = "dh" | "mdh";
/** `dh`, `mdh` (DH tables) or `chain` (general joint chain: origin + axis per joint, URDF semantics). */
type Convention = DhConvention | "chain";

/**
 * Compiled, immutable arm model (made by `createModel`, never changed by any algorithm).
 * The object is frozen; its typed arrays cannot be frozen by JavaScript, so treat them as read-only.
 */
export interface ArmModel {
  readonly name: string;
  /** Number of joints. */
  readonly n: number;
  /**
   * `dh`: link i = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ); `mdh`: link i = Rx(α₍ᵢ₋₁₎)·Tx(a₍ᵢ₋₁₎)·Rz(θᵢ)·Tz(dᵢ);
   * `chain`: link i = T(originᵢ)·Rot(axisᵢ, qᵢ) (revolute) or T(originᵢ)·Trans(axisᵢ·qᵢ) (prismatic).
   */
  readonly convention: Convention;
  readonly types: readonly JointType[];
  /** 1 for a prismatic joint, 0 for a revolute one (length n). */
  readonly prismatic: Uint8Array;
  /** DH parameters per joint as written in the file (length n each; m, rad); zero for `chain` arms. */
  readonly a: Float64Array;
  readonly alpha: Float64Array;
  readonly d: Float64Array;
  readonly theta: Float64Array;
  /** cos α and sin α per joint, precomputed (length n). */
  readonly cosAlpha: Float64Array;
  readonly sinAlpha: Float64Array;
  /** Joint position limits of q (rad or m, length n). */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  /** Max joint speed (rad/s or m/s), NaN where absent (length n). */
  readonly maxSpeed: Float64Array;
  /** Max joint acceleration (rad/s² or m/s²), NaN where absent (length n). */
  readonly maxAcceleration: Float64Array;
  /** Max joint torque (N·m) or force (N), NaN where absent (length n). */
  readonly maxTorque: Float64Array;
  /** Link mass (kg), 0 where absent (length n). */
  readonly mass: Float64Array;
  /** Link centre of mass in joint frame i (after its transform), m; 3 numbers per joint (length 3n). */
  readonly com: Float64Array;
  /** Link collision radius (m), NaN where absent (length n). */
  readonly radius: Float64Array;
  /** Arm base transform T_world_frame0 (row-major 4×4; identity when absent). */
  readonly base: Mat4;
  /** Flange → tool point transform T_flange_tool (row-major 4×4; identity when absent). */
  readonly tool: Mat4;
  /**
   * `chain` arms: joint origins T(originᵢ) = Trans(xyz)·Rz(yaw)·Ry(pitch)·Rx(roll), row-major,
   * 16 numbers per joint (length 16n); the identity for `dh` and `mdh` arms.
   */
  readonly origin: Float64Array;
  /**
   * Unit joint axis (3 numbers per joint, length 3n) in the coordinates of frame
   * `i + axisFrameOffset` (0-based joint index i): (0, 0, 1) for `dh` and `mdh`, the normalised
   * `axis` for `chain`. The axis passes through that frame's origin. `jointAxisWorld` gives it in
   * the world frame after a forward-kinematics call.
   */
  readonly axis: Float64Array;
  /**
   * `chain` revolute joints: R_origin·[u]× and R_origin·u·uᵀ (9 numbers each per joint, row-major,
   * length 9n), so that R_origin·Rot(u, q) = cos q·R_origin + sin q·originCross + (1 − cos q)·originOuter
   * (Rodrigues' formula multiplied out once). Zero for other joints.
   */
  readonly originCross: Float64Array;
  readonly originOuter: Float64Array;
  /**
   * Index offset into `frames` of the frame holding joint i's axis (0-based joint index):
   * 0 for `dh` (joint i+1 moves about z of frame i), 1 for `mdh` and `chain` (the axis is fixed in
   * the frame after the joint, which it rotates about or slides along).
   */
  readonly axisFrameOffset: 0 | 1;
  /** Sum over joints of the link offsets plus the prismatic ranges, plus the tool offset (m): a length scale. */
  readonly lengthScale: number;
  /** Upper bound on the distance from frame 0's origin to the tool point over all configurations (m). */
  readonly reach: number;
}

/**
 * Workspace for one model (made by `createData`). Every buffer the algorithms write is here, so
 * forward kinematics, Jacobians and the IK loop do not allocate. One data object per thread of
 * work; many data objects may share one model.
 */
export interface ArmData {
  /** The model this workspace was made for (checked by every entry point). */
  readonly model: ArmModel;
  /** Frame poses T_world_i for i = 0..n, 16 numbers each (row-major); frame 0 = model.base. */
  readonly frames: Float64Array;
  /** Flange pose T_world_flange (= frame n; a view into `frames`). */
  readonly flange: Mat4;
  /** Tool point pose T_world_tool = flange · model.tool. */
  readonly toolPose: Mat4;
  /** 6×n Jacobian buffer used by the IK loop and by callers that want one (row-major). */
  readonly jacobian: Float64Array;
  /** IK scratch (internal; contents are unspecified between calls). */
  readonly ik: IkWorkspace;
}

/** Internal IK buffers, sized in `createData`. */
interface IkWorkspace {
  /** Current iterate, trial iterate, best of the attempt, best overall, restart seed (length n each). */
  readonly q: Float64Array;
  readonly qTrial: Float64Array;
  readonly qBest: Float64Array;
  readonly qBestAll: Float64Array;
  readonly qSeed: Float64Array;
  /** Step (length n). */
  readonly dq: Float64Array;
  /** Task Jacobian, up to 6×n row-major. */
  readonly jt: Float64Array;
  /** Damped normal matrix / Cholesky factor, up to 6×6 (also reused as the Gram matrix for σ_min). */
  readonly normal: Float64Array;
  /** Gram matrix for the smallest singular value (max(6, n)² entries). */
  readonly gram: Float64Array;
  /** Task error and its solve (length 6 each). */
  readonly err: Float64Array;
  readonly y: Float64Array;
  /** Per-joint flag: column frozen at a joint limit during the current step (length n). */
  readonly frozen: Uint8Array;
}

/** Constraint mode of an IK target (docs/design.md#inverse-kinematics). */
export type IkMode = "pose" | "axis" | "point";

export interface IkOptions {
  /** `pose` full 6-D (default); `axis` position + tool z-axis, free spin; `point` position only. */
  mode?: IkMode;
  /** Position tolerance (m), default 1e-5. */
  positionTolerance?: number;
  /** Rotation tolerance (rad), default 1e-4; ignored in `point` mode. */
  rotationTolerance?: number;
  /** Seed of the restart generator (default 1). Same seed, same answer. */
  seed?: number;
  /** Restarts from random in-limit configurations after the first attempt (default 300). */
  maxRestarts?: number;
  /** Iterations per attempt (default 60). */
  maxIterations?: number;
  /** First attempt's start configuration (default `neutralConfiguration`). */
  initial?: ArrayLike<number>;
}

export interface IkMultiOptions extends IkOptions {
  /** Most distinct solutions to return (default 8). */
  maxSolutions?: number;
  /**
   * Two reached solutions are the same branch when every joint differs by less than this
   * (revolute joints compared modulo 2π, rad or m; default 0.1).
   */
  distinctThreshold?: number;
}

/**
 * Why a search ended (inverse.ts): `reached`; `beyond-reach` (the target is farther from the
 * base than the arm's largest possible reach, so no search was made beyond the first attempt);
 * `joint-limit` (stalled with a joint at a limit that the error would push it past);
 * `singularity` (stalled where no joint motion lowers the remaining error: a singularity, or a
 * motion the structure lacks); `budget` (attempts ended without converging, away from a limit and
 * from a stationary point: the search says nothing about reachability).
 */
export type IkCause = "reached" | "beyond-reach" | "joint-limit" | "singularity" | "budget";

export interface IkResult {
  status: "reached" | "not-reached";
  /** Structured reason; branch on this, never on `reason`'s wording. */
  cause: IkCause;
  /** Answer (wrapped into the limits), or the best iterate found when not reached. */
  q: Float64Array;
  /** |p_target − p_tool| (m). */
  positionError: number;
  /** Pose mode: angle of R_target·R_toolᵀ; axis mode: angle between the z-axes; point mode: 0 (rad). */
  rotationError: number;
  /** Iterations over all attempts. */
  iterations: number;
  /** Attempts after the first. */
  restarts: number;
  /** Smallest singular value of the task Jacobian (3, 5 or 6 rows by mode) at `q`. */
  minSingularValue: number;
  /** Why the search ended, in words. */
  reason: string;
}
