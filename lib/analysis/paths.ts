/**
 * Path analysis: samples along the waypoints (position linear, orientation by slerp), IK by
 * continuation from the previous sample, configuration flips and limit hits, the exact achievable
 * tool speed at every sample (the largest multiple of the required task velocity the joints can
 * give under their speed limits and position limits, speed.ts), the speed the returned joint
 * trajectory itself allows, profiles of the smallest singular value and the dexterity margin, and
 * the cell: every sample checked for collisions and the motion between samples checked
 * conservatively (cell.ts), with the clearance along the path.
 */
import type { PathSpec } from "@/shared/schemas/requirements";
import { computeJacobian, solveIk, solveIkMulti, taskJacobianInto, taskRowCount, taskVelocityInto, type ArmModel, type IkResult } from "@/lib/kinematics";
import type { ArmContext } from "./context";
import { centredCopy } from "./copies";
import { dexterityAt, DEXTERITY_MARGINAL_THRESHOLD } from "./dexterity";
import { deg, mm, num, pct } from "@/shared/format";
import { quoteBody } from "./bodies";
import { poseFromQuaternion, poseFromRpy, quaternionOf, relativeRotation, slerp } from "./geometry";
import { determinant } from "./linalg";
import { AT_LIMIT_FRACTION, maxSpeedScale, speedBounds, type SpeedScale } from "./speed";
import { worseVerdict, type Verdict } from "./types";
import { checkCell, checkMotion, contactMask, pairNames } from "./cell";

/** A joint jump between neighbouring samples larger than this (rad) is a configuration flip. */
const FLIP_JUMP = (30 * Math.PI) / 180;
/** For prismatic joints: a jump larger than this fraction of the range is a flip. */
const FLIP_JUMP_PRISMATIC_FRACTION = 0.1;
/**
 * A joint within this normalised margin of a limit is a limit hit: 2·AT_LIMIT_FRACTION, i.e. within
 * 0.5 % of its range from an end, the band in which the exact speed lets it move only away from
 * that limit.
 */
export const LIMIT_HIT_MARGIN = 2 * AT_LIMIT_FRACTION;
/** The speed ratio needed for `meets`; between 1 and this it is `marginal` (20 % headroom). */
export const SPEED_MARGINAL_RATIO = 1.2;
/** Sampling step for rotation-only segments (rad). */
const ROTATION_STEP = (2 * Math.PI) / 180;

/** Budget for one path. */
export interface PathBudget {
  /** Samples per path at most; a finer step is coarsened to fit, and the result says so. */
  maxSamples: number;
  /** Iterations of the continuation step from the previous sample. */
  continuationIterations: number;
  /** Restarts when continuation fails at a sample. */
  fallbackRestarts: number;
  /**
   * Restart attempts allowed per traversal in all; once spent, samples get continuation only (a
   * path far out of reach would otherwise cost restarts at every sample). The result says so.
   */
  restartBudget: number;
  /** Distinct start branches tried when the first one does not carry through the path. */
  startBranches: number;
}
export const DEFAULT_PATH_BUDGET: PathBudget = { maxSamples: 1000, continuationIterations: 20, fallbackRestarts: 6, restartBudget: 48, startBranches: 2 };

/** One sample event (flip, restart, limit hit). */
interface PathEvent {
  /** Sample index. */
  index: number;
  /** Arc length at the sample (m). */
  s: number;
  /** 1-based joint concerned, or null. */
  joint: number | null;
  /** Words. */
  detail: string;
}

