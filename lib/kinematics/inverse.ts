/**
 * Numerical inverse kinematics: Levenberg–Marquardt with Sugihara's error-dependent damping,
 * step acceptance, joint limits by projection with a clamping loop, three constraint modes and
 * deterministic seeded restarts.
 *
 * ## Method
 * Task error e (m rows; `pose` 6, `axis` 5, `point` 3) and task Jacobian Jₜ (m×n) in the world
 * frame. Each step solves the damped normal equations in their m×m form (m ≤ 6):
 *
 *   Δq = Jₜᵀ (Jₜ Jₜᵀ + λ I)⁻¹ e,  λ = μ·E + w̄,  E = ½ eᵀe,
 *
 * which equals (JₜᵀJₜ + λI)⁻¹Jₜᵀe (damped least squares; Wampler 1986, Nakamura & Hanafusa 1986,
 * Buss 2004) with the damping of Sugihara, "Solvability-unconcerned inverse kinematics by the
 * Levenberg–Marquardt method", IEEE T-RO 27(5), 2011: W_N = E·I + w̄·I, so the damping vanishes
 * (down to the small bias w̄) as the error goes to zero and the iteration becomes Gauss–Newton
 * fast, while far or unreachable targets get strong damping. As in classical LM (Marquardt 1963),
 * a step that does not lower E is rejected and μ grows tenfold; accepted steps shrink μ.
 * The Cholesky factorisation of the m×m matrix runs in preallocated buffers.
 *
 * Joint limits: after each step every joint is projected into its limits (revolute joints wrapped
 * by 2π first). Joints the step would push beyond a limit are frozen (their Jacobian column
 * zeroed) and the step is solved again — the clamping loop of Baerlocher & Boulic, "An inverse
 * kinematics architecture enforcing an arbitrary number of strict priority levels", The Visual
 * Computer 20, 2004 (from memory). An attempt stops when the tolerances are met, when E stalls
 * (a local minimum or a limit), or after `maxIterations`; the next attempt starts from a random
 * in-limit configuration drawn from a mulberry32 generator seeded by `seed` (deterministic).
 *
 * Errors: `pose`: e = (p* − p, log(R*Rᵀ)) in the world frame. `axis`: e = (p* − p, xᵀw, yᵀw) where
 * w = θ·(z × z*)/|z × z*| rotates the tool z-axis onto the target's and x, y are the tool's current
 * x and y axes (spin about z is free). `point`: e = p* − p.
 */
import type { ArmData, ArmModel, IkCause, IkMode, IkMultiOptions, IkOptions, IkResult } from "./types";
import { checkArgs } from "./data";
import { forwardKinematicsUnchecked } from "./forward";
import { jacobianAtWorldPoint } from "./jacobian";
import { choleskyInPlace, choleskySolve, minSingularValue } from "./math/linalg";
import { rotationErrorVector } from "./math/mat4";
import { LIMIT_EPSILON, maxJointDistance, neutralConfiguration, projectJoint, randomConfiguration, wrapToLimits } from "./configuration";
import { createRng } from "./rng";
import { taskJacobianInto, taskRowCount } from "./task";

/** Default tolerances and budget (docs/design.md#inverse-kinematics: reached = 1e-5 m and 1e-4 rad). */
const IK_DEFAULTS = Object.freeze({
  mode: "pose" as IkMode,
  positionTolerance: 1e-5,
  rotationTolerance: 1e-4,
  seed: 1,
  maxRestarts: 300,
  maxIterations: 60,
  maxSolutions: 8,
  distinctThreshold: 0.1,
});

/** Sugihara's bias w̄ (units of E: m² or rad²). Small: near the solution the step is Gauss–Newton. */
const DAMPING_BIAS = 1e-6;
/** Largest revolute joint change per step (rad) and prismatic change (m). */
const MAX_STEP_REVOLUTE = 0.8;
const MAX_STEP_PRISMATIC = 0.2;
/** An attempt is abandoned after this many consecutive steps that lower E by less than STALL_RATIO. */
const STALL_PATIENCE = 6;
const STALL_RATIO = 0.98;

interface Settings {
  mode: IkMode;
  m: number;
  tolP: number;
  tolR: number;
  maxIterations: number;
}

