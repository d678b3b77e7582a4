/**
 * Mount placement (docs/design.md#mount-placement): where in the requirement set's mounting
 * region one arm's base serves the job best, found by search. Pure and deterministic: the result
 * depends on the arm and the requirement set only (seeds from their content; no clock, no other
 * arm), so an arm gets the same placement alone or among others.
 *
 * ## The goal (lexicographic, larger is better)
 * 1. `must` targets reached, 2. targets reached, 3. paths followed, 4. the worst dexterity margin
 * over the reached targets and the followed paths, 5. the minimum clearance over them. A target
 * is reached as the analysis reaches it (docs/design.md#targets): IK within the tolerances and the
 * joint limits, and no collision in the cell (lib/analysis/cell.ts); here the tolerances are at
 * most the command line's 1e-5 m and 1e-4 rad, so every reached target meets the `place` contract.
 *
 * ## The search
 * The placement is (x, y, z, yaw) in the region, z from a range or a list of pedestal heights;
 * coordinates with lo = hi are fixed. Coarse: the region's centre and a Halton sequence over the
 * free coordinates (docs/references.md#halton-sequence). Fine: compass search (a pattern search,
 * docs/references.md#pattern-search) from the best few coarse placements, polling ± a step along
 * each free coordinate (± one height for pedestals), moving to the first poll point that improves
 * the goal and halving the steps when none does, down to 1 mm and 0.1°. Only comparisons of the
 * goal are used, so the lexicographic goal needs no weights.
 *
 * Each target's IK starts from the answers found for it at the nearest placements evaluated
 * before (warm starts), then from seeded random restarts. A placement is abandoned as soon as an
 * upper bound of its goal (targets still to evaluate counted as reached, the margins and
 * clearances so far as final) falls below the best found: it cannot win, so the result is the same
 * without it. The best placement is then evaluated again with the analysis' own target search
 * (analyzeTarget, its full budget) so nothing the shortlist analysis would reach there is missed.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet, Target } from "@/shared/schemas/requirements";
import { mountingAllowed, mountingClass, pedestalHeights, placementPose, zRange, type MountingSpec } from "@/shared/schemas/mounting";
import type { Mounting } from "@/shared/schemas/arm";
import { computeJacobian, solveIk, solveIkMulti } from "@/lib/kinematics";
import { armSeedText, contentSeed } from "./canonical";
import { checkCell, contactMask } from "./cell";
import { createArmContext, placedContext, type ArmContext } from "./context";
import { dexterityAt } from "./dexterity";
import { poseFromRpy } from "./geometry";
import { analyzePath, DEFAULT_PATH_BUDGET } from "./paths";
import { analyzeTarget, DEFAULT_TARGET_BUDGET } from "./targets";

/** The command line's "reached" (docs/cli.md): position error ≤ 1e-5 m, rotation ≤ 1e-4 rad. */
export const PLACE_POSITION_TOLERANCE = 1e-5;
export const PLACE_ROTATION_TOLERANCE = 1e-4;

/** One placement: the base origin (m) and the yaw about the cell z axis (rad). */
export interface Placement {
  x: number;
  y: number;
  z: number;
  yaw: number;
}

/**
 * The goal of a placement. `worstMargin` is −Infinity when nothing is reached or followed;
 * `minClearance` is Infinity when nothing is measured (no collision geometry, or nothing reached).
 */
export interface PlacementGoal {
  must: number;
  reached: number;
  followed: number;
  worstMargin: number;
  minClearance: number;
}

/** > 0 when `a` is better than `b`, < 0 when worse, 0 when equal (lexicographic, docs/design.md#mount-placement). */
export function compareGoals(a: PlacementGoal, b: PlacementGoal): number {
  if (a.must !== b.must) return a.must - b.must;
  if (a.reached !== b.reached) return a.reached - b.reached;
  if (a.followed !== b.followed) return a.followed - b.followed;
  if (a.worstMargin !== b.worstMargin) return a.worstMargin > b.worstMargin ? 1 : -1;
  if (a.minClearance !== b.minClearance) return a.minClearance > b.minClearance ? 1 : -1;
  return 0;
}

