/**
 * The whole analysis of a shortlist: every arm against one requirement set. Pure and
 * deterministic (no clock, no Math.random: every restart and sample is seeded), synchronous, and
 * JSON-serialisable. The shortlist page is built on {@link ShortlistAnalysis}.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet, Weights } from "@/shared/schemas/requirements";
import { armSeedText, contentSeed } from "./canonical";
import { createArmContext, type ArmContext } from "./context";
import type { StructuralRanks } from "./dexterity";
import { DEXTERITY_MARGINAL_THRESHOLD } from "./dexterity";
import { analyzePath, DEFAULT_PATH_BUDGET, SPEED_MARGINAL_RATIO, type PathAnalysis, type PathBudget } from "./paths";
import { SUB_SCORES } from "@/shared/sub-scores";
import { rankArms, type ArmScoreInput, type RankedArm, type SubScore, type SubScoreKey } from "./ranking";
import { SUB_SCORE_RULES, zeroScore } from "./sub-scores";
import { checkSpec, IEC_60529_NOTE, requirementText, type SpecResult } from "./spec";
import { analyzeTarget, DEFAULT_TARGET_BUDGET, FORCE_MARGINAL_FRACTION, type TargetAnalysis, type TargetBudget } from "./targets";
import { analyzeWorkspace, DEFAULT_WORKSPACE_BUDGET, type WorkspaceAnalysis, type WorkspaceBudget } from "./workspace";
import type { Verdict } from "./types";
import { analyzeCycles, unknownCycle, type CycleResult } from "./cycle";
import { placeShortlist, type CoverageMap, type Placement } from "./placement";
import type { MountingSpec } from "@/shared/schemas/mounting";
import { createMoveChecker } from "./cycle-cell";

/** Bumped whenever a result could change for the same inputs (part of the cache key). */
export const ANALYSIS_VERSION = "analysis-1.11.1";

/** Shown on every analysis page and export (docs/design.md#cautions). */
export const CAUTION =
  "Armsift is a kinematic and static screening aid. It is not a substitute for the maker's data, a risk assessment (ISO 12100, ISO 10218-2), the collaborative-operation limits of ISO/TS 15066, or local codes and licensed engineering practice. Collisions are checked only between the rigid capsules and primitives entered (links, base, tool, payload, obstacles): no cable packs, dress packs or people unless modelled, and the check is not a safety function. Dynamics and deflection are not analysed; cycle times are estimates from the joint speed and acceleration limits for comparing arms (no blending, payload effect or controller limits), not a promise: the maker's data and a trial in the cell decide.";

/** One arm of the shortlist: a pinned revision of an arm document. */
export interface ShortlistArm {
  id: string;
  revision: number;
  arm: ArmDocument;
}

/** Budgets (tunable without changing the meaning of the results). */
interface AnalysisBudget {
  target: TargetBudget;
  path: PathBudget;
  workspace: WorkspaceBudget;
}
export const DEFAULT_BUDGET: AnalysisBudget = { target: DEFAULT_TARGET_BUDGET, path: DEFAULT_PATH_BUDGET, workspace: DEFAULT_WORKSPACE_BUDGET };

interface AnalyzeOptions {
  /**
   * Called after each target, each path and the workspace of each arm with the overall fraction
   * done (0…1) and a description of the step just finished, e.g.
   * "arm 3/7 Helper Seven 7: target press-fit (4/9)". The fraction advances by one step of
   * arms × (targets + paths + 1) and ends at exactly 1.
   */
  onProgress?(fraction: number, stage: string): void;
  /** Budgets; the defaults are used for cached results (changing them changes the key). */
  budget?: AnalysisBudget;
  /** Collect wall-clock timings per stage (for the benchmark only; the result does not contain them). */
  timer?: (stage: "ik" | "dexterity" | "statics" | "targets" | "paths" | "workspace" | "spec", ms: number) => void;
  /** A clock for `timer` (e.g. performance.now); never used otherwise. */
  now?: () => number;
  /**
   * Applied to each arm's analysis as soon as it is complete (its sub-scores included), before the
   * next arm: e.g. compactArm (compact.ts), so that a large shortlist never holds every arm's
   * per-sample data at once. The ranking is made from the arms it returns.
   */
  mapArm?: (arm: ArmAnalysis) => ArmAnalysis;
}

