/**
 * Per-target analysis: every distinct IK branch, the dexterity of each and its collision check in
 * the cell, the branch chosen (collision-free first, then the required clearance, then the best
 * dexterity margin), and the statics of the chosen one (holding the tool and payload, payload
 * capacity, force ellipsoid at the payload CoG, the exact capability for a required force/moment,
 * and the wrist load check). A target is reached only by a branch with no collision.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet, Target } from "@/shared/schemas/requirements";
import { computeJacobian, createRng, IK_NEAR_LIMIT_FRACTION, jointAxisWorld, maxJointDistance, randomConfiguration, solveIk, solveIkMulti, transformPointRigid, type ArmModel, type IkResult } from "@/lib/kinematics";
import { checkCell, contactMask, pairNames, type CellCheck } from "./cell";
import type { ArmContext } from "./context";
import { centredCopy, type JointCopyChoice } from "./copies";
import { dexterityAt, DEXTERITY_MARGINAL_THRESHOLD, type DexterityReport } from "./dexterity";
import { deg, mm, num, pct } from "@/shared/format";
import { quoteBody } from "./bodies";
import { poseFromRpy, rotationOf, mul4 } from "./geometry";
import {
  capacityAlong, ellipsoidEstimateAlong, forceEllipsoid, gravityTorque, payloadCapacity, transposeTimes, wristAxisLoad,
  type CapacityResult, type ForceEllipsoid, type WristBody,
} from "./statics";
import { worseVerdict, type Verdict } from "./types";
import { STANDARD_GRAVITY } from "@/shared/units";

/** A required force counts as `marginal` when the capability exceeds it by less than this fraction. */
export const FORCE_MARGINAL_FRACTION = 0.2;

/** Search budget for one target. */
export interface TargetBudget {
  /** Random restarts after the first attempt (solveIkMulti's maxRestarts). */
  restarts: number;
  /** Most distinct branches kept. */
  maxSolutions: number;
  /** Iterations per attempt. */
  maxIterations: number;
  /**
   * Restarts of a second, single-branch search run only when the first found no solution and the
   * target is not beyond the arm's largest possible reach. A numerical search that gives up is not
   * proof that a pose is unreachable (docs/references.md#ik-solver-benchmarks: single-seed solvers miss 2–79 % of
   * reachable targets), so a "not reached" verdict is only given after this larger budget.
   */
  escalatedRestarts: number;
}
export const DEFAULT_TARGET_BUDGET: TargetBudget = { restarts: 12, maxSolutions: 4, maxIterations: 60, escalatedRestarts: 60 };

/** A compact summary of one IK branch. */
interface SolutionSummary {
  /**
   * Joint values (rad or m): for a revolute joint with several in-limit copies 2π apart, the copy
   * farthest from its limits (see `copies`).
   */
  q: number[];
  /** Joints whose angle has more than one in-limit copy: the copy reported and the others (rad). */
  copies: JointCopyChoice[];
  /** Dexterity margin D ∈ [0, 1]. */
  margin: number;
  limiting: DexterityReport["limiting"];
  translationInverseCondition: number;
  /** 1/κ of the full three-direction orientation block (rotations keeping the TCP still). */
  orientationInverseCondition: number;
  /** `axis` targets: σ₂/σ₁ of that block on the tool's x and y axes, the factor the margin uses; null otherwise. */
  axisOrientationInverseCondition: number | null;
  jointLimitMargin: number;
  /** No collision in the cell at this configuration (null when the cell checks nothing for this arm). */
  collisionFree: boolean | null;
  /** Smallest distance over the checked pairs (m; 0 when colliding), or null. */
  clearance: number | null;
}

/** A pair of bodies by name (arm bodies "base", "link k", "tool", "payload", or an obstacle's name). */
interface BodyPairDistance {
  a: string;
  b: string;
  /** Separation (m), 0 when they touch or overlap. */
  distance: number;
  /** Closest points in the cell frame (m) when known. */
  pointA: number[] | null;
  pointB: number[] | null;
}