/** One target at a placement. */
export interface PlacedTarget {
  name: string;
  reached: boolean;
  /** The configuration reaching it, or the best attempt's when not reached (rad or m). */
  q: number[];
  /** Dexterity margin D at q (reached only). */
  margin: number | null;
  /** Smallest distance over the checked pairs at q (m; reached only; null when nothing is checked). */
  clearance: number | null;
}

/** One path at a placement. */
export interface PlacedPath {
  name: string;
  followed: boolean;
  margin: number | null;
  clearance: number | null;
}

/** A placement fully evaluated. */
export interface PlacementEvaluation {
  placement: Placement;
  /** T_C_B, row-major 4×4. */
  base: number[];
  goal: PlacementGoal;
  targets: PlacedTarget[];
  paths: PlacedPath[];
}

/**
 * Targets reached over the region's x–y plane at one z and yaw: cell (i, j) is the placement at
 * x = xs[i], y = ys[j]; reached[j · xs.length + i] targets reached there (by the search's IK with
 * its warm starts and no restarts: a quick map, the placement itself is judged in full).
 */
export interface CoverageMap {
  xs: number[];
  ys: number[];
  z: number;
  yaw: number;
  reached: number[];
  total: number;
}

/** The result of {@link searchPlacement}. */
export interface PlacementResult extends PlacementEvaluation {
  /** Placements evaluated by the search (those abandoned early included). */
  evaluated: number;
  /** Of those, abandoned before all their targets and paths were evaluated. */
  pruned: number;
  /** The mount orientation's class and whether the arm's datasheet allows it (null: the datasheet lists none). */
  mounting: Mounting;
  allowed: boolean | null;
  /** The coverage map at the placement's z and yaw, when asked for. */
  coverage: CoverageMap | null;
}

/** Search budget (tunable without changing what a result means). */
export interface PlacementBudget {
  /** Halton samples on top of the region's centre: `coarsePerDimension` × free coordinates + 4. */
  coarsePerDimension: number;
  /** Coarse placements refined by compass search. */
  refineStarts: number;
  /** Most evaluations of one compass search. */
  refineEvaluations: number;
  /** First compass step, as a fraction of each coordinate's range. */
  initialStep: number;
  /** Random restarts per target after the warm starts fail: in the coarse stage, and in the compass search (whose steps are short, so the warm starts from its neighbours usually decide). */
  restarts: number;
  fineRestarts: number;
  /** Warm starts tried per target (from the nearest placements that reached it). */
  warmStarts: number;
  /** IK iterations per attempt. */
  maxIterations: number;
}
export const DEFAULT_PLACEMENT_BUDGET: PlacementBudget = {
  coarsePerDimension: 12, refineStarts: 2, refineEvaluations: 40, initialStep: 0.125, restarts: 3, fineRestarts: 1, warmStarts: 2, maxIterations: 60,
};

/** The smallest compass steps: 1 mm and 0.1°. */
const MIN_POSITION_STEP = 1e-3;
const MIN_YAW_STEP = (0.1 * Math.PI) / 180;

/** A target's tolerances for the search: its own, at most the command line's. */
function tightened(t: Target): Target {
  return { ...t, positionTolerance: Math.min(t.positionTolerance, PLACE_POSITION_TOLERANCE), rotationTolerance: Math.min(t.rotationTolerance, PLACE_ROTATION_TOLERANCE) };
}

/** The i-th point (i ≥ 1) of the radical-inverse sequence in base b (van der Corput; docs/references.md#halton-sequence). */
export function radicalInverse(i: number, b: number): number {
  let f = 1, r = 0;
  while (i > 0) {
    f /= b;
    r += f * (i % b);
    i = Math.floor(i / b);
  }
  return r;
}
const HALTON_BASES = [2, 3, 5, 7];

/** The free coordinates of a region and the map from unit coordinates u ∈ [0, 1]^d to placements. */
interface SearchSpace {
  /** Coordinate names that vary, in the order x, y, z, yaw. */
  free: ("x" | "y" | "z" | "yaw")[];
  lo: Placement;
  hi: Placement;
  heights: number[] | null;
  at(u: readonly number[]): Placement;
  /** The smallest compass step per free coordinate, in u. */
  minStep: number[];
}