/** Outcome of one error evaluation, kept in module scratch (synchronous code only). */
const ev = { E: 0, pos: 0, rot: 0, gradient: 0 };

function checkTarget(target: ArrayLike<number>): void {
  if (target.length !== 16) throw new RangeError(`target: wrong size, expected 16 (row-major 4×4), got ${target.length}`);
  for (let i = 0; i < 16; i++) {
    if (!Number.isFinite(target[i])) throw new RangeError(`target.${i}: must be a finite number`);
  }
}

/** FK at q and the task error into data.ik.err; sets ev. */
function evaluate(model: ArmModel, data: ArmData, q: Float64Array, target: ArrayLike<number>, s: Settings): void {
  forwardKinematicsUnchecked(model, data, q);
  const t = data.toolPose, e = data.ik.err;
  const ex = target[3] - t[3], ey = target[7] - t[7], ez = target[11] - t[11];
  e[0] = ex; e[1] = ey; e[2] = ez;
  let E = ex * ex + ey * ey + ez * ez;
  ev.pos = Math.sqrt(E);
  if (s.mode === "pose") {
    ev.rot = rotationErrorVector(e, target, t, 3);
    E += e[3] * e[3] + e[4] * e[4] + e[5] * e[5];
  } else if (s.mode === "axis") {
    const zx = t[2], zy = t[6], zz = t[10];
    const gx = target[2], gy = target[6], gz = target[10];
    const gn = Math.sqrt(gx * gx + gy * gy + gz * gz) || 1;
    let cx = (zy * gz - zz * gy) / gn, cy = (zz * gx - zx * gz) / gn, cz = (zx * gy - zy * gx) / gn;
    const sn = Math.sqrt(cx * cx + cy * cy + cz * cz);
    const cs = (zx * gx + zy * gy + zz * gz) / gn;
    const angle = Math.atan2(sn, cs);
    if (sn > 1e-12) {
      const k = angle / sn;
      cx *= k; cy *= k; cz *= k;
    } else if (cs < 0) {
      // anti-parallel: turn about the tool x-axis
      cx = t[0] * Math.PI; cy = t[4] * Math.PI; cz = t[8] * Math.PI;
    } else {
      cx = 0; cy = 0; cz = 0;
    }
    e[3] = t[0] * cx + t[4] * cy + t[8] * cz;
    e[4] = t[1] * cx + t[5] * cy + t[9] * cz;
    E += e[3] * e[3] + e[4] * e[4];
    ev.rot = angle;
  } else {
    ev.rot = 0;
  }
  ev.E = 0.5 * E;
}

/** Task Jacobian (m×n) at the tool point into data.ik.jt (task.ts); needs FK at the current q. */
function taskJacobian(model: ArmModel, data: ArmData, s: Settings): void {
  const n = model.n, J = data.jacobian, t = data.toolPose;
  jacobianAtWorldPoint(model, data, t[3], t[7], t[11], n, J);
  taskJacobianInto(s.mode, J, n, t, data.ik.jt);
}

/** Solves the damped step into data.ik.dq with columns of frozen joints removed. False if singular. */
function dampedStep(n: number, data: ArmData, m: number, lambda: number): boolean {
  const { jt, normal: A, err, y, dq, frozen } = data.ik;
  for (let r = 0; r < m; r++) {
    for (let c = 0; c <= r; c++) {
      let sum = 0;
      const ro = r * n, co = c * n;
      for (let j = 0; j < n; j++) if (frozen[j] === 0) sum += jt[ro + j] * jt[co + j];
      A[r * m + c] = sum;
      A[c * m + r] = sum;
    }
    A[r * m + r] += lambda;
  }
  if (!choleskyInPlace(A, m)) return false;
  choleskySolve(A, m, err, y);
  for (let j = 0; j < n; j++) {
    if (frozen[j] === 1) {
      dq[j] = 0;
      continue;
    }
    let sum = 0;
    for (let r = 0; r < m; r++) sum += jt[r * n + j] * y[r];
    dq[j] = sum;
  }
  return true;
}

/** Scales dq so no joint moves more than the per-step caps. */
function capStep(model: ArmModel, dq: Float64Array): void {
  let scale = 1;
  for (let j = 0; j < model.n; j++) {
    const cap = model.prismatic[j] === 1 ? MAX_STEP_PRISMATIC : MAX_STEP_REVOLUTE;
    const a = Math.abs(dq[j]);
    if (a * scale > cap) scale = cap / a;
  }
  if (scale < 1) for (let j = 0; j < model.n; j++) dq[j] *= scale;
}