/** The cell at a target: the chosen (or least-colliding) configuration's collision check. */
interface TargetCell {
  /** The configuration reported has no collision. */
  collisionFree: boolean;
  /** Required clearance (m) and the smallest distance over the counted pairs (m; null when nothing is counted). */
  required: number;
  clearance: number | null;
  /** The pair at that distance. */
  closest: BodyPairDistance | null;
  /** The deepest overlap (when colliding): the pair and the depth (m). */
  collision: { a: string; b: string; depth: number } | null;
  /** Branches found and how many of them collide. */
  branches: number;
  colliding: number;
  /**
   * When every branch collides: the collision-free configuration of the search closest to the
   * target, by its position and rotation errors (m, rad); null when none was found.
   */
  freeMiss: { positionError: number; rotationError: number } | null;
  /** Obstacle names the tool and payload may touch here (the target's contact list). */
  contact: string[];
}

/** Holding the tool and payload still at the chosen configuration. */
interface HoldingCheck {
  verdict: Verdict;
  reason: string;
  /** τ_hold with links, tool and payload (N·m or N per joint). */
  gravityTorque: number[];
  /** |τ_hold,i| / maxTorque_i per joint (null where no limit). */
  torqueUtilisation: (number | null)[];
  /** Largest extra mass at the payload CoG on top of the tool and the payload (kg), or null. */
  extraPayloadCapacity: number | null;
  /**
   * Largest payload mass at the payload CoG the pose can hold with the tool as given (its mass at
   * the tool's CoG) and the arm's own links (kg): payload + extra with torque limits (also when the
   * given payload is too heavy), rated payload − tool mass on the datasheet basis; null when
   * unknown or unbounded.
   */
  holdablePayload: number | null;
  /**
   * Tool + holdable payload (kg): the total load the pose holds, the tool's mass at the tool CoG and
   * the payload's at the payload CoG (not all of it at the payload CoG); 0 when the pose cannot hold
   * the tool and payload given; the rated payload on the datasheet basis; or null.
   */
  payloadCapacity: number | null;
  limitingJoint: number | null;
  /** "torque-limits" (exact), "rated-payload" (datasheet fallback) or "none". */
  basis: "torque-limits" | "rated-payload" | "none";
}

/** A required force/moment at the target against the exact capability. */
interface ForceCheck {
  verdict: Verdict;
  reason: string;
  /** Required force and moment applied by the tool at the TCP (cell frame, N and N·m). */
  force: number[];
  moment: number[];
  /** Largest scale s of the required wrench the joints can apply (s ≥ 1: met), or null. */
  capacityRatio: number | null;
  /** s·|F| (N) and s·|M| (N·m): the capability along the required direction. */
  forceCapacity: number | null;
  momentCapacity: number | null;
  status: CapacityResult["status"];
  limitingJoint: number | null;
  /**
   * The torque-limit ellipsoid's estimate of s for the full 6-D wrench at the TCP, 1/‖W⁻¹·Jᵀ·w‖
   * with the 6×n Jacobian at the TCP (ignores gravity, inscribes the torque box): shown beside the
   * exact figure, never used. Not the drawn force ellipsoid, which is the 3-D one at the payload CoG
   * (`TargetAnalysis.forceEllipsoid`).
   */
  ellipsoidEstimateRatio: number | null;
}

/** Load on one wrist axis against the datasheet's allowable values. */
interface WristAxisCheck {
  joint: number;
  momentAtPose: number;
  momentWorstCase: number;
  inertia: number;
  inertiaComplete: boolean;
  allowableMoment: number | null;
  allowableInertia: number | null;
  verdict: Verdict;
  reason: string;
}

interface WristCheck {
  verdict: Verdict;
  reason: string;
  axes: WristAxisCheck[];
}

/** Everything about one (arm, target). */
export interface TargetAnalysis {
  name: string;
  mode: Target["mode"];
  verdict: Verdict;
  /** One sentence a person can read. */
  reason: string;
  reached: boolean;
  /** Best residuals (m, rad) of the chosen branch or of the best failed attempt. */
  positionError: number;
  rotationError: number;
  /** IK's own account (attempts, iterations, why it ended). */
  ikReason: string;
  /** Distinct reached branches (empty when not reached). */
  solutions: SolutionSummary[];
  /** Index into `solutions` of the chosen branch (best dexterity margin), or null. */
  chosen: number | null;
  /** Full dexterity report of the chosen branch. */
  dexterity: DexterityReport | null;
  /**
   * 3-D force ellipsoid at the payload CoG (translational rows of the Jacobian there, torque-limit
   * weighted; chosen branch): the one to draw. The force check's ellipsoid estimate is a different
   * figure (6-D wrench at the TCP).
   */
  forceEllipsoid: ForceEllipsoid | null;
  holding: HoldingCheck | null;
  force: ForceCheck | null;
  wrist: WristCheck | null;
  /** The collision check in the cell (null when the cell checks nothing for this arm, or the target is not reached by IK at all). */
  cell: TargetCell | null;
}