function searchSpace(m: MountingSpec): SearchSpace {
  const [zlo, zhi] = zRange(m);
  const heights = pedestalHeights(m);
  const lo: Placement = { x: m.region.x[0], y: m.region.y[0], z: zlo, yaw: m.region.yaw[0] };
  const hi: Placement = { x: m.region.x[1], y: m.region.y[1], z: zhi, yaw: m.region.yaw[1] };
  const free = (["x", "y", "z", "yaw"] as const).filter((k) => (k === "z" && heights ? heights.length > 1 : hi[k] > lo[k]));
  const at = (u: readonly number[]): Placement => {
    const p: Placement = { x: 0.5 * (lo.x + hi.x), y: 0.5 * (lo.y + hi.y), z: heights ? heights[Math.floor((heights.length - 1) / 2)] : 0.5 * (lo.z + hi.z), yaw: 0.5 * (lo.yaw + hi.yaw) };
    free.forEach((k, i) => {
      const v = Math.min(1, Math.max(0, u[i]));
      if (k === "z" && heights) p.z = heights[Math.min(heights.length - 1, Math.floor(v * heights.length))];
      else p[k] = lo[k] + v * (hi[k] - lo[k]);
    });
    return p;
  };
  const minStep = free.map((k) => (k === "z" && heights ? 1 / heights.length : (k === "yaw" ? MIN_YAW_STEP : MIN_POSITION_STEP) / (hi[k] - lo[k])));
  return { free, lo, hi, heights, at, minStep };
}

/** What the search keeps per target for warm starts: the unit coordinates and q of placements that reached it. */
interface WarmStore {
  u: number[][];
  q: Float64Array[];
}

interface Searcher {
  arm: ArmDocument;
  req: RequirementSet;
  ctx: ArmContext;
  seedText: string;
  budget: PlacementBudget;
  targets: Target[];
  poses: Float64Array[];
  warm: WarmStore[];
  mustCount: number;
  evaluated: number;
  pruned: number;
  /** In the compass search (fewer restarts). */
  fine: boolean;
}

/** The nearest stored answers for target k from placement u (up to `count`). */
function nearestWarm(store: WarmStore, u: readonly number[], count: number): Float64Array[] {
  const idx: { d: number; i: number }[] = [];
  for (let i = 0; i < store.u.length; i++) {
    let d = 0;
    for (let c = 0; c < u.length; c++) d += (store.u[i][c] - u[c]) ** 2;
    idx.push({ d, i });
  }
  idx.sort((a, b) => a.d - b.d || a.i - b.i);
  return idx.slice(0, count).map((e) => store.q[e.i]);
}

/** One target at a placed context: warm starts, then seeded restarts; the first collision-free answer. */
function solveTarget(s: Searcher, pc: ArmContext, k: number, warm: Float64Array[], seed: number, restarts: number): PlacedTarget & { qf: Float64Array | null } {
  const t = s.targets[k], pose = s.poses[k], { model, data } = pc;
  const opts = { mode: t.mode, positionTolerance: t.positionTolerance, rotationTolerance: t.rotationTolerance, maxIterations: s.budget.maxIterations };
  const exempt = pc.cell.active ? contactMask(pc.cell, t.contact) : null;
  let bestQ: Float64Array | null = null, bestErr = Infinity;
  const accept = (q: Float64Array) => {
    if (pc.cell.active) {
      const c = checkCell(pc.cell, pc.cellData, model, data, q, exempt, pc.check);
      if (!c.collisionFree) return null;
      return { clearance: Number.isFinite(c.clearance) ? c.clearance : null };
    }
    return { clearance: null };
  };
  const done = (q: Float64Array, clearance: number | null) => {
    computeJacobian(model, data, q, pc.jac);
    const margin = dexterityAt(pc.jac, model.n, model, q, t.mode, pc.ranks, data.toolPose).margin;
    return { name: t.name, reached: true, q: Array.from(q), margin, clearance, qf: q };
  };
  for (const w of warm) {
    const r = solveIk(model, data, pose, { ...opts, initial: w, maxRestarts: 0 });
    if (r.positionError < bestErr) { bestErr = r.positionError; bestQ = r.q; }
    if (r.status !== "reached") continue;
    const a = accept(r.q);
    if (a) return done(r.q, a.clearance);
  }
  const rs = solveIkMulti(model, data, pose, { ...opts, maxRestarts: restarts, maxSolutions: 3, seed });
  for (const r of rs) {
    if (r.positionError < bestErr) { bestErr = r.positionError; bestQ = r.q; }
    if (r.status !== "reached") continue;
    const a = accept(r.q);
    if (a) return done(r.q, a.clearance);
  }
  return { name: t.name, reached: false, q: Array.from(bestQ ?? rs[0].q), margin: null, clearance: null, qf: null };
}