/** Everything about one (arm, path). */
export interface PathAnalysis {
  name: string;
  mode: PathSpec["mode"];
  verdict: Verdict;
  reason: string;
  /** Path length (m) and the step actually used (m). */
  length: number;
  step: number;
  samples: number;
  /** Samples reached. */
  reached: number;
  /** First sample not reached, or null. */
  firstUnreached: PathEvent | null;
  /** Large joint jumps or a sign change of the square task Jacobian's determinant between samples. */
  flips: PathEvent[];
  /** Samples where continuation failed and restarts found a solution (a discontinuity). */
  restarts: PathEvent[];
  /** Samples with a joint at (within 0.5 % of range of) a limit. */
  limitHits: PathEvent[];
  /**
   * How many flips, restarts and limit hits there were: set in the stored form (compact.ts), whose
   * lists keep only the first few; absent in a fresh analysis (the lists are whole).
   */
  eventCounts?: { flips: number; restarts: number; limitHits: number };
  speed: {
    /** Required TCP speed (m/s); rotation-only segments carry no speed requirement. */
    required: number;
    /**
     * Exact: min over the samples of the largest s with A·q̇ = s·ẋ, |q̇ⱼ| ≤ maxSpeedⱼ and no joint
     * moving past a limit it sits at (speed.ts); uncapped; null when no joint has a speed limit or
     * nothing bounds it.
     */
    ratio: number | null;
    /** min(1, ratio): the fraction of the required speed the joints allow. */
    achievableFraction: number | null;
    /**
     * 1-based joint whose limits, lifted alone, would raise the ratio most at the limiting sample
     * (ties: the lowest), or null.
     */
    limitingJoint: number | null;
    /** True when that joint sits at a position limit there (it blocks by position, not by speed). */
    limitingAtPositionLimit: boolean;
    limitingSample: number | null;
    /**
     * The ratio the returned joint trajectory itself allows: min over its segments of
     * maxSpeedⱼ·Δt/|Δqⱼ| with Δt = Δs/required speed (from the trajectory's own differences);
     * null when not computable. Below 1 the trajectory as returned needs more than the limits,
     * even where the exact ratio says a better joint motion exists.
     */
    trajectoryRatio: number | null;
    trajectoryLimitingJoint: number | null;
    /**
     * True when some segment only turns the tool (no position change): such segments carry no
     * speed requirement (the required speed is a tool-point speed), so their samples have no ratio.
     */
    rotationOnlySegments: boolean;
    note: string;
  };
  /** Smallest dexterity margin over the reached samples (null when none). */
  minDexterityMargin: number | null;
  /** The collision check in the cell (null when the cell checks nothing for this arm). */
  cell: PathCell | null;
  /**
   * Per-sample profiles (null where a sample was not reached): every sample in a fresh analysis;
   * in the stored form (compact.ts) at most PROFILE_POINTS of them, `index` giving each one's
   * place among the `samples` (absent: every sample is there).
   */
  profile: {
    index?: number[];
    s: number[];
    sigmaMinTranslation: (number | null)[];
    dexterityMargin: (number | null)[];
    /** The exact speed ratio at each sample (null: not reached, no requirement, or unbounded). */
    speedRatio: (number | null)[];
    /** The ratio the returned joint trajectory allows at each sample (its adjacent segments). */
    trajectorySpeedRatio: (number | null)[];
    /** Clearance at each reached sample (m; 0 when colliding), null where not reached or nothing is checked. */
    clearance: (number | null)[];
  };
  /** Joint values at each sample of `profile` (rad or m), for plotting; null where not reached. */
  q: (number[] | null)[];
}

/** The cell along a path. */
interface PathCell {
  /** No collision at any reached sample nor between consecutive reached samples. */
  collisionFree: boolean;
  /** Required clearance (m). */
  required: number;
  /** Smallest distance along the path over the counted pairs (m): exact where evaluated, else the proven bound; null when nothing is counted. */
  clearance: number | null;
  /** The pair at that distance and where along the path (m). */
  closest: { a: string; b: string; distance: number; s: number } | null;
  /** The first collision: at a sample, or between two samples (`between`), with the pair and the overlap (m). */
  firstCollision: { index: number; s: number; between: boolean; a: string; b: string; depth: number } | null;
  /** Configurations evaluated between samples by the motion check. */
  evaluations: number;
  /** The motion check settled for its bound somewhere (too tight to resolve within its budget). */
  unresolved: boolean;
  /** Obstacle names the tool and payload may touch along the path (its contact list). */
  contact: string[];
}

interface Sample {
  s: number;
  pose: Float64Array;
  /** Required twist (v, ω) in the cell frame (m/s, rad/s); null for rotation-only segments. */
  twist: number[] | null;
}