/** Extra random starts (IK descents) tried for a collision-free near miss when every branch collides. */
const FREE_MISS_ATTEMPTS = 16;

/** The target's pose in the cell frame (row-major 4×4). */
function targetPose(t: Pick<Target, "position" | "rpy">): Float64Array {
  return poseFromRpy(t.position, t.rpy);
}

/** Optional wall-clock accounting of the parts (benchmark only; never part of a result). */
interface StageClock {
  now(): number;
  add(stage: "ik" | "dexterity" | "statics", ms: number): void;
}

/** Analyses one target for one arm (allocates its result). `seed` makes the restarts deterministic. */
export function analyzeTarget(ctx: ArmContext, arm: ArmDocument, req: RequirementSet, target: Target, budget: TargetBudget, seed: number, clock?: StageClock): TargetAnalysis {
  const { model, data } = ctx;
  const pose = targetPose(target);
  let t0 = clock?.now() ?? 0;
  const lap = (stage: "ik" | "dexterity" | "statics") => {
    if (!clock) return;
    const t1 = clock.now();
    clock.add(stage, t1 - t0);
    t0 = t1;
  };
  const results = solveIkMulti(model, data, pose, {
    mode: target.mode, positionTolerance: target.positionTolerance, rotationTolerance: target.rotationTolerance,
    maxRestarts: budget.restarts, maxSolutions: budget.maxSolutions, maxIterations: budget.maxIterations, seed,
  });
  if (!results.some((r) => r.status === "reached") && results[0].cause !== "beyond-reach" && budget.escalatedRestarts > budget.restarts) {
    const retry = solveIkMulti(model, data, pose, {
      mode: target.mode, positionTolerance: target.positionTolerance, rotationTolerance: target.rotationTolerance,
      maxRestarts: budget.escalatedRestarts, maxSolutions: 1, maxIterations: budget.maxIterations, seed: seed + 0x9e3779b9,
    });
    if (retry[0].status === "reached" || retry[0].positionError < results[0].positionError) results.splice(0, results.length, ...retry);
  }
  lap("ik");
  const reached = results.filter((r) => r.status === "reached");
  const base = { name: target.name, mode: target.mode };
  if (reached.length === 0) {
    const best = results[0];
    const reason = `not reached after ${best.restarts} restart${best.restarts === 1 ? "" : "s"}: best position error ${mm(best.positionError)}` +
      (target.mode === "point" ? "" : `, rotation error ${deg(best.rotationError)}`) + ` (${missText(best, model)})`;
    return {
      ...base, verdict: "fails", reason, reached: false, positionError: best.positionError, rotationError: best.rotationError,
      ikReason: best.reason, solutions: [], chosen: null, dexterity: null, forceEllipsoid: null, holding: null, force: null, wrist: null, cell: null,
    };
  }
  const cellOn = ctx.cell.active;
  const exempt = cellOn ? contactMask(ctx.cell, target.contact) : null;
  const required = ctx.cell.clearance;
  const checks: CellSummary[] = [];
  const checkOf = (q: Float64Array): CellSummary => summarise(ctx, checkCell(ctx.cell, ctx.cellData, model, data, q, exempt, ctx.check));
  // Each solution as its in-limit copy farthest from the joint limits (copies.ts): same pose, larger margin.
  const centred = reached.map((r) => centredCopy(model, r.q));
  if (cellOn) for (const c of centred) checks.push(checkOf(c.q));
  if (cellOn && !checks.some((c) => c.free)) {
    // Every branch found collides: look wider for a free one before saying so.
    const more = solveIkMulti(model, data, pose, {
      mode: target.mode, positionTolerance: target.positionTolerance, rotationTolerance: target.rotationTolerance,
      maxRestarts: 2 * budget.restarts, maxSolutions: 2 * budget.maxSolutions, maxIterations: budget.maxIterations, seed: seed + 0x51ed2701,
    }).filter((r) => r.status === "reached");
    for (const r of more) {
      const c = centredCopy(model, r.q);
      if (centred.some((x) => maxJointDistance(model, x.q, c.q) < 0.1)) continue;
      reached.push(r);
      centred.push(c);
      checks.push(checkOf(c.q));
    }
  }
  const reports: DexterityReport[] = centred.map((c) => {
    computeJacobian(model, data, c.q, ctx.jac);
    return dexterityAt(ctx.jac, model.n, model, c.q, target.mode, ctx.ranks, data.toolPose);
  });
  // collision-free first, then the required clearance, then the dexterity margin
  const rank = (i: number) => (cellOn ? (checks[i].free ? 2 : 0) + (checks[i].free && checks[i].clearance >= required ? 1 : 0) : 0);
  let chosen = 0, bestMargin = 0;
  for (let i = 1; i < reports.length; i++) {
    if (rank(i) > rank(chosen) || (rank(i) === rank(chosen) && reports[i].margin > reports[chosen].margin)) chosen = i;
    if (reports[i].margin > reports[bestMargin].margin) bestMargin = i;
  }
  const solutions: SolutionSummary[] = reached.map((_, i) => ({
    q: Array.from(centred[i].q), copies: centred[i].copies, margin: reports[i].margin, limiting: reports[i].limiting,
    translationInverseCondition: reports[i].translation.inverseCondition,
    orientationInverseCondition: reports[i].orientation.inverseCondition,
    axisOrientationInverseCondition: reports[i].axisOrientation?.inverseCondition ?? null,
    jointLimitMargin: reports[i].jointLimits.margin,
    collisionFree: cellOn ? checks[i].free : null,
    clearance: cellOn ? (checks[i].free ? checks[i].clearance : 0) : null,
  }));
  const q = centred[chosen].q;
  const dex = reports[chosen];
  const n = model.n;
  lap("dexterity");

  if (cellOn && !checks[chosen].free) {
    // Every branch collides: not reached. Report the least overlap and the nearest free configuration.
    let least = 0;
    for (let i = 1; i < checks.length; i++) if (checks[i].depth < checks[least].depth) least = i;
    const miss = freeMiss(ctx, pose, target, budget, seed, exempt);
    const col = checks[least];
    const cell: TargetCell = {
      collisionFree: false, required, clearance: null, closest: null, collision: { a: col.a, b: col.b, depth: col.depth },
      branches: checks.length, colliding: checks.length, freeMiss: miss, contact: target.contact ?? [],
    };
    const every = checks.length === 1 ? "the only branch found collides" : `every branch found collides (${checks.length}), the least`;
    const reason = `reached by inverse kinematics, but ${every}: ${col.a} hits ${quoteBody(col.b)}, overlap ${mm(col.depth)}` +
      (miss ? `; the nearest collision-free configuration the search found misses the target by ${mm(miss.positionError)}${target.mode === "point" ? "" : ` and ${deg(miss.rotationError)}`}` : "; the search found no collision-free configuration near the target");
    return {
      ...base, verdict: "fails", reason, reached: false,
      positionError: miss ? miss.positionError : reached[least].positionError, rotationError: miss ? miss.rotationError : reached[least].rotationError,
      ikReason: reached[least].reason, solutions, chosen: null, dexterity: null, forceEllipsoid: null, holding: null, force: null, wrist: null, cell,
    };
  }

  // Statics at the chosen configuration.
  const tauHold = gravityTorque(model, data, q, ctx.loads, ctx.jac);
  computeJacobian(model, data, q, ctx.jac, req.payload.cog);
  const ellipsoid = forceEllipsoid(ctx.jac, n, model.maxTorque);
  const holding = holdingCheck(ctx, arm, tauHold);
  let force: ForceCheck | null = null;
  if (target.force || target.moment) {
    computeJacobian(model, data, q, ctx.jac); // at the TCP, where the tool applies the wrench
    force = forceCheck(ctx, tauHold, target.force ?? [0, 0, 0], target.moment ?? [0, 0, 0]);
  }
  const wrist = wristCheck(ctx, arm, req, q);
  lap("statics");

  let verdict: Verdict = dex.marginal ? "marginal" : "meets";
  const parts: string[] = [`reached with dexterity margin ${num(dex.margin)}`];
  if (dex.marginal || dex.limiting.value < 0.5) parts.push(`limiting: ${describeLimit(dex)}`);
  if (dex.marginal) parts.push(`below the ${num(DEXTERITY_MARGINAL_THRESHOLD, 1)} threshold`);
  if (reached.length > 1) parts.push(`${reached.length} branches found`);
  let cell: TargetCell | null = null;
  if (cellOn) {
    const c = checks[chosen];
    const colliding = checks.filter((x) => !x.free).length;
    cell = {
      collisionFree: true, required, clearance: Number.isFinite(c.clearance) ? c.clearance : null,
      closest: c.closest, collision: null, branches: checks.length, colliding, freeMiss: null, contact: target.contact ?? [],
    };
    if (colliding > 0) {
      const first = checks.find((x) => !x.free)!;
      parts.push(`${colliding} of ${checks.length} branches collide (${first.a} hits ${quoteBody(first.b)}, overlap ${mm(first.depth)})${chosen !== bestMargin && !checks[bestMargin].free ? ": chose a collision-free one over the best-dexterity one" : ""}`);
    }
    if (c.closest && Number.isFinite(c.clearance)) {
      if (c.clearance < required) {
        verdict = worseVerdict(verdict, "marginal");
        parts.push(`clearance ${mm(c.clearance)} between ${c.closest.a} and ${quoteBody(c.closest.b)}, below the required ${mm(required)}`);
      } else parts.push(`clearance ${mm(c.clearance)} (${c.closest.a} to ${quoteBody(c.closest.b)})`);
    }
  }
  for (const c of centred[chosen].copies) {
    const room = (v: number) => Math.min(v - model.lower[c.joint - 1], model.upper[c.joint - 1] - v);
    const tie = c.others.every((o) => room(o) >= room(c.chosen) - 1e-9);
    const others = `${c.others.length > 1 ? "copies" : "copy"} at ${c.others.map(deg).join(", ")}`;
    parts.push(`joint ${c.joint} at ${deg(c.chosen)} (${tie ? `as far from its limits as its ${others}` : `its ${others} ${c.others.length > 1 ? "are" : "is"} nearer a limit`})`);
  }
  if (holding.verdict !== "meets") { verdict = worseVerdict(verdict, holding.verdict); parts.push(holding.reason); }
  if (force) { verdict = worseVerdict(verdict, force.verdict); parts.push(force.reason); }
  if (wrist.verdict === "fails" || wrist.verdict === "marginal") { verdict = worseVerdict(verdict, wrist.verdict); parts.push(wrist.reason); }
  return {
    ...base, verdict, reason: parts.join("; "), reached: true,
    positionError: reached[chosen].positionError, rotationError: reached[chosen].rotationError, ikReason: reached[chosen].reason,
    solutions, chosen, dexterity: dex, forceEllipsoid: ellipsoid, holding, force, wrist, cell,
  };
}