/** An upper bound of the goal from what is known so far (see the module note). */
function bound(must: number, reached: number, followed: number, margin: number, clearance: number): PlacementGoal {
  return { must, reached, followed, worstMargin: margin, minClearance: clearance };
}

/**
 * Evaluates one placement for the search; null when abandoned (its bound fell below `ref`).
 * `order` is the order the targets are evaluated in; `index` the placement's number (seeds).
 */
function evaluateForSearch(s: Searcher, space: SearchSpace, u: readonly number[], ref: PlacementEvaluation | null, index: number): PlacementEvaluation | null {
  s.evaluated++;
  const placement = space.at(u);
  const base = placementPose(s.req.mounting!.orientation, placement.x, placement.y, placement.z, placement.yaw);
  const pc = placedContext(s.ctx, s.arm, s.req, base);
  const n = s.targets.length, nP = s.req.paths.length;
  // must targets first, then those the best placement misses, then the rest (file order within each)
  const missedByRef = new Set(ref ? ref.targets.filter((t) => !t.reached).map((t) => t.name) : []);
  const order = [...s.targets.keys()].sort((a, b) => {
    const ra = s.targets[a].priority === "must" ? 0 : missedByRef.has(s.targets[a].name) ? 1 : 2;
    const rb = s.targets[b].priority === "must" ? 0 : missedByRef.has(s.targets[b].name) ? 1 : 2;
    return ra - rb || a - b;
  });
  const out: PlacedTarget[] = new Array(n);
  let mustMissed = 0, missed = 0, margin = Infinity, clearance = Infinity;
  for (const k of order) {
    const seed = (contentSeed(s.seedText, "place", s.targets[k].name) + Math.imul(index, 0x9e3779b1)) >>> 0 || 1;
    const r = solveTarget(s, pc, k, nearestWarm(s.warm[k], u, s.budget.warmStarts), seed, s.fine ? s.budget.fineRestarts : s.budget.restarts);
    if (r.qf) { s.warm[k].u.push([...u]); s.warm[k].q.push(r.qf); }
    out[k] = { name: r.name, reached: r.reached, q: r.q, margin: r.margin, clearance: r.clearance };
    if (!r.reached) { missed++; if (s.targets[k].priority === "must") mustMissed++; }
    else {
      margin = Math.min(margin, r.margin!);
      if (r.clearance !== null) clearance = Math.min(clearance, r.clearance);
    }
    if (ref && compareGoals(bound(s.mustCount - mustMissed, n - missed, nP, margin, clearance), ref.goal) < 0) { s.pruned++; return null; }
  }
  // the paths the competing placement does not follow first: if they fail here too, it cannot be beaten on paths
  const refFails = new Set(ref ? ref.paths.filter((p) => !p.followed).map((p) => p.name) : []);
  const pathOrder = [...s.req.paths.keys()].sort((a, b) => (refFails.has(s.req.paths[a].name) ? 0 : 1) - (refFails.has(s.req.paths[b].name) ? 0 : 1) || a - b);
  const paths: PlacedPath[] = new Array(nP);
  let pathMissed = 0;
  for (const i of pathOrder) {
    const r = placedPath(pc, s.req.paths[i], s.seedText);
    paths[i] = r;
    if (!r.followed) pathMissed++;
    else {
      if (r.margin !== null) margin = Math.min(margin, r.margin);
      if (r.clearance !== null) clearance = Math.min(clearance, r.clearance);
    }
    if (ref && compareGoals(bound(s.mustCount - mustMissed, n - missed, nP - pathMissed, margin, clearance), ref.goal) < 0) { s.pruned++; return null; }
  }
  return { placement, base, goal: goalOf(s.targets, out, paths), targets: out, paths };
}