/**
 * Computes the projected trial q + dq into qTrial; returns true when some joint not yet frozen
 * had to be clamped (and freezes it).
 */
function projectTrial(model: ArmModel, data: ArmData, q: Float64Array): boolean {
  const { dq, qTrial, frozen } = data.ik;
  let newlyFrozen = false;
  for (let j = 0; j < model.n; j++) {
    const raw = q[j] + dq[j];
    const v = projectJoint(model, j, raw);
    qTrial[j] = v;
    if (frozen[j] === 0 && (v === model.lower[j] || v === model.upper[j]) && v !== raw) {
      frozen[j] = 1;
      newlyFrozen = true;
    }
  }
  return newlyFrozen;
}

interface AttemptOutcome {
  reached: boolean;
  iterations: number;
  E: number;
  pos: number;
  rot: number;
}

/**
 * One LM descent from data.ik.q (already within limits). Leaves the attempt's best iterate in
 * data.ik.qBest. Does not allocate.
 */
function descend(model: ArmModel, data: ArmData, target: ArrayLike<number>, s: Settings, out: AttemptOutcome): void {
  const n = model.n, ik = data.ik, q = ik.q, qBest = ik.qBest, qTrial = ik.qTrial, frozen = ik.frozen;
  evaluate(model, data, q, target, s);
  let E = ev.E, pos = ev.pos, rot = ev.rot;
  let mu = 1;
  let stall = 0;
  let it = 0;
  qBest.set(q);
  let fkCurrent = true;
  while (true) {
    if (pos <= s.tolP && rot <= s.tolR) {
      out.reached = true;
      break;
    }
    if (it >= s.maxIterations || stall >= STALL_PATIENCE) {
      out.reached = false;
      break;
    }
    it++;
    // after a rejected trial, FK and the error vector belong to the trial: recompute them at q
    if (!fkCurrent) evaluate(model, data, q, target, s);
    fkCurrent = true;
    taskJacobian(model, data, s);
    frozen.fill(0);
    const lambda = mu * E + DAMPING_BIAS;
    let ok = dampedStep(n, data, s.m, lambda);
    if (ok) {
      capStep(model, ik.dq);
      // clamping loop: freeze joints that hit a limit and re-solve (at most n times)
      for (let pass = 0; pass < n && projectTrial(model, data, q); pass++) {
        ok = dampedStep(n, data, s.m, lambda);
        if (!ok) break;
        capStep(model, ik.dq);
      }
    }
    if (!ok) {
      mu *= 10;
      stall++;
      continue;
    }
    evaluate(model, data, qTrial, target, s);
    if (ev.E < E) {
      stall = ev.E > STALL_RATIO * E ? stall + 1 : 0;
      q.set(qTrial);
      E = ev.E; pos = ev.pos; rot = ev.rot;
      qBest.set(q);
      mu = mu > 1e-3 ? mu * 0.5 : mu;
      fkCurrent = true;
    } else {
      mu *= 10;
      stall++;
      fkCurrent = false;
    }
  }
  out.iterations = it;
  out.E = E;
  out.pos = pos;
  out.rot = rot;
}

function settingsOf(model: ArmModel, options: IkOptions | undefined): Settings {
  const mode = options?.mode ?? IK_DEFAULTS.mode;
  if (mode !== "pose" && mode !== "axis" && mode !== "point") throw new RangeError(`mode: must be pose, axis or point, got ${String(mode)}`);
  const tolP = options?.positionTolerance ?? IK_DEFAULTS.positionTolerance;
  const tolR = mode === "point" ? Infinity : options?.rotationTolerance ?? IK_DEFAULTS.rotationTolerance;
  const maxIterations = options?.maxIterations ?? IK_DEFAULTS.maxIterations;
  if (!(tolP > 0)) throw new RangeError("positionTolerance: must be > 0");
  if (!(tolR > 0)) throw new RangeError("rotationTolerance: must be > 0");
  if (!(maxIterations >= 1)) throw new RangeError("maxIterations: must be ≥ 1");
  if (options?.initial !== undefined && options.initial.length !== model.n) {
    throw new RangeError(`initial: wrong size, expected ${model.n}, got ${options.initial.length}`);
  }
  return { mode, m: taskRowCount(mode), tolP, tolR, maxIterations };
}