/** One configuration's check, by names (allocates; not a hot path). */
interface CellSummary {
  free: boolean;
  clearance: number;
  closest: BodyPairDistance | null;
  /** The deepest overlapping pair and its depth (when colliding). */
  a: string;
  b: string;
  depth: number;
}

function summarise(ctx: ArmContext, c: CellCheck): CellSummary {
  const cd = ctx.cellData;
  let closest: BodyPairDistance | null = null;
  if (c.clearancePair >= 0) {
    const [a, b] = pairNames(ctx.cell, c.clearancePair);
    const pp = 6 * c.clearancePair, P = cd.pairPoints;
    closest = { a, b, distance: c.clearance, pointA: [P[pp], P[pp + 1], P[pp + 2]], pointB: [P[pp + 3], P[pp + 4], P[pp + 5]] };
  }
  const [a, b] = c.collisionPair >= 0 ? pairNames(ctx.cell, c.collisionPair) : ["", ""];
  return { free: c.collisionFree, clearance: c.clearance, closest, a, b, depth: c.collisionDepth };
}


/**
 * The collision-free configuration closest to the target among seeded IK descents (each from a
 * random in-limit start, reached or not), by position error then rotation error; null when every
 * one collides.
 */
function freeMiss(ctx: ArmContext, pose: Float64Array, target: Target, budget: TargetBudget, seed: number, exempt: Uint8Array | null): { positionError: number; rotationError: number } | null {
  const { model, data } = ctx;
  const rng = createRng((seed ^ 0x2545f491) >>> 0 || 1);
  const start = new Float64Array(model.n);
  let best: { positionError: number; rotationError: number } | null = null;
  for (let k = 0; k < FREE_MISS_ATTEMPTS; k++) {
    randomConfiguration(model, rng, start);
    const r = solveIk(model, data, pose, {
      mode: target.mode, positionTolerance: target.positionTolerance, rotationTolerance: target.rotationTolerance,
      initial: start, maxRestarts: 0, maxIterations: budget.maxIterations,
    });
    if (!checkCell(ctx.cell, ctx.cellData, model, data, r.q, exempt, ctx.check).collisionFree) continue;
    const rot = target.mode === "point" ? 0 : r.rotationError;
    if (!best || r.positionError < best.positionError || (r.positionError === best.positionError && rot < best.rotationError)) best = { positionError: r.positionError, rotationError: rot };
  }
  return best;
}