/** One path at a placed context, by the analysis' path search (docs/design.md#paths). */
function placedPath(pc: ArmContext, p: RequirementSet["paths"][number], seedText: string): PlacedPath {
  const a = analyzePath(pc, p, DEFAULT_PATH_BUDGET, contentSeed(seedText, "path", p.name), PLACE_POSITION_TOLERANCE, PLACE_ROTATION_TOLERANCE);
  const followed = a.verdict === "meets" || a.verdict === "marginal";
  return { name: p.name, followed, margin: followed ? a.minDexterityMargin : null, clearance: followed ? (a.cell?.clearance ?? null) : null };
}

/** The goal of a fully evaluated placement. */
function goalOf(targets: readonly Target[], placed: readonly PlacedTarget[], paths: readonly PlacedPath[]): PlacementGoal {
  let must = 0, reached = 0, margin = Infinity, clearance = Infinity;
  placed.forEach((t, k) => {
    if (!t.reached) return;
    reached++;
    if (targets[k].priority === "must") must++;
    if (t.margin !== null) margin = Math.min(margin, t.margin);
    if (t.clearance !== null) clearance = Math.min(clearance, t.clearance);
  });
  let followed = 0;
  for (const p of paths) {
    if (!p.followed) continue;
    followed++;
    if (p.margin !== null) margin = Math.min(margin, p.margin);
    if (p.clearance !== null) clearance = Math.min(clearance, p.clearance);
  }
  if (reached + followed === 0) margin = -Infinity;
  return { must, reached, followed, worstMargin: margin, minClearance: clearance };
}

/**
 * Evaluates one placement with the analysis' own target search (analyzeTarget with its full
 * budget, the tolerances tightened as in the module note) and its path search: the figures the
 * search reports for its best placement, and a reference for checking it. `hints` are answers
 * already found there (e.g. by the search); a target counts as reached when either finds a
 * collision-free answer, the one kept chosen as the analysis chooses (the required clearance
 * first, then the dexterity margin).
 */
export function evaluatePlacement(arm: ArmDocument, req: RequirementSet, placement: Placement, hints?: readonly PlacedTarget[], ctx?: ArmContext): PlacementEvaluation {
  if (!req.mounting) throw new RangeError("mounting: the requirement set has no mounting region");
  const base = placementPose(req.mounting.orientation, placement.x, placement.y, placement.z, placement.yaw);
  const placedReq: RequirementSet = { ...req, base };
  const seedText = armSeedText(arm);
  const pc = ctx ? placedContext(ctx, arm, req, base) : createArmContext(arm, placedReq, contentSeed(seedText, "ranks"));
  const required = req.cell.clearance;
  const targets = req.targets.map((t0, k): PlacedTarget => {
    const t = tightened(t0);
    const a = analyzeTarget(pc, arm, placedReq, t, DEFAULT_TARGET_BUDGET, contentSeed(seedText, "target", t.name));
    const fromAnalysis: PlacedTarget | null = a.reached && a.chosen !== null
      ? { name: t.name, reached: true, q: a.solutions[a.chosen].q, margin: a.solutions[a.chosen].margin, clearance: a.solutions[a.chosen].clearance }
      : null;
    const hint = hints?.[k]?.reached ? hints[k] : null;
    if (fromAnalysis && hint) {
      // the analysis' rule: the required clearance first, then the margin
      const ok = (x: PlacedTarget) => (x.clearance === null || x.clearance >= required ? 1 : 0);
      if (ok(hint) > ok(fromAnalysis) || (ok(hint) === ok(fromAnalysis) && hint.margin! > fromAnalysis.margin!)) return hint;
      return fromAnalysis;
    }
    if (fromAnalysis) return fromAnalysis;
    if (hint) return hint;
    return { name: t.name, reached: false, q: a.solutions[0]?.q ?? bestAttempt(pc, t), margin: null, clearance: null };
  });
  const paths = req.paths.map((p) => placedPath(pc, p, seedText));
  return { placement, base, goal: goalOf(req.targets, targets, paths), targets, paths };
}