/** Upper bound on the distance from frame 0's origin to the tool point over all configurations. */
function reachBound(model: ArmModel): number {
  return model.reach;
}

/**
 * A joint within this fraction of its range from a limit counts as stalled at that limit when a
 * search ends (the damped steps approach a limit slowly, so the best iterate of a search blocked by
 * a limit is near it rather than on it).
 */
export const IK_NEAR_LIMIT_FRACTION = 0.01;

function nearLimitBand(model: ArmModel, j: number): number {
  return Math.max(LIMIT_EPSILON, IK_NEAR_LIMIT_FRACTION * (model.upper[j] - model.lower[j]));
}

/**
 * Relative size below which a gradient counts as zero, against ‖Jₛ‖_F·‖eₛ‖ (the largest possible
 * ‖Jₛᵀeₛ‖): the best iterate is then (near) a stationary point of the error. Chosen loose (1 %)
 * because an attempt is abandoned once E stalls, a little before the stationary point itself.
 */
const IK_STATIONARY_TOLERANCE = 1e-2;

/**
 * Why a search ended without reaching the target, from the best iterate (FK, data.ik.err and
 * data.ik.jt at it). Position rows of the error and the Jacobian are divided by the arm's length
 * scale so metres and radians weigh alike here (only for this test, never in a reported figure).
 * The gradient of E is g = Jₛᵀeₛ (joint motion along g lowers the error, first order):
 * - `joint-limit`: a joint sits at a limit (within IK_NEAR_LIMIT_FRACTION of its range) and g would
 *   move it beyond that limit, by more than IK_STATIONARY_TOLERANCE of the largest possible
 *   gradient;
 * - `singularity`: otherwise, when g over the joints free to move is below that tolerance: no
 *   joint motion lowers the remaining error, so the error lies along a direction the arm cannot
 *   move in at this configuration (a singularity, or a motion its structure lacks);
 * - `budget`: otherwise: the attempts ended (iterations spent, or progress too slow) away from a
 *   limit and from a stationary point, so the search says nothing about reachability.
 * Writes `ev.gradient` only.
 */
function classifyStall(model: ArmModel, data: ArmData, s: Settings, q: ArrayLike<number>): IkCause {
  const n = model.n, jt = data.ik.jt, e = data.ik.err;
  const L = model.lengthScale > 0 ? model.lengthScale : 1;
  let jNorm2 = 0, eNorm2 = 0;
  for (let r = 0; r < s.m; r++) {
    const w = r < 3 ? 1 / L : 1;
    eNorm2 += (e[r] * w) ** 2;
    for (let j = 0; j < n; j++) jNorm2 += (jt[r * n + j] * w) ** 2;
  }
  const scale = Math.sqrt(jNorm2 * eNorm2);
  if (!(scale > 0)) return "singularity";
  let blocked = false, free2 = 0;
  for (let j = 0; j < n; j++) {
    let g = 0;
    for (let r = 0; r < s.m; r++) g += jt[r * n + j] * e[r] * (r < 3 ? 1 / (L * L) : 1);
    const eps = nearLimitBand(model, j);
    const atLower = q[j] <= model.lower[j] + eps, atUpper = q[j] >= model.upper[j] - eps;
    if ((atLower && g < 0) || (atUpper && g > 0)) {
      if (Math.abs(g) > IK_STATIONARY_TOLERANCE * scale) blocked = true;
      continue;
    }
    free2 += g * g;
  }
  if (blocked) return "joint-limit";
  ev.gradient = Math.sqrt(free2) / scale;
  return ev.gradient <= IK_STATIONARY_TOLERANCE ? "singularity" : "budget";
}

/** Distance of the target from frame 0's origin and the reach bound (m); beyond when farther than the bound. */
function reachCheck(model: ArmModel, target: ArrayLike<number>, tolP: number): { beyond: boolean; dist: number; bound: number } {
  const bound = reachBound(model);
  const b = model.base;
  const dist = Math.hypot(target[3] - b[3], target[7] - b[7], target[11] - b[11]);
  return { beyond: dist > bound + tolP, dist, bound };
}