/** Samples a path; returns the samples, the path length and the step used. */
export function samplePath(path: PathSpec, maxSamples: number): { samples: Sample[]; length: number; step: number; coarsened: boolean } {
  const wps = path.waypoints;
  const quats = wps.map((w) => quaternionOf(poseFromRpy(w.position, w.rpy)));
  const segs = wps.slice(1).map((w, k) => {
    const p0 = wps[k].position, p1 = w.position;
    const d = [p1[0] - p0[0], p1[1] - p0[1], p1[2] - p0[2]];
    const len = Math.hypot(d[0], d[1], d[2]);
    const rot = relativeRotation(quats[k], quats[k + 1]);
    return { p0, d, len, rot, q0: quats[k], q1: quats[k + 1] };
  });
  const length = segs.reduce((a, s) => a + s.len, 0);
  let step = path.step;
  const count = (st: number) => segs.reduce((a, s) => a + Math.max(1, s.len > 1e-9 ? Math.ceil(s.len / st - 1e-9) : Math.ceil(s.rot.angle / ROTATION_STEP - 1e-9)), 0) + 1;
  let coarsened = false;
  while (count(step) > maxSamples) { step *= 1.25; coarsened = true; }
  const samples: Sample[] = [];
  let sAcc = 0;
  segs.forEach((seg, k) => {
    const nSeg = Math.max(1, seg.len > 1e-9 ? Math.ceil(seg.len / step - 1e-9) : Math.ceil(seg.rot.angle / ROTATION_STEP - 1e-9));
    const twist = seg.len > 1e-9
      ? [seg.d[0] / seg.len * path.speed, seg.d[1] / seg.len * path.speed, seg.d[2] / seg.len * path.speed,
        ...seg.rot.axis.map((a) => (a * seg.rot.angle * path.speed) / seg.len)]
      : null;
    const last = k === segs.length - 1;
    for (let i = 0; i <= (last ? nSeg : nSeg - 1); i++) {
      const t = i / nSeg;
      const p = [seg.p0[0] + t * seg.d[0], seg.p0[1] + t * seg.d[1], seg.p0[2] + t * seg.d[2]];
      samples.push({ s: sAcc + t * seg.len, pose: poseFromQuaternion(p, slerp(seg.q0, seg.q1, t)), twist });
    }
    sAcc += seg.len;
  });
  return { samples, length, step, coarsened };
}

/** Analyses one path for one arm. `seed` makes the restarts deterministic. */
export function analyzePath(ctx: ArmContext, path: PathSpec, budget: PathBudget, seed: number, posTol = 1e-5, rotTol = 1e-4): PathAnalysis {
  const { model, data } = ctx;
  const { samples, length, step, coarsened } = samplePath(path, budget.maxSamples);
  const opts = { mode: path.mode, positionTolerance: posTol, rotationTolerance: rotTol };
  const starts = solveIkMulti(model, data, samples[0].pose, { ...opts, maxRestarts: 12, maxSolutions: Math.max(1, budget.startBranches), seed })
    .filter((r) => r.status === "reached");
  // Try start branches in order of their dexterity margin; keep the first that carries through.
  // Each start as its in-limit copy farthest from the joint limits (copies.ts): the most room to move.
  const exempt = ctx.cell.active ? contactMask(ctx.cell, path.contact) : null;
  const freeAt = (q: Float64Array) => !ctx.cell.active || checkCell(ctx.cell, ctx.cellData, model, data, q, exempt, ctx.check).collisionFree;
  // Collision-free starts first, then by dexterity margin.
  const ranked = starts.map((r0) => {
    const r = { ...r0, q: centredCopy(model, r0.q).q };
    computeJacobian(model, data, r.q, ctx.jac);
    return { r, m: dexterityAt(ctx.jac, model.n, model, r.q, path.mode, ctx.ranks, data.toolPose).margin, free: freeAt(r.q) };
  }).sort((a, b) => Number(b.free) - Number(a.free) || b.m - a.m);
  let best: Traversal | null = null;
  for (const st of ranked.slice(0, Math.max(1, budget.startBranches))) {
    const tr = traverse(ctx, path, samples, st.r, opts, budget, seed);
    // colliding samples count against a traversal like unreached ones
    if (ctx.cell.active) for (const q of tr.qs) if (q && !freeAt(q)) tr.score--;
    if (!best || tr.score > best.score) best = tr;
    if (tr.unreached === 0 && tr.flips.length === 0 && tr.score === samples.length) break;
  }
  if (!best) best = traverse(ctx, path, samples, null, opts, budget, seed);
  const cell = ctx.cell.active ? pathCell(ctx, path, samples, best.qs, exempt) : null;
  return summarise(ctx, path, samples, best, length, step, coarsened, cell);
}