/** The best attempt's configuration for a target not reached (one seeded IK search). */
function bestAttempt(pc: ArmContext, t: Target): number[] {
  const r = solveIk(pc.model, pc.data, poseFromRpy(t.position, t.rpy), { mode: t.mode, positionTolerance: t.positionTolerance, rotationTolerance: t.rotationTolerance, maxRestarts: 0 });
  return Array.from(r.q);
}

/** Options of {@link searchPlacement}. */
interface SearchOptions {
  budget?: PlacementBudget;
  /** Cells per side of the coverage map (none when 0 or absent; a fixed coordinate gets one cell). */
  coverageCells?: number;
  /** Called after each placement evaluated with the count so far and the best goal. */
  onProgress?(evaluated: number, best: PlacementGoal | null): void;
}

/**
 * The best placement of `arm` in `req.mounting` (see the module note). Throws RangeError when the
 * set has no mounting region or the arm's model is invalid; the caller checks the datasheet's
 * mountings first (`allowed` is reported, not enforced, so the search can also be run for an
 * arm whose datasheet lists none).
 */
export function searchPlacement(arm: ArmDocument, req: RequirementSet, opts: SearchOptions = {}): PlacementResult {
  const m = req.mounting;
  if (!m) throw new RangeError("mounting: the requirement set has no mounting region");
  const budget = opts.budget ?? DEFAULT_PLACEMENT_BUDGET;
  const space = searchSpace(m);
  const seedText = armSeedText(arm);
  const centre = space.at(space.free.map(() => 0.5));
  const ctx = createArmContext(arm, { ...req, base: placementPose(m.orientation, centre.x, centre.y, centre.z, centre.yaw) }, contentSeed(seedText, "ranks"));
  const targets = req.targets.map(tightened);
  const s: Searcher = {
    arm, req, ctx, seedText, budget, targets,
    poses: targets.map((t) => poseFromRpy(t.position, t.rpy)),
    warm: targets.map(() => ({ u: [], q: [] })),
    mustCount: targets.filter((t) => t.priority === "must").length,
    evaluated: 0, pruned: 0, fine: false,
  };
  const d = space.free.length;
  let best: PlacementEvaluation | null = null;
  // every placement evaluated, with the reference it was measured against when abandoned
  const seen = new Map<string, { r: PlacementEvaluation | null; ref: PlacementEvaluation | null }>();
  const keyOf = (u: readonly number[]) => {
    const p = space.at(u);
    return `${p.x.toFixed(6)},${p.y.toFixed(6)},${p.z.toFixed(6)},${p.yaw.toFixed(7)}`;
  };
  /** Evaluates u, abandoned when it cannot beat `ref` (the best so far, or the compass search's current point). */
  const evaluate = (u: number[], ref: PlacementEvaluation | null): PlacementEvaluation | null => {
    const key = keyOf(u);
    const old = seen.get(key);
    if (old && (old.r || (old.ref && ref && compareGoals(ref.goal, old.ref.goal) >= 0))) return old.r;
    const r = evaluateForSearch(s, space, u, ref, s.evaluated);
    seen.set(key, { r, ref });
    if (r && (!best || compareGoals(r.goal, best.goal) > 0)) best = r;
    opts.onProgress?.(s.evaluated, best?.goal ?? null);
    return r;
  };

  // ---- coarse: the nominal base when the region holds it, the centre, then Halton points over the free coordinates
  const coarse: { u: number[]; r: PlacementEvaluation }[] = [];
  const nominal = nominalInRegion(req.base, m, space);
  const samples = d === 0 ? [[]] : [...(nominal ? [nominal] : []), space.free.map(() => 0.5), ...Array.from({ length: budget.coarsePerDimension * d + 4 }, (_, i) => space.free.map((_, c) => radicalInverse(i + 1, HALTON_BASES[c])))];
  // nothing to reach or follow: every placement is as good as the first
  const nothing = req.targets.length + req.paths.length === 0;
  for (const u of nothing ? samples.slice(0, 1) : samples) {
    const r = evaluate(u, best);
    if (r) coarse.push({ u, r });
  }

  // ---- fine: compass search from the best few coarse placements (kept ones; the pruned lost to an earlier best)
  if (d > 0 && !nothing) {
    s.fine = true;
    const starts = coarse
      .map((c, i) => ({ ...c, i }))
      .sort((a, b) => compareGoals(b.r.goal, a.r.goal) || a.i - b.i)
      .slice(0, budget.refineStarts);
    for (const st of starts) compass(st.u, st.r, space, budget, evaluate);
  }

  const found = best as PlacementEvaluation | null;
  if (!found) throw new Error("placement search evaluated nothing"); // unreachable: the first placement is never pruned
  const final = evaluatePlacement(arm, req, found.placement, found.targets, ctx);
  const chosen = compareGoals(final.goal, found.goal) >= 0 ? final : found;
  const cls = mountingClass(m.orientation);
  const coverage = opts.coverageCells ? coverageOf(s, space, chosen.placement, opts.coverageCells) : null;
  return { ...chosen, evaluated: s.evaluated, pruned: s.pruned, mounting: cls, allowed: mountingAllowed(arm.specs?.mounting, cls), coverage };
}