/** A miss this close (m) is reported as close: more search might reach it. */
const CLOSE_MISS = 0.005;

/** Words for why a target was not reached, from the IK result's structured cause. */
function missText(best: IkResult, model: ArmModel): string {
  switch (best.cause) {
    case "beyond-reach": return "beyond the arm's largest possible reach: no configuration gets there";
    case "joint-limit": {
      const joints = limitJoints(model, best.q);
      return `the search stalled with joint${joints.length > 1 ? "s" : ""} ${joints.join(", ")} at a limit: the pose is likely excluded by the joint limits`;
    }
    case "singularity": return "the search stalled where no joint motion brings the tool closer: likely outside the reachable workspace, or an orientation this arm's axes cannot make";
    default: return best.positionError <= CLOSE_MISS
      ? "close: the search budget ran out; check with the maker's tools"
      : "the search budget ran out away from a limit or a singularity: the target may still be reachable; check with the maker's tools";
  }
}

/** 1-based joints within IK_NEAR_LIMIT_FRACTION of their range from a limit. */
function limitJoints(model: ArmModel, q: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let i = 0; i < model.n; i++) {
    const band = IK_NEAR_LIMIT_FRACTION * (model.upper[i] - model.lower[i]);
    if (q[i] <= model.lower[i] + band || q[i] >= model.upper[i] - band) out.push(i + 1);
  }
  return out;
}