interface Traversal {
  qs: (Float64Array | null)[];
  flips: PathEvent[];
  restarts: PathEvent[];
  unreached: number;
  firstUnreached: PathEvent | null;
  /** True when the restart budget ran out (later misses had continuation only). */
  budgetSpent: boolean;
  /** Higher is better: reached samples minus flips. */
  score: number;
}

function traverse(ctx: ArmContext, path: PathSpec, samples: Sample[], start: IkResult | null, opts: { mode: PathSpec["mode"]; positionTolerance: number; rotationTolerance: number }, budget: PathBudget, seed: number): Traversal {
  const { model, data } = ctx;
  const n = model.n;
  const qs: (Float64Array | null)[] = [];
  const flips: PathEvent[] = [], restarts: PathEvent[] = [];
  let unreached = 0, firstUnreached: PathEvent | null = null;
  let prev: Float64Array | null = start ? start.q : null;
  let guess: Float64Array | null = null;
  let prevDet: number | null = null;
  let restartsLeft = budget.restartBudget, budgetSpent = false;
  for (let k = 0; k < samples.length; k++) {
    const smp = samples[k];
    let res: IkResult | null = k === 0 && start ? start : null;
    const from = prev ?? guess;
    if (!res && from) res = solveIk(model, data, smp.pose, { ...opts, initial: from, maxRestarts: 0, maxIterations: budget.continuationIterations });
    let restarted = false;
    if (!res || res.status !== "reached") {
      const allowed = Math.min(budget.fallbackRestarts, restartsLeft);
      const again = solveIk(model, data, smp.pose, { ...opts, initial: prev ?? guess ?? undefined, maxRestarts: allowed, seed: seed + k });
      restartsLeft -= Math.min(allowed, again.restarts + (again.status === "reached" ? 0 : 1));
      if (restartsLeft <= 0 && allowed > 0) budgetSpent = true;
      if (again.status === "reached" && prev) restarted = true;
      if (!res || again.positionError < res.positionError || again.status === "reached") res = again;
    }
    if (res.status !== "reached") {
      unreached++;
      if (!firstUnreached) firstUnreached = { index: k, s: smp.s, joint: null, detail: `not reached: position error ${mm(res.positionError)}` };
      qs.push(null);
      guess = res.q; // the best iterate: the next sample continues from the nearest miss
      continue;
    }
    const q = res.q;
    if (restarted) restarts.push({ index: k, s: smp.s, joint: null, detail: "continuation failed; found again by restarts" });
    if (prev) {
      let worst = 0, wj = -1, wRatio = 0;
      for (let i = 0; i < n; i++) {
        // The plain difference, never modulo 2π: both values lie within the joint's limits, and a
        // limited joint moves along its range (it cannot take the short way round through values
        // outside it), so a 2π change is a full unwinding, not a small step.
        const d = q[i] - prev[i];
        const limit = model.prismatic[i] === 0 ? FLIP_JUMP : FLIP_JUMP_PRISMATIC_FRACTION * (model.upper[i] - model.lower[i]);
        const ratio = Math.abs(d) / limit;
        if (ratio > wRatio) { wRatio = ratio; worst = Math.abs(d); wj = i; }
      }
      if (wRatio > 1) {
        flips.push({ index: k, s: smp.s, joint: wj + 1, detail: `joint ${wj + 1} jumps ${model.prismatic[wj] ? mm(worst) : deg(worst)}` });
      }
    }
    // Sign of the square task Jacobian's determinant (elbow/wrist branch indicator).
    const det = taskDeterminant(ctx, q, path.mode);
    if (det !== null && prevDet !== null && det * prevDet < 0 && !(flips.length && flips[flips.length - 1].index === k)) {
      flips.push({ index: k, s: smp.s, joint: null, detail: "the task Jacobian's determinant changes sign (crossed a singularity: branch change)" });
    }
    if (det !== null) prevDet = det;
    qs.push(q);
    prev = q;
  }
  return { qs, flips, restarts, unreached, firstUnreached, budgetSpent, score: samples.length - unreached - flips.length };
}

/** det of the square task Jacobian (rows by mode), or null when it is not square. */
function taskDeterminant(ctx: ArmContext, q: Float64Array, mode: PathSpec["mode"]): number | null {
  const n = ctx.model.n;
  if (taskRowCount(mode) !== n) return null;
  const a = taskJacobian(ctx, q, mode);
  return determinant(a.matrix, n);
}