/** The coverage map (see {@link CoverageMap}) at the placement's z and yaw, `cells` per free side. */
function coverageOf(s: Searcher, space: SearchSpace, at: Placement, cells: number): CoverageMap {
  const side = (k: "x" | "y") => (space.hi[k] > space.lo[k] ? Array.from({ length: cells }, (_, i) => space.lo[k] + ((i + 0.5) / cells) * (space.hi[k] - space.lo[k])) : [space.lo[k]]);
  const xs = side("x"), ys = side("y");
  const unit = (k: keyof Placement, v: number) => (space.hi[k] > space.lo[k] ? (v - space.lo[k]) / (space.hi[k] - space.lo[k]) : 0.5);
  const reached: number[] = [];
  for (const y of ys) {
    for (const x of xs) {
      const u = space.free.map((k) => unit(k, k === "x" ? x : k === "y" ? y : at[k]));
      const base = placementPose(s.req.mounting!.orientation, x, y, at.z, at.yaw);
      const pc = placedContext(s.ctx, s.arm, s.req, base);
      let count = 0;
      s.targets.forEach((_, k) => {
        if (solveTarget(s, pc, k, nearestWarm(s.warm[k], u, s.budget.warmStarts), 1, 0).reached) count++;
      });
      reached.push(count);
    }
  }
  return { xs, ys, z: at.z, yaw: at.yaw, reached, total: s.targets.length };
}

/**
 * The unit coordinates of the nominal base when it is one of the region's placements (its
 * position in the box, on a pedestal height if heights are given, and its rotation Rz(yaw) ·
 * orientation for a yaw in the range, to 1e-9), else null.
 */
function nominalInRegion(base: readonly number[], m: MountingSpec, space: SearchSpace): number[] | null {
  const o = m.orientation;
  // R · Oᵀ must be a rotation about z
  const r = (i: number, j: number) => base[4 * i] * o[4 * j] + base[4 * i + 1] * o[4 * j + 1] + base[4 * i + 2] * o[4 * j + 2];
  if (Math.abs(r(2, 2) - 1) > 1e-9 || Math.abs(r(0, 2)) > 1e-9 || Math.abs(r(1, 2)) > 1e-9) return null;
  let yaw = Math.atan2(r(1, 0), r(0, 0));
  const p: Placement = { x: base[3], y: base[7], z: base[11], yaw };
  for (const shift of [0, 2 * Math.PI, -2 * Math.PI]) {
    if (yaw + shift >= space.lo.yaw - 1e-12 && yaw + shift <= space.hi.yaw + 1e-12) { yaw += shift; break; }
  }
  p.yaw = yaw;
  const inside = (k: keyof Placement) => p[k] >= space.lo[k] - 1e-12 && p[k] <= space.hi[k] + 1e-12;
  if (!inside("x") || !inside("y") || !inside("yaw")) return null;
  const h = space.heights ? space.heights.findIndex((z) => Math.abs(z - p.z) <= 1e-9) : -1;
  if (space.heights ? h < 0 : !inside("z")) return null;
  const u = space.free.map((k) => (k === "z" && space.heights ? (h + 0.5) / space.heights.length : (p[k] - space.lo[k]) / (space.hi[k] - space.lo[k])));
  // the unit coordinates must map back onto the nominal base (a fixed coordinate must equal it)
  const back = space.at(u);
  return (["x", "y", "z", "yaw"] as const).every((k) => Math.abs(back[k] - p[k]) <= 1e-9) ? u : null;
}