/** Counts of verdicts. */
type VerdictCounts = Record<Verdict, number>;

/** Everything about one arm. */
export interface ArmAnalysis {
  id: string;
  revision: number;
  name: string;
  maker: string | null;
  modelCode: string | null;
  axes: number;
  /** Set when the arm could not be analysed (its model is invalid); everything else is then empty. */
  error: string | null;
  /** Generic ranks of the Jacobian blocks (see dexterity.ts). */
  ranks: StructuralRanks | null;
  /** One entry per requirement-set target, same order. */
  targets: TargetAnalysis[];
  /** One entry per requirement-set path, same order. */
  paths: PathAnalysis[];
  /** One entry per spec requirement, same order (the compliance table). */
  specs: SpecResult[];
  /** One entry per requirement-set sequence, same order: the cycle time (docs/design.md#cycle-time). */
  cycles: CycleResult[];
  workspace: WorkspaceAnalysis | null;
  /** What the cell checks for this arm (null when the arm could not be analysed). */
  cell: ArmCell | null;
  subScores: Record<SubScoreKey, SubScore>;
  /** Labels of failed `must` spec requirements (non-empty: disqualified). */
  failedMusts: string[];
  /** Labels of `must` spec requirements with missing data (flagged). */
  unknownMusts: string[];
  counts: { targets: VerdictCounts; paths: VerdictCounts; specs: VerdictCounts };
  /** One-line summary. */
  summary: string;
}

/** One arm of a finished run with the arm and requirement-set revisions it was computed from (what the 3-D view draws). */
export interface RunArmView {
  runId: string;
  armId: string;
  revision: number;
  arm: ArmDocument;
  requirementSet: RequirementSet;
  analysis: ArmAnalysis;
}

/** What the cell checks for one arm. */
interface ArmCell {
  /** Pairs of bodies checked at every configuration. */
  checkedPairs: number;
  /** Pairs not checked, by name, and why (the arm's ignored pairs, or derived capsules that always touch). */
  skipped: { a: string; b: string; why: "ignored" | "always touching" }[];
  /** Links without collision geometry (not checked). */
  unmodelled: string[];
  /** Where each link's capsules come from. */
  linkSources: ("collision" | "derived" | "none")[];
}

/**
 * The cell the analysis used (absent in results made before collisions were checked: such a
 * result was made without the cell).
 */
interface ShortlistCell {
  /** Obstacle names, in the requirement set's order. */
  obstacles: string[];
  /** Required clearance (m). */
  clearance: number;
  /** The tool and the payload have collision shapes. */
  toolShapes: number;
  payloadShapes: number;
}

/** The result of {@link analyzeShortlist}. */
export interface ShortlistAnalysis {
  version: string;
  caution: string;
  requirementSet: { name: string; targets: string[]; paths: string[]; specs: string[]; sequences: string[] };
  /** The cell the analysis used (absent in older results: made without the cell). */
  cell?: ShortlistCell;
  /** Weights the ranking used (from the requirement set); re-rank with rerank(result, weights). */
  weights: Weights;
  arms: ArmAnalysis[];
  /** Best first (qualified arms, then disqualified ones). */
  ranking: RankedArm[];
  /** The thresholds behind the verdicts, for the page's legend. */
  thresholds: {
    dexterityMarginal: number;
    forceMarginalFraction: number;
    speedMarginalRatio: number;
    ipRule: string;
    /** Required clearance (m), absent in older results. */
    clearance?: number;
  };
  budget: AnalysisBudget;
  /** With a mounting region: every arm at its own best placement (absent without a region, and in older results). */
  placement?: ShortlistPlacement;
}

/** One arm's placement in the analysis. */
export interface ArmPlacementResult {
  id: string;
  /** Why the arm was not placed (a mounting its datasheet does not allow, an invalid model), else null. */
  skipped: string | null;
  /** The placement found (m, rad) and its base pose T_C_B (row-major 4×4). */
  placement: Placement | null;
  base: number[] | null;
  /** Placements the search evaluated. */
  evaluated: number;
  /** The search's goal there (worstMargin, minClearance null when nothing is reached or measured). */
  goal: { must: number; reached: number; followed: number; worstMargin: number | null; minClearance: number | null } | null;
  /** The arm analysed at its placement. */
  analysis: ArmAnalysis | null;
  /** Targets reached over the region's x–y plane at the placement's z and yaw. */
  coverage: CoverageMap | null;
}