/** Task Jacobian of the mode at q (lib/kinematics/task.ts); leaves the full Jacobian in ctx.jac and FK at q in ctx.data. */
function taskJacobian(ctx: ArmContext, q: Float64Array, mode: PathSpec["mode"]): { matrix: Float64Array; rows: number } {
  const { model, data } = ctx;
  const n = model.n;
  computeJacobian(model, data, q, ctx.jac);
  const m = new Float64Array(taskRowCount(mode) * n);
  const rows = taskJacobianInto(mode, ctx.jac, n, data.toolPose, m);
  return { matrix: m, rows };
}

/**
 * Checks every reached sample and the motion between consecutive reached samples (allocates the
 * result; the checks themselves do not).
 */
function pathCell(ctx: ArmContext, path: PathSpec, samples: Sample[], qs: (Float64Array | null)[], exempt: Uint8Array | null): PathCell & { profile: (number | null)[] } {
  const { model, data, cell, cellData: cd } = ctx;
  const np = cell.pairs.length;
  const required = cell.clearance;
  const profile: (number | null)[] = [];
  let prevQ: Float64Array | null = null, prevK = -1;
  const prevD = new Float64Array(np), prevEx = new Uint8Array(np), curD = new Float64Array(np), curEx = new Uint8Array(np);
  let clearance = Infinity;
  let closest: PathCell["closest"] = null;
  let firstCollision: PathCell["firstCollision"] = null;
  let evaluations = 0, unresolved = false;
  // the smallest distance; where it is, the first place within 1 nm of it (ties along a path are common)
  const note = (d: number, p: number, sAt: number) => {
    if (p < 0 || !(d < clearance)) return;
    if (closest === null || d < clearance - 1e-9) {
      const [a, b] = pairNames(cell, p);
      closest = { a, b, distance: d, s: sAt };
    } else closest = { ...(closest as NonNullable<PathCell["closest"]>), distance: d };
    clearance = d;
  };
  for (let k = 0; k < samples.length; k++) {
    const q = qs[k];
    if (!q) { profile.push(null); prevQ = null; continue; }
    const c = checkCell(cell, cd, model, data, q, exempt, ctx.check);
    curD.set(cd.pairDistance);
    curEx.set(cd.pairExact);
    profile.push(Number.isFinite(c.clearance) ? c.clearance : null);
    note(c.clearance, c.clearancePair, samples[k].s);
    if (!c.collisionFree && !firstCollision) {
      const [a, b] = pairNames(cell, c.collisionPair);
      firstCollision = { index: k, s: samples[k].s, between: false, a, b, depth: c.collisionDepth };
    }
    if (prevQ && !firstCollision) {
      const m = checkMotion(cell, cd, model, data, prevQ, q, prevD, prevEx, curD, curEx, exempt, required);
      evaluations += m.evaluations;
      unresolved ||= m.unresolved;
      const sAt = samples[prevK].s + (m.collision ? m.collision.fraction : 0.5) * (samples[k].s - samples[prevK].s);
      note(m.lowest, m.lowestPair, sAt);
      if (m.collision) {
        const [a, b] = pairNames(cell, m.collision.pair);
        firstCollision = { index: prevK, s: sAt, between: true, a, b, depth: m.collision.depth };
      }
    }
    prevQ = q; prevK = k;
    prevD.set(curD); prevEx.set(curEx);
  }
  return {
    collisionFree: firstCollision === null, required, clearance: Number.isFinite(clearance) ? clearance : null, closest, firstCollision,
    evaluations, unresolved, contact: path.contact ?? [], profile,
  };
}