/** Words for the limiting factor of a dexterity report. */
function describeLimit(d: DexterityReport): string {
  switch (d.limiting.factor) {
    case "translation": return `translational conditioning 1/κ = ${num(d.limiting.value, 3)} (arm near stretched or folded)`;
    case "orientation": return `wrist conditioning 1/κ = ${num(d.limiting.value, 3)}${d.axisOrientation ? " over the constrained rotations (about the tool x and y axes)" : ""} (near a wrist singularity)`;
    default: return `joint ${d.limiting.joint} near its limit (margin ${num(d.jointLimits.margin, 3)})`;
  }
}

function holdingCheck(ctx: ArmContext, arm: ArmDocument, tauHold: Float64Array): HoldingCheck {
  const { model } = ctx;
  const n = model.n;
  const util = Array.from({ length: n }, (_, i) => (model.maxTorque[i] > 0 ? Math.abs(tauHold[i]) / model.maxTorque[i] : null));
  const common = { gravityTorque: Array.from(tauHold), torqueUtilisation: util };
  if (ctx.hasTorqueLimits) {
    // Jacobian at the payload CoG is in ctx.jac (set by the caller).
    const cap = payloadCapacity(tauHold, ctx.jac, n, model.maxTorque);
    // The payload alone at its CoG: τ without the payload's weight, then the ratio test along it.
    const mp = ctx.payloadMass;
    const perKg = new Float64Array(n);
    for (let c = 0; c < n; c++) perKg[c] = ctx.jac[2 * n + c] * STANDARD_GRAVITY;
    const withoutPayload = Float64Array.from(tauHold, (v, c) => v - mp * perKg[c]);
    const alone = capacityAlong(withoutPayload, perKg, model.maxTorque);
    const holdable = alone.status === "overloaded" ? 0 : alone.capacity;
    if (cap.status === "overloaded") {
      const j = cap.limitingJoint!;
      return {
        ...common, verdict: "fails",
        reason: `cannot hold the ${num(ctx.toolMass, 1)} kg tool and ${num(mp, 1)} kg payload here: joint ${j} needs ${pct(util[j - 1]!)} of its torque limit` +
          (holdable !== null && holdable > 0 ? ` (at most ${num(holdable, 1)} kg of payload at the payload CoG with this tool)` : ""),
        extraPayloadCapacity: 0, holdablePayload: holdable, payloadCapacity: 0, limitingJoint: j, basis: "torque-limits",
      };
    }
    const extra = cap.extraMass;
    const total = extra === null ? null : extra + ctx.loadMass;
    return {
      ...common, verdict: "meets",
      reason: extra === null ? "holds the load (no limited joint carries extra weight here)"
        : `holds up to ${num(holdable!, 1)} kg of payload at the payload CoG with the ${num(ctx.toolMass, 1)} kg tool (limiting joint ${cap.limitingJoint})`,
      extraPayloadCapacity: extra, holdablePayload: holdable, payloadCapacity: total, limitingJoint: cap.limitingJoint, basis: "torque-limits",
    };
  }
  const rated = arm.specs?.ratedPayload;
  if (ctx.loadMass === 0) return { ...common, verdict: "meets", reason: "no tool or payload mass", extraPayloadCapacity: null, holdablePayload: null, payloadCapacity: null, limitingJoint: null, basis: "none" };
  if (rated !== undefined) {
    const ok = ctx.loadMass <= rated;
    return {
      ...common, verdict: ok ? "meets" : "fails",
      reason: `${ok ? "" : "cannot hold: "}tool + payload ${num(ctx.loadMass, 2)} kg ${ok ? "within" : "exceeds"} the rated payload ${num(rated, 2)} kg (datasheet; no joint torque limits to check the pose)`,
      extraPayloadCapacity: rated - ctx.loadMass, holdablePayload: Math.max(0, rated - ctx.toolMass), payloadCapacity: rated, limitingJoint: null, basis: "rated-payload",
    };
  }
  return { ...common, verdict: "unknown", reason: `holding the ${num(ctx.loadMass, 2)} kg load not checked: no joint torque limits and no rated payload`, extraPayloadCapacity: null, holdablePayload: null, payloadCapacity: null, limitingJoint: null, basis: "none" };
}