/** The placement part of a result. */
export interface ShortlistPlacement {
  mounting: MountingSpec;
  /** The targets in plan view (cell frame x, y; m), for the coverage maps. */
  targets: { name: string; x: number; y: number }[];
  arms: ArmPlacementResult[];
  /** Every arm at its own placement, best first. */
  ranking: RankedArm[];
}

const emptyCounts = (): VerdictCounts => ({ meets: 0, marginal: 0, fails: 0, unknown: 0 });


/**
 * Analyses every arm against the requirement set: targets (IK branches, dexterity, statics,
 * force and wrist checks), paths, workspace and spec compliance, then sub-scores and the ranking.
 * Same inputs ⇒ byte-identical JSON.
 */
export function analyzeShortlist(arms: readonly ShortlistArm[], req: RequirementSet, opts: AnalyzeOptions = {}): ShortlistAnalysis {
  const budget = opts.budget ?? DEFAULT_BUDGET;
  const now = opts.now, timer = opts.timer;
  const clock = now && timer ? { now, add: (stage: "ik" | "dexterity" | "statics", ms: number) => timer(stage, ms) } : undefined;
  const time = <T>(stage: "targets" | "paths" | "workspace" | "spec", f: () => T): T => {
    if (!now || !timer) return f();
    const t0 = now();
    const r = f();
    timer(stage, now() - t0);
    return r;
  };
  // Progress steps per arm: each target, each path, then the workspace (specs are table look-ups);
  // with a mounting region, the placement search counts as one arm's worth of steps and the arm is
  // analysed again at its placement.
  const nT = req.targets.length, nP = req.paths.length;
  const stepsPerArm = nT + nP + 1, total = Math.max(1, arms.length * stepsPerArm * (req.mounting ? 3 : 1));
  let done = 0;
  const progress = (stage: string, steps = 1) => {
    done += steps;
    opts.onProgress?.(done === total ? 1 : done / total, stage);
  };

  const candidates = arms.map((a) => a.arm);
  const mapArm = opts.mapArm ?? ((a: ArmAnalysis) => a);
  /** One arm against `rs` (the set itself, or the set with the arm's placement as its base). */
  const analyzeArm = (entry: ShortlistArm, rs: RequirementSet, label: string): ArmAnalysis => {
    const arm = entry.arm;
    const specs = time("spec", () => rs.specs.map((s, i) => checkSpec(arm, s, i)));
    // Seeds from the arm's content and the item's name, never from the arm's place in the list.
    const seedText = armSeedText(arm);
    const ident = { id: entry.id, revision: entry.revision, name: arm.name, maker: arm.maker ?? null, modelCode: arm.modelCode ?? null, axes: arm.joints.length };
    let ctx: ArmContext;
    try {
      ctx = createArmContext(arm, rs, contentSeed(seedText, "ranks"));
    } catch (e) {
      const message = e instanceof Error ? e.message : String(e);
      progress(`${label}: not analysed (invalid model)`, stepsPerArm);
      return mapArm(finishArm(ident, arm, null, [], [], specs, null, rs, candidates, `the arm model is invalid: ${message}`));
    }
    const targets = time("targets", () => rs.targets.map((t, i) => {
      const r = analyzeTarget(ctx, arm, rs, t, budget.target, contentSeed(seedText, "target", t.name), clock);
      progress(`${label}: target ${t.name} (${i + 1}/${nT})`);
      return r;
    }));
    const paths = time("paths", () => rs.paths.map((p, i) => {
      const r = analyzePath(ctx, p, budget.path, contentSeed(seedText, "path", p.name));
      progress(`${label}: path ${p.name} (${i + 1}/${nP})`);
      return r;
    }));
    const workspace = time("workspace", () => analyzeWorkspace(ctx, arm.specs?.reach, rs.targets.map((t, i) => ({ name: t.name, position: t.position, reached: targets[i].reached })), budget.workspace, contentSeed(seedText, "workspace")));
    progress(`${label}: workspace and specs`);
    return mapArm(finishArm(ident, arm, ctx, targets, paths, specs, workspace, rs, candidates, null));
  };
  const results: ArmAnalysis[] = arms.map((entry, ai) => analyzeArm(entry, req, `arm ${ai + 1}/${arms.length} ${entry.arm.name}`));
  const placement = req.mounting ? placeArms(arms, req, (entry, rs, label) => analyzeArm(entry, rs, label), progress, stepsPerArm) : undefined;

  const ranking = rerank({ arms: results }, req.weights);
  return {
    version: ANALYSIS_VERSION,
    caution: CAUTION,
    requirementSet: { name: req.name, targets: req.targets.map((t) => t.name), paths: req.paths.map((p) => p.name), specs: req.specs.map((s) => s.field), sequences: (req.sequences ?? []).map((q) => q.name) },
    cell: { obstacles: req.cell.obstacles.map((o) => o.name), clearance: req.cell.clearance, toolShapes: req.tool.collision?.length ?? 0, payloadShapes: req.payload.collision?.length ?? 0 },
    weights: { ...req.weights },
    arms: results,
    ranking,
    thresholds: { dexterityMarginal: DEXTERITY_MARGINAL_THRESHOLD, forceMarginalFraction: FORCE_MARGINAL_FRACTION, speedMarginalRatio: SPEED_MARGINAL_RATIO, ipRule: IEC_60529_NOTE, clearance: req.cell.clearance },
    budget,
    ...(placement ? { placement } : {}),
  };
}