function beyondText(r: { dist: number; bound: number }): string {
  return `target is ${r.dist.toPrecision(4)} m from the base, beyond the arm's largest possible reach of ${r.bound.toPrecision(4)} m`;
}

/** Words for a not-reached cause (appended to the residuals). */
function causeText(cause: IkCause): string {
  switch (cause) {
    case "joint-limit": return "; stalled with a joint at a limit that blocks the remaining error";
    case "singularity": return "; stalled where no joint motion lowers the remaining error (a singularity, or a motion the arm cannot make)";
    case "budget": return "; the search ended without converging, away from a limit or a singularity";
    default: return "";
  }
}

/** Fills the result's final diagnostics at q (FK, errors, σ_min of the task Jacobian). */
function finish(
  model: ArmModel,
  data: ArmData,
  target: ArrayLike<number>,
  s: Settings,
  q: Float64Array,
  iterations: number,
  restarts: number,
  reasonIfReached: string,
  reasonIfNot: string,
  beyond = false,
): IkResult {
  const out = new Float64Array(model.n);
  const inLimits = wrapToLimits(model, q, out);
  evaluate(model, data, out, target, s);
  const pos = ev.pos, rot = s.mode === "point" ? 0 : ev.rot;
  taskJacobian(model, data, s);
  const sigma = minSingularValue(data.ik.jt, s.m, model.n, data.ik.gram);
  const reached = inLimits && pos <= s.tolP && (s.mode === "point" || rot <= s.tolR);
  const cause: IkCause = reached ? "reached" : beyond ? "beyond-reach" : classifyStall(model, data, s, out);
  return {
    status: reached ? "reached" : "not-reached",
    cause,
    q: out,
    positionError: pos,
    rotationError: rot,
    iterations,
    restarts,
    minSingularValue: sigma,
    reason: reached ? reasonIfReached : reasonIfNot,
  };
}

function notReachedText(model: ArmModel, s: Settings, res: IkResult, tail: string): string {
  return `${tail}; best position error ${res.positionError.toExponential(2)} m` +
    (s.mode === "point" ? "" : `, rotation error ${res.rotationError.toExponential(2)} rad`) +
    (res.cause === "beyond-reach" ? "" : describeLimits(model, res.q) + causeText(res.cause));
}

function describeLimits(model: ArmModel, q: ArrayLike<number>): string {
  const at: number[] = [];
  for (let i = 0; i < model.n; i++) {
    const eps = nearLimitBand(model, i);
    if (q[i] <= model.lower[i] + eps || q[i] >= model.upper[i] - eps) at.push(i + 1);
  }
  return at.length ? `; best iterate has joint${at.length > 1 ? "s" : ""} ${at.join(", ")} at a limit (within ${IK_NEAR_LIMIT_FRACTION * 100} % of the range)` : "";
}

/**
 * Inverse kinematics for one target pose (`target`: row-major 4×4 of the tool point in the arm's
 * world frame, i.e. including `model.base`). Returns "reached" when the position error is within
 * `positionTolerance`, the rotation error within `rotationTolerance` (pose and axis modes) and
 * every joint within its limits (revolute answers wrapped by 2π into the limits); otherwise
 * "not-reached" with the best residual found within the budget of 1 + `maxRestarts` attempts of at
 * most `maxIterations` steps. Never throws for a numerical outcome.
 *
 * Writes data.frames/flange/toolPose (at the returned q), data.jacobian and data.ik scratch. The
 * iteration loop does not allocate; each call allocates a few small objects (the restart
 * generator, the neutral start when `initial` is absent, the result and its `q`).
 *
 * @throws RangeError on a foreign `data`, a malformed target, or invalid options.
 */