function summarise(ctx: ArmContext, path: PathSpec, samples: Sample[], tr: Traversal, length: number, step: number, coarsened: boolean, cellFull: (PathCell & { profile: (number | null)[] }) | null): PathAnalysis {
  const { model } = ctx;
  const n = model.n;
  const prof = {
    s: [] as number[], sigmaMinTranslation: [] as (number | null)[], dexterityMargin: [] as (number | null)[], speedRatio: [] as (number | null)[],
    trajectorySpeedRatio: [] as (number | null)[], clearance: cellFull ? cellFull.profile : samples.map(() => null),
  };
  let cell: PathCell | null = null;
  if (cellFull) {
    const { profile: _profile, ...rest } = cellFull;
    void _profile;
    cell = rest;
  }
  const limitHits: PathEvent[] = [];
  let ratio: number | null = null, limSample: number | null = null;
  let limiting: { task: Float64Array; rows: number; b: Float64Array; q: Float64Array } | null = null;
  let minMargin: number | null = null;
  let rotationOnly = false;
  samples.forEach((smp, k) => {
    prof.s.push(smp.s);
    const q = tr.qs[k];
    if (!q) { prof.sigmaMinTranslation.push(null); prof.dexterityMargin.push(null); prof.speedRatio.push(null); return; }
    const task = taskJacobian(ctx, q, path.mode); // also leaves the full Jacobian in ctx.jac and FK at q
    const dex = dexterityAt(ctx.jac, n, model, q, path.mode, ctx.ranks, ctx.data.toolPose);
    prof.sigmaMinTranslation.push(dex.translation.minSingularValue);
    prof.dexterityMargin.push(dex.margin);
    minMargin = minMargin === null ? dex.margin : Math.min(minMargin, dex.margin);
    for (let i = 0; i < n; i++) {
      if (dex.jointLimits.perJoint[i] < LIMIT_HIT_MARGIN && (limitHits.length === 0 || limitHits[limitHits.length - 1].index !== k - 1 || limitHits[limitHits.length - 1].joint !== i + 1)) {
        limitHits.push({ index: k, s: smp.s, joint: i + 1, detail: `joint ${i + 1} at its limit` });
      }
    }
    if (!smp.twist) { rotationOnly = true; prof.speedRatio.push(null); return; }
    if (!ctx.hasSpeedLimits) { prof.speedRatio.push(null); return; }
    const b = new Float64Array(task.rows);
    taskVelocityInto(path.mode, smp.twist, ctx.data.toolPose, b);
    const r = exactSpeedRatio(model, task.matrix, task.rows, b, q).scale;
    prof.speedRatio.push(Number.isFinite(r) ? r : null);
    if (ratio === null || r < ratio) { ratio = r; limSample = k; limiting = { task: task.matrix, rows: task.rows, b, q }; }
  });
  const traj = trajectoryRatios(ctx, path, samples, tr);
  prof.trajectorySpeedRatio = traj.perSample;
  const lim = limiting as { task: Float64Array; rows: number; b: Float64Array; q: Float64Array } | null;
  const limJointInfo = lim && ratio !== null && Number.isFinite(ratio) ? limitingJointAt(model, lim.task, lim.rows, lim.b, lim.q, ratio) : { joint: null, atLimit: false };
  const limJoint = limJointInfo.joint;
  const finiteRatio = ratio;
  const fraction = finiteRatio === null ? null : Math.min(1, finiteRatio);
  const limitWords = limJoint ? `, limited by joint ${limJoint}${limJointInfo.atLimit ? " at its position limit" : ""}` : "";
  const speedNote = !ctx.hasSpeedLimits ? "no joint speed limits on the datasheet: speed not checked"
    : `${fraction !== null && fraction < 1 ? `${pct(fraction)} of` : "the full"} ${num(path.speed * 1000, 0)} mm/s${limitWords}` + (rotationOnly ? "; rotation-only segments have no speed requirement" : "");

  let verdict: Verdict = "meets";
  const parts: string[] = [];
  const reachedCount = tr.qs.filter(Boolean).length;
  if (tr.unreached > 0) {
    verdict = "fails";
    parts.push(`${tr.unreached} of ${samples.length} samples not reached (first at ${mm(tr.firstUnreached!.s)} along the path: ${tr.firstUnreached!.detail})`);
  } else {
    parts.push(`followed over ${mm(length)} in ${samples.length} samples`);
  }
  const jumpFlips = tr.flips.filter((f) => f.joint !== null);
  if (jumpFlips.length) {
    verdict = "fails";
    parts.push(`configuration flip at ${mm(jumpFlips[0].s)} (${jumpFlips[0].detail}): not continuous as sampled`);
  } else if (tr.flips.length) {
    if (verdict === "meets") verdict = "marginal";
    parts.push(`branch change at ${mm(tr.flips[0].s)} (${tr.flips[0].detail})`);
  }
  if (tr.restarts.length && verdict === "meets") verdict = "marginal";
  if (tr.restarts.length) parts.push(`${tr.restarts.length} discontinuit${tr.restarts.length === 1 ? "y" : "ies"} (IK restarted)`);
  if (limitHits.length) { if (verdict === "meets") verdict = "marginal"; parts.push(`${limitHits[0].detail} at ${mm(limitHits[0].s)}`); }
  if (!ctx.hasSpeedLimits) {
    if (verdict === "meets") verdict = "unknown";
    parts.push(speedNote);
  } else if (finiteRatio !== null && Number.isFinite(finiteRatio)) {
    if (finiteRatio < 1) { verdict = "fails"; parts.push(`joint speeds allow ${speedNote}`); }
    else if (finiteRatio < SPEED_MARGINAL_RATIO) { if (verdict === "meets") verdict = "marginal"; parts.push(`speed reached with less than ${pct(SPEED_MARGINAL_RATIO - 1)} headroom (joint ${limJoint}${limJointInfo.atLimit ? " at its position limit" : ""})`); }
    else parts.push(`speed ${num(path.speed * 1000, 0)} mm/s reached with ${num(finiteRatio, 2)}× headroom`);
  } else if (finiteRatio !== null) {
    parts.push(`speed ${num(path.speed * 1000, 0)} mm/s: no speed limit binds (joints without a limit can carry the motion)`);
  }
  if (ctx.hasSpeedLimits && traj.min !== null && traj.min < 1) {
    parts.push(`the joint trajectory found needs ${num(1 / traj.min, 2)}× joint ${traj.joint}'s speed limit at ${mm(samples[traj.sample!].s)}: as computed it would not keep the required speed (the achievable figure assumes the best joint speeds at every sample)`);
  }
  if (rotationOnly && !parts.some((x) => x.includes("rotation-only"))) parts.push("rotation-only segments have no speed requirement");
  if (minMargin !== null && minMargin < DEXTERITY_MARGINAL_THRESHOLD) {
    if (verdict === "meets") verdict = "marginal";
    parts.push(`dexterity margin drops to ${num(minMargin)}`);
  }
  if (cell) {
    const fc = cell.firstCollision;
    if (fc) {
      verdict = "fails";
      parts.push(`${fc.between ? `collides between samples ${fc.index + 1} and ${fc.index + 2}` : `collides at sample ${fc.index + 1}`}, ${mm(fc.s)} along the path: ${fc.a} hits ${quoteBody(fc.b)}${fc.depth > 0 ? `, overlap ${mm(fc.depth)}` : ""}`);
    } else if (cell.unresolved && cell.clearance !== null && cell.clearance <= 0) {
      verdict = "fails";
      parts.push("the motion between two samples could not be shown to stay clear (the bound allows contact): check with a finer step");
    } else if (cell.closest && cell.clearance !== null) {
      if (cell.clearance < cell.required) {
        verdict = worseVerdict(verdict, "marginal");
        parts.push(`clearance drops to ${mm(cell.clearance)} between ${cell.closest.a} and ${quoteBody(cell.closest.b)} at ${mm(cell.closest.s)} along the path, below the required ${mm(cell.required)}${cell.unresolved ? " (a bound between samples)" : ""}`);
      } else parts.push(`clearance at least ${mm(cell.clearance)} along the path (${cell.closest.a} to ${quoteBody(cell.closest.b)}), motion between samples checked`);
    }
  }
  if (coarsened) parts.push(`step coarsened to ${mm(step)} (sample cap)`);
  if (tr.budgetSpent) parts.push("restart budget spent: later samples tried by continuation only");
  return {
    name: path.name, mode: path.mode, verdict, reason: parts.join("; "), length, step, samples: samples.length, reached: reachedCount,
    firstUnreached: tr.firstUnreached, flips: tr.flips, restarts: tr.restarts, limitHits,
    speed: {
      required: path.speed, ratio: finiteRatio === null || !Number.isFinite(finiteRatio) ? null : finiteRatio, achievableFraction: fraction,
      limitingJoint: limJoint, limitingAtPositionLimit: limJointInfo.atLimit, limitingSample: limSample,
      trajectoryRatio: traj.min, trajectoryLimitingJoint: traj.joint, rotationOnlySegments: rotationOnly, note: speedNote,
    },
    minDexterityMargin: minMargin, cell, profile: prof, q: tr.qs.map((q) => (q ? Array.from(q) : null)),
  };
}