/** Cells per side of the placement coverage map. */
const COVERAGE_CELLS = 10;

/**
 * The placement part of the analysis (docs/design.md#mount-placement): each arm's placement
 * search, the arm analysed again at its placement (the set with that placement as its base), the
 * ranking of every arm at its own placement, and the coverage map at the best z and yaw.
 */
function placeArms(
  arms: readonly ShortlistArm[], req: RequirementSet,
  analyzeAt: (entry: ShortlistArm, rs: RequirementSet, label: string) => ArmAnalysis,
  progress: (stage: string, steps?: number) => void, stepsPerArm: number,
): ShortlistPlacement {
  const mounting = req.mounting!;
  const out: ArmPlacementResult[] = arms.map((entry, ai) => {
    const label = `arm ${ai + 1}/${arms.length} ${entry.arm.name}`;
    const [p] = placeShortlist([{ id: entry.id, arm: entry.arm }], req, {
      coverageCells: COVERAGE_CELLS,
      onProgress: (evaluated, best) => {
        if (evaluated % 10 === 0) progress(`${label}: placement search, ${evaluated} placements evaluated, best so far ${best ? `${best.reached}/${req.targets.length} targets, ${best.followed}/${req.paths.length} paths` : "none"}`, 0);
      },
    });
    progress(`${label}: placement search done${p.result ? ` (${p.result.evaluated} placements evaluated)` : ""}`, stepsPerArm);
    if (!p.result) {
      progress(`${label}: not placed`, stepsPerArm);
      return { id: entry.id, skipped: p.skipped, placement: null, base: null, evaluated: 0, goal: null, analysis: null, coverage: null };
    }
    const r = p.result;
    const analysis = analyzeAt(entry, { ...req, base: r.base }, `${label} at its placement`);
    return {
      id: entry.id, skipped: null, placement: r.placement, base: r.base, evaluated: r.evaluated,
      goal: { must: r.goal.must, reached: r.goal.reached, followed: r.goal.followed, worstMargin: Number.isFinite(r.goal.worstMargin) ? r.goal.worstMargin : null, minClearance: Number.isFinite(r.goal.minClearance) ? r.goal.minClearance : null },
      analysis, coverage: r.coverage,
    };
  });
  // An arm that could not be placed (a mounting its datasheet does not allow) ranks after the placed ones.
  const ranking = rankPlaced(out, req.weights);
  return { mounting: { ...mounting }, targets: req.targets.map((t) => ({ name: t.name, x: t.position[0], y: t.position[1] })), arms: out, ranking };
}