export function solveIk(model: ArmModel, data: ArmData, target: ArrayLike<number>, options?: IkOptions): IkResult {
  const s = settingsOf(model, options);
  const initial = options?.initial ?? neutralConfiguration(model);
  checkArgs(model, data, initial);
  checkTarget(target);
  const maxRestarts = options?.maxRestarts ?? IK_DEFAULTS.maxRestarts;
  const rng = createRng(options?.seed ?? IK_DEFAULTS.seed);
  const ik = data.ik, n = model.n;
  const reach = reachCheck(model, target, s.tolP);
  const beyond = reach.beyond;
  const outcome: AttemptOutcome = { reached: false, iterations: 0, E: 0, pos: 0, rot: 0 };
  let bestE = Infinity, iterations = 0, attempt = 0;
  for (; attempt <= maxRestarts; attempt++) {
    if (attempt === 0) {
      for (let j = 0; j < n; j++) ik.q[j] = projectJoint(model, j, initial[j]);
    } else {
      randomConfiguration(model, rng, ik.q);
    }
    descend(model, data, target, s, outcome);
    iterations += outcome.iterations;
    if (outcome.E < bestE || outcome.reached) {
      bestE = outcome.E;
      ik.qBestAll.set(ik.qBest);
    }
    if (outcome.reached || beyond) break;
  }
  const restarts = Math.min(attempt, maxRestarts);
  const tail = beyond ? beyondText(reach) : `not reached after ${restarts + 1} attempt${restarts ? "s" : ""} (${iterations} iterations)`;
  const res = finish(model, data, target, s, ik.qBestAll, iterations, restarts, `reached in attempt ${restarts + 1} after ${iterations} iterations`, "", beyond);
  if (res.status === "not-reached") res.reason = notReachedText(model, s, res, tail);
  return res;
}

/**
 * Several distinct IK solutions (different branches: elbow up/down, wrist flip, shoulder left/
 * right, or distinct points of a redundant arm's self-motion) for one target. Runs up to
 * 1 + `maxRestarts` attempts (the first from `initial`, the rest from seeded random starts) and
 * keeps each reached answer that differs from every kept one by at least `distinctThreshold` in
 * some joint (revolute joints compared modulo 2π). Stops at `maxSolutions`. Returns the reached
 * solutions in the order found; when none is reached, a single "not-reached" result with the best
 * residual. Allocates the results.
 */
export function solveIkMulti(model: ArmModel, data: ArmData, target: ArrayLike<number>, options?: IkMultiOptions): IkResult[] {
  const s = settingsOf(model, options);
  const initial = options?.initial ?? neutralConfiguration(model);
  checkArgs(model, data, initial);
  checkTarget(target);
  const maxRestarts = options?.maxRestarts ?? IK_DEFAULTS.maxRestarts;
  const maxSolutions = options?.maxSolutions ?? IK_DEFAULTS.maxSolutions;
  const threshold = options?.distinctThreshold ?? IK_DEFAULTS.distinctThreshold;
  if (!(maxSolutions >= 1)) throw new RangeError("maxSolutions: must be ≥ 1");
  const rng = createRng(options?.seed ?? IK_DEFAULTS.seed);
  const ik = data.ik, n = model.n;
  const found: IkResult[] = [];
  const outcome: AttemptOutcome = { reached: false, iterations: 0, E: 0, pos: 0, rot: 0 };
  let bestE = Infinity, iterations = 0, attempts = 0;
  const qBestAll = new Float64Array(n);
  const reach = reachCheck(model, target, s.tolP);
  // Beyond the largest possible reach: one attempt gives the nearest miss; restarts cannot help.
  const lastAttempt = reach.beyond ? 0 : maxRestarts;
  for (let attempt = 0; attempt <= lastAttempt && found.length < maxSolutions; attempt++) {
    attempts = attempt + 1;
    if (attempt === 0) for (let j = 0; j < n; j++) ik.q[j] = projectJoint(model, j, initial[j]);
    else randomConfiguration(model, rng, ik.q);
    descend(model, data, target, s, outcome);
    iterations += outcome.iterations;
    if (outcome.E < bestE) {
      bestE = outcome.E;
      qBestAll.set(ik.qBest);
    }
    if (!outcome.reached) continue;
    const candidate = finish(model, data, target, s, ik.qBest, iterations, attempt, `reached in attempt ${attempt + 1}`, "");
    if (candidate.status !== "reached") continue;
    if (found.every((f) => maxJointDistance(model, f.q, candidate.q) >= threshold)) found.push(candidate);
  }
  if (found.length > 0) return found;
  const res = finish(model, data, target, s, qBestAll, iterations, attempts - 1, "", "", reach.beyond);
  const tail = reach.beyond ? beyondText(reach) : `not reached after ${attempts} attempt${attempts === 1 ? "" : "s"} (${iterations} iterations)`;
  res.reason = notReachedText(model, s, res, tail);
  return [res];
}