function forceCheck(ctx: ArmContext, tauHold: Float64Array, force: readonly number[], moment: readonly number[]): ForceCheck {
  const { model } = ctx;
  const n = model.n;
  const fN = Math.hypot(force[0], force[1], force[2]), mN = Math.hypot(moment[0], moment[1], moment[2]);
  const w = [force[0], force[1], force[2], moment[0], moment[1], moment[2]];
  const b = transposeTimes(ctx.jac, 6, n, w);
  const r = capacityAlong(tauHold, b, model.maxTorque);
  const est = ellipsoidEstimateAlong(ctx.jac, 6, n, model.maxTorque, w);
  const what = fN > 0 && mN > 0 ? `${num(fN, 0)} N with ${num(mN, 1)} N·m` : fN > 0 ? `${num(fN, 0)} N` : `${num(mN, 1)} N·m`;
  const base = { force: [...force], moment: [...moment], status: r.status, limitingJoint: r.limitingJoint, ellipsoidEstimateRatio: est };
  if (r.status === "no-limits") {
    return { ...base, verdict: "unknown", reason: `required ${what} not checked: no joint torque limits on the datasheet`, capacityRatio: null, forceCapacity: null, momentCapacity: null };
  }
  if (r.status === "unbounded") {
    return { ...base, verdict: "meets", reason: `required ${what}: carried by the structure at this pose (no limited joint feels it)`, capacityRatio: null, forceCapacity: null, momentCapacity: null };
  }
  const s = r.capacity!;
  const cap = fN > 0 ? `${num(s * fN, 0)} N` : `${num(s * mN, 1)} N·m`;
  const estText = est === null ? "" : ` (6-D torque-ellipsoid estimate at the TCP ${fN > 0 ? `${num(est * fN, 0)} N` : `${num(est * mN, 1)} N·m`}, not used)`;
  const verdict: Verdict = s < 1 ? "fails" : s < 1 + FORCE_MARGINAL_FRACTION ? "marginal" : "meets";
  const reason = r.status === "overloaded"
    ? `required ${what} impossible: holding the load already exceeds joint ${r.limitingJoint}'s torque limit`
    : `${verdict === "fails" ? "cannot apply" : "can apply"} the required ${what}: capability ${cap} along it after gravity, limiting joint ${r.limitingJoint}${verdict === "marginal" ? ` (within ${pct(FORCE_MARGINAL_FRACTION)})` : ""}${estText}`;
  return { ...base, verdict, reason, capacityRatio: s, forceCapacity: fN > 0 ? s * fN : null, momentCapacity: mN > 0 ? s * mN : null };
}