/** The ranking of the arms at their placements (an arm without one is disqualified, and says why). */
export function rankPlaced(arms: readonly ArmPlacementResult[], weights: Weights): RankedArm[] {
  return rankArms(arms.map((a): ArmScoreInput => a.analysis
    ? { armId: a.id, subScores: a.analysis.subScores, failedMusts: a.analysis.failedMusts, unknownMusts: a.analysis.unknownMusts }
    : { armId: a.id, subScores: zeroSubScores(a.skipped ?? "not placed"), failedMusts: [`placement: ${a.skipped ?? "not placed"}`], unknownMusts: [] }), weights);
}

function zeroSubScores(why: string): Record<SubScoreKey, SubScore> {
  const out = {} as Record<SubScoreKey, SubScore>;
  for (const k of SUB_SCORES.keys) out[k] = zeroScore(why);
  return out;
}

function finishArm(
  ident: Pick<ArmAnalysis, "id" | "revision" | "name" | "maker" | "modelCode" | "axes">,
  arm: ArmDocument,
  ctx: ArmContext | null,
  targets: TargetAnalysis[],
  paths: PathAnalysis[],
  specs: SpecResult[],
  workspace: WorkspaceAnalysis | null,
  req: RequirementSet,
  candidates: readonly ArmDocument[],
  error: string | null,
): ArmAnalysis {
  const counts = { targets: emptyCounts(), paths: emptyCounts(), specs: emptyCounts() };
  targets.forEach((t) => counts.targets[t.verdict]++);
  paths.forEach((p) => counts.paths[p.verdict]++);
  specs.forEach((s) => counts.specs[s.verdict]++);
  const failedMusts = specs.filter((s) => s.priority === "must" && s.verdict === "fails").map((s) => requirementText(s));
  const unknownMusts = specs.filter((s) => s.priority === "must" && s.verdict === "unknown").map((s) => requirementText(s));
  const cycles = error ? (req.sequences ?? []).map((q) => unknownCycle(q, `not analysed: ${error}`)) : analyzeCycles(arm, { targets, paths }, req, ctx ? createMoveChecker(ctx, req) : null);
  const sub = subScores(arm, error ? null : ctx, targets, paths, cycles, req, candidates);
  const reached = targets.filter((t) => t.reached).length;
  const summary = error
    ? `not analysed: ${error}`
    : `${reached} of ${targets.length} targets reached, ${paths.filter((p) => p.verdict === "meets" || p.verdict === "marginal").length} of ${paths.length} paths followed` +
      (failedMusts.length ? `; fails must: ${failedMusts.join(", ")}` : "") + (unknownMusts.length ? `; unknown must: ${unknownMusts.join(", ")}` : "");
  const cell: ArmCell | null = ctx && !error
    ? { checkedPairs: ctx.cell.pairs.length, skipped: [...ctx.cell.skipped], unmodelled: [...ctx.cell.unmodelled], linkSources: ctx.cell.links.map((l) => l.source) }
    : null;
  return { ...ident, error, ranks: ctx?.ranks ?? null, targets, paths, specs, cycles, workspace, cell, subScores: sub, failedMusts, unknownMusts, counts, summary };
}

/**
 * The sub-scores in [0, 1], one per row of the sub-score table, each computed by its rule in
 * ./sub-scores (definitions in docs/design.md#ranking).
 */
function subScores(arm: ArmDocument, ctx: ArmContext | null, targets: TargetAnalysis[], paths: PathAnalysis[], cycles: CycleResult[], req: RequirementSet, candidates: readonly ArmDocument[]): Record<SubScoreKey, SubScore> {
  const out = {} as Record<SubScoreKey, SubScore>;
  for (const k of SUB_SCORES.keys) {
    const rule = SUB_SCORE_RULES[k];
    if (!rule) throw new Error(`sub-score ${k} has no rule in lib/analysis/sub-scores.ts`);
    out[k] = ctx ? rule.score({ arm, ctx, targets, paths, cycles, req, candidates }) : rule.unanalysed ? rule.unanalysed(arm, candidates) : zeroScore("arm not analysed");
  }
  return out;
}

/**
 * The ranking of a result's arms with the given weights: the same rule the analysis ranks with,
 * for the live weights of the page, exports with other weights and views that leave a weight out.
 */
export function rerank(result: { arms: readonly Pick<ArmAnalysis, "id" | "subScores" | "failedMusts" | "unknownMusts">[] }, weights: Weights): RankedArm[] {
  return rankArms(result.arms.map((a): ArmScoreInput => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), weights);
}