/**
 * Compass search from u0 (Torczon's pattern search with the coordinate directions,
 * docs/references.md#pattern-search): poll u ± step·e_c for each free coordinate c in turn, move to
 * the first poll point better than the current one, else halve every step; stop when every step
 * is below its minimum or the evaluation budget is spent. Pedestal heights move by one height.
 */
function compass(u0: number[], r0: PlacementEvaluation, space: SearchSpace, budget: PlacementBudget, evaluate: (u: number[], ref: PlacementEvaluation) => PlacementEvaluation | null): void {
  const d = space.free.length;
  const step = space.free.map((k, c) => (k === "z" && space.heights ? space.minStep[c] : budget.initialStep));
  let u = [...u0], cur = r0, used = 0;
  const discrete = (c: number) => space.free[c] === "z" && space.heights !== null;
  while (used < budget.refineEvaluations) {
    let moved = false;
    for (let c = 0; c < d && !moved && used < budget.refineEvaluations; c++) {
      if (!discrete(c) && step[c] < space.minStep[c]) continue;
      for (const sign of [1, -1]) {
        const v = [...u];
        v[c] = Math.min(1, Math.max(0, u[c] + sign * step[c]));
        if (v[c] === u[c]) continue;
        used++;
        const r = evaluate(v, cur);
        if (r && compareGoals(r.goal, cur.goal) > 0 && meaningful(r.goal, cur.goal)) { u = v; cur = r; moved = true; break; }
        if (used >= budget.refineEvaluations) break;
      }
    }
    if (moved) continue;
    let any = false;
    for (let c = 0; c < d; c++) {
      if (discrete(c)) continue;
      step[c] /= 2;
      if (step[c] >= space.minStep[c]) any = true;
    }
    if (!any) break;
  }
}

/** An improvement worth a move: a count, or a margin or clearance gain above rounding (1e-9). */
function meaningful(a: PlacementGoal, b: PlacementGoal): boolean {
  if (a.must !== b.must || a.reached !== b.reached || a.followed !== b.followed) return true;
  if (a.worstMargin !== b.worstMargin) return a.worstMargin - b.worstMargin > 1e-9 || !Number.isFinite(a.worstMargin - b.worstMargin);
  return a.minClearance - b.minClearance > 1e-9 || !Number.isFinite(a.minClearance - b.minClearance);
}

/** One arm's placement in a shortlist: the search's result, or why it was not searched. */
export interface ArmPlacement {
  id: string;
  result: PlacementResult | null;
  /** Why there is no result (a mounting the datasheet does not allow, an invalid model). */
  skipped: string | null;
}

/**
 * The placement of every arm (same order), each searched alone: an arm's result does not depend
 * on the other arms or its place in the list. An arm whose datasheet lists mountings without the
 * orientation's class is not searched, and says so.
 */
export function placeShortlist(arms: readonly { id: string; arm: ArmDocument }[], req: RequirementSet, opts: SearchOptions & { onArm?(index: number): void } = {}): ArmPlacement[] {
  const m = req.mounting;
  if (!m) throw new RangeError("mounting: the requirement set has no mounting region");
  const cls = mountingClass(m.orientation);
  return arms.map(({ id, arm }, i) => {
    opts.onArm?.(i);
    if (mountingAllowed(arm.specs?.mounting, cls) === false) {
      return { id, result: null, skipped: `a ${cls} mount is not among the datasheet's mountings (${arm.specs!.mounting!.join(", ")})` };
    }
    try {
      return { id, result: searchPlacement(arm, req, opts), skipped: null };
    } catch (e) {
      if (e instanceof RangeError) return { id, result: null, skipped: `the arm model is invalid: ${e.message}` };
      throw e;
    }
  });
}