function wristCheck(ctx: ArmContext, arm: ArmDocument, req: RequirementSet, q: Float64Array): WristCheck {
  const allow = arm.specs?.wristAllowables ?? [];
  if (allow.length === 0) return { verdict: "unknown", reason: "wrist load not checked: the datasheet gives no allowable wrist moments or inertias", axes: [] };
  if (ctx.loadMass === 0) return { verdict: "meets", reason: "no wrist load", axes: [] };
  const { model, data } = ctx;
  computeJacobian(model, data, q, ctx.jac); // runs FK: data.frames and data.toolPose at q
  const tcpPose = data.toolPose;
  const toolPointPose = mul4(tcpPose, ctx.tcpInverse);
  const bodies: WristBody[] = [
    { mass: req.tool.mass, cog: transformPointRigid(toolPointPose, req.tool.cog), rotation: rotationOf(toolPointPose), inertia: req.tool.inertia ?? null },
    { mass: req.payload.mass, cog: transformPointRigid(tcpPose, req.payload.cog), rotation: rotationOf(tcpPose), inertia: req.payload.inertia ?? null },
  ];
  const axes: WristAxisCheck[] = [];
  let verdict: Verdict = "meets";
  const reasons: string[] = [];
  for (const a of allow) {
    const ax = jointAxisWorld(model, data, a.joint, new Float64Array(6));
    const load = wristAxisLoad([ax[0], ax[1], ax[2]], [ax[3], ax[4], ax[5]], bodies);
    let v: Verdict = "meets";
    const why: string[] = [];
    if (a.moment !== undefined) {
      if (load.momentAtPose > a.moment) { v = "fails"; why.push(`moment ${num(load.momentAtPose)} N·m > allowable ${num(a.moment)} N·m`); }
      else if (load.momentWorstCase > a.moment) { v = worseVerdict(v, "marginal"); why.push(`moment ${num(load.momentAtPose)} N·m here but up to ${num(load.momentWorstCase)} N·m in other wrist orientations > allowable ${num(a.moment)} N·m`); }
    }
    if (a.inertia !== undefined) {
      if (load.inertia > a.inertia) { v = "fails"; why.push(`inertia ${num(load.inertia, 4)} kg·m² ${load.inertiaComplete ? "" : "(point-mass lower bound) "}> allowable ${num(a.inertia, 4)} kg·m²`); }
      else if (!load.inertiaComplete) { v = worseVerdict(v, "unknown"); why.push(`inertia not checked: tool or payload inertia not given (point-mass value ${num(load.inertia, 4)} kg·m²)`); }
    }
    if (a.moment === undefined && a.inertia === undefined) { v = "unknown"; why.push("no allowable values given"); }
    axes.push({ joint: a.joint, momentAtPose: load.momentAtPose, momentWorstCase: load.momentWorstCase, inertia: load.inertia, inertiaComplete: load.inertiaComplete, allowableMoment: a.moment ?? null, allowableInertia: a.inertia ?? null, verdict: v, reason: why.join("; ") || "within the allowable values" });
    verdict = worseVerdict(verdict, v);
    if (v !== "meets") reasons.push(`joint ${a.joint}: ${why.join("; ")}`);
  }
  return { verdict, reason: reasons.length ? `wrist load ${reasons.join("; ")}` : "wrist load within the allowable values", axes };
}