/**
 * The exact speed ratio at one sample (speed.ts): the largest s with A·q̇ = s·b under the joints'
 * speed limits, with joints at a position limit (within AT_LIMIT_FRACTION of the range) not moving
 * beyond it. `task` is the m×n task Jacobian at q, `b` the required task velocity (m/s, rad/s).
 */
function exactSpeedRatio(model: ArmModel, task: ArrayLike<number>, rows: number, b: ArrayLike<number>, q: ArrayLike<number>): SpeedScale {
  const bounds = speedBounds(model.lower, model.upper, model.maxSpeed, q);
  return maxSpeedScale(task, rows, model.n, b, bounds.lower, bounds.upper);
}

/**
 * The exact speed ratio at configuration q for the required twist (v, ω) (cell frame, m/s and
 * rad/s) of a path sample in `mode`: the figure analyzePath reports per sample. Uses ctx's buffers.
 */
export function speedRatioAt(ctx: ArmContext, q: ArrayLike<number>, twist: ArrayLike<number>, mode: PathSpec["mode"]): SpeedScale {
  const task = taskJacobian(ctx, Float64Array.from(q), mode);
  const b = new Float64Array(task.rows);
  taskVelocityInto(mode, twist, ctx.data.toolPose, b);
  return exactSpeedRatio(ctx.model, task.matrix, task.rows, b, q);
}

/**
 * The joint that limits the ratio `base` at one sample: the one whose limits (speed and position),
 * lifted alone, raise the ratio most (ties: the lowest index); null when lifting none helps.
 */
function limitingJointAt(model: ArmModel, task: Float64Array, rows: number, b: Float64Array, q: Float64Array, base: number): { joint: number | null; atLimit: boolean } {
  const bounds = speedBounds(model.lower, model.upper, model.maxSpeed, q);
  let best: number | null = null, bestScale = base * (1 + 1e-9);
  for (let j = 0; j < model.n; j++) {
    if (Number.isFinite(bounds.lower[j]) === false && Number.isFinite(bounds.upper[j]) === false) continue;
    const lo = Float64Array.from(bounds.lower), hi = Float64Array.from(bounds.upper);
    lo[j] = -Infinity; hi[j] = Infinity;
    const s = maxSpeedScale(task, rows, model.n, b, lo, hi).scale;
    if (s > bestScale) { bestScale = s; best = j; }
  }
  return { joint: best === null ? null : best + 1, atLimit: best !== null && bounds.atLimit[best] !== 0 };
}

/** Per-sample and minimum speed ratio of the returned joint trajectory (its own differences). */
function trajectoryRatios(ctx: ArmContext, path: PathSpec, samples: Sample[], tr: Traversal): { perSample: (number | null)[]; min: number | null; joint: number | null; sample: number | null } {
  const { model } = ctx;
  const seg: (number | null)[] = [];
  const segJoint: (number | null)[] = [];
  for (let k = 0; k + 1 < samples.length; k++) {
    const a = tr.qs[k], b = tr.qs[k + 1], ds = samples[k + 1].s - samples[k].s;
    if (!a || !b || !ctx.hasSpeedLimits || !(ds > 1e-12)) { seg.push(null); segJoint.push(null); continue; }
    const dt = ds / path.speed;
    let r = Infinity, rj: number | null = null;
    for (let j = 0; j < model.n; j++) {
      const v = model.maxSpeed[j];
      const dq = Math.abs(b[j] - a[j]);
      if (!(v > 0) || !(dq > 0)) continue;
      const rr = (v * dt) / dq;
      if (rr < r) { r = rr; rj = j + 1; }
    }
    seg.push(Number.isFinite(r) ? r : null);
    segJoint.push(rj);
  }
  const perSample: (number | null)[] = [];
  let min: number | null = null, joint: number | null = null, sample: number | null = null;
  for (let k = 0; k < samples.length; k++) {
    const left = k > 0 ? seg[k - 1] : null, right = k < seg.length ? seg[k] : null;
    const v = left === null ? right : right === null ? left : Math.min(left, right);
    perSample.push(v);
  }
  seg.forEach((r, k) => { if (r !== null && (min === null || r < min)) { min = r; joint = segJoint[k]; sample = k + 1; } });
  return { perSample, min, joint, sample };
}
