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
import { rankArms, SUB_SCORE_KEYS, type ArmScoreInput, type RankedArm, type SubScore, type SubScoreKey } from "./ranking";
import { checkSpec, IEC_60529_NOTE, type SpecResult } from "./spec";
import { analyzeTarget, DEFAULT_TARGET_BUDGET, FORCE_MARGINAL_FRACTION, type TargetAnalysis, type TargetBudget } from "./targets";
import { analyzeWorkspace, DEFAULT_WORKSPACE_BUDGET, type WorkspaceAnalysis, type WorkspaceBudget } from "./workspace";
import type { Verdict } from "./types";

/** Bumped whenever a result could change for the same inputs (part of the cache key). */
export const ANALYSIS_VERSION = "analysis-1.4.0";

/** Shown on every analysis page and export (RULES: the usual caution). */
export const CAUTION =
  "Armsift is a kinematic and static screening aid. It is not a substitute for the maker's data, a risk assessment (ISO 12100, ISO 10218-2), the collaborative-operation limits of ISO/TS 15066, or local codes and licensed engineering practice. Dynamics, deflection, collisions with the cell and cycle time are not analysed.";

/** One arm of the shortlist: a pinned revision of an arm document. */
export interface ShortlistArm {
  id: string;
  revision: number;
  arm: ArmDocument;
}

/** Budgets (tunable without changing the meaning of the results). */
export interface AnalysisBudget {
  target: TargetBudget;
  path: PathBudget;
  workspace: WorkspaceBudget;
}
export const DEFAULT_BUDGET: AnalysisBudget = { target: DEFAULT_TARGET_BUDGET, path: DEFAULT_PATH_BUDGET, workspace: DEFAULT_WORKSPACE_BUDGET };

export interface AnalyzeOptions {
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
}

/** Counts of verdicts. */
export type VerdictCounts = Record<Verdict, number>;

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
  workspace: WorkspaceAnalysis | null;
  subScores: Record<SubScoreKey, SubScore>;
  /** Labels of failed `must` spec requirements (non-empty: disqualified). */
  failedMusts: string[];
  /** Labels of `must` spec requirements with missing data (flagged). */
  unknownMusts: string[];
  counts: { targets: VerdictCounts; paths: VerdictCounts; specs: VerdictCounts };
  /** One-line summary. */
  summary: string;
}

/** The result of {@link analyzeShortlist}. */
export interface ShortlistAnalysis {
  version: string;
  caution: string;
  requirementSet: { name: string; targets: string[]; paths: string[]; specs: string[] };
  /** Weights the ranking used (from the requirement set); re-rank with rankArms(arms, weights). */
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
  };
  budget: AnalysisBudget;
}

const emptyCounts = (): VerdictCounts => ({ meets: 0, marginal: 0, fails: 0, unknown: 0 });

/** Labels a spec requirement for lists of musts. */
function specLabel(r: SpecResult): string {
  const op = { atLeast: "≥", atMost: "≤", equals: "=", includes: "includes" }[r.comparator];
  return `${r.label} ${op} ${r.requiredDisplay}${r.displayUnit ? ` ${r.displayUnit}` : ""}`;
}

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
  // Progress steps per arm: each target, each path, then the workspace (specs are table look-ups).
  const nT = req.targets.length, nP = req.paths.length;
  const stepsPerArm = nT + nP + 1, total = Math.max(1, arms.length * stepsPerArm);
  let done = 0;
  const progress = (stage: string, steps = 1) => {
    done += steps;
    opts.onProgress?.(done === total ? 1 : done / total, stage);
  };

  const results: ArmAnalysis[] = arms.map((entry, ai) => {
    const arm = entry.arm;
    const label = `arm ${ai + 1}/${arms.length} ${arm.name}`;
    const specs = time("spec", () => req.specs.map((s, i) => checkSpec(arm, s, i)));
    // Seeds from the arm's content and the item's name, never from the arm's place in the list.
    const seedText = armSeedText(arm);
    const ident = { id: entry.id, revision: entry.revision, name: arm.name, maker: arm.maker ?? null, modelCode: arm.modelCode ?? null, axes: arm.joints.length };
    let ctx: ArmContext;
    try {
      ctx = createArmContext(arm, req, contentSeed(seedText, "ranks"));
    } catch (e) {
      const message = e instanceof Error ? e.message : String(e);
      progress(`${label}: not analysed (invalid model)`, stepsPerArm);
      return finishArm(ident, null, [], [], specs, null, req, `the arm model is invalid: ${message}`);
    }
    const targets = time("targets", () => req.targets.map((t, i) => {
      const r = analyzeTarget(ctx, arm, req, t, budget.target, contentSeed(seedText, "target", t.name), clock);
      progress(`${label}: target ${t.name} (${i + 1}/${nT})`);
      return r;
    }));
    const paths = time("paths", () => req.paths.map((p, i) => {
      const r = analyzePath(ctx, p, budget.path, contentSeed(seedText, "path", p.name));
      progress(`${label}: path ${p.name} (${i + 1}/${nP})`);
      return r;
    }));
    const workspace = time("workspace", () => analyzeWorkspace(ctx, arm.specs?.reach, req.targets.map((t, i) => ({ name: t.name, position: t.position, reached: targets[i].reached })), budget.workspace, contentSeed(seedText, "workspace")));
    progress(`${label}: workspace and specs`);
    return finishArm(ident, ctx, targets, paths, specs, workspace, req, null);
  });

  addPriceScores(results, arms);
  const ranking = rankArms(results.map((a): ArmScoreInput => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), req.weights);
  return {
    version: ANALYSIS_VERSION,
    caution: CAUTION,
    requirementSet: { name: req.name, targets: req.targets.map((t) => t.name), paths: req.paths.map((p) => p.name), specs: req.specs.map((s) => s.field) },
    weights: { ...req.weights },
    arms: results,
    ranking,
    thresholds: { dexterityMarginal: DEXTERITY_MARGINAL_THRESHOLD, forceMarginalFraction: FORCE_MARGINAL_FRACTION, speedMarginalRatio: SPEED_MARGINAL_RATIO, ipRule: IEC_60529_NOTE },
    budget,
  };
}

function finishArm(
  ident: Pick<ArmAnalysis, "id" | "revision" | "name" | "maker" | "modelCode" | "axes">,
  ctx: ArmContext | null,
  targets: TargetAnalysis[],
  paths: PathAnalysis[],
  specs: SpecResult[],
  workspace: WorkspaceAnalysis | null,
  req: RequirementSet,
  error: string | null,
): ArmAnalysis {
  const counts = { targets: emptyCounts(), paths: emptyCounts(), specs: emptyCounts() };
  targets.forEach((t) => counts.targets[t.verdict]++);
  paths.forEach((p) => counts.paths[p.verdict]++);
  specs.forEach((s) => counts.specs[s.verdict]++);
  const failedMusts = specs.filter((s) => s.priority === "must" && s.verdict === "fails").map(specLabel);
  const unknownMusts = specs.filter((s) => s.priority === "must" && s.verdict === "unknown").map(specLabel);
  const sub = subScores(ctx, targets, paths, req, error);
  const reached = targets.filter((t) => t.reached).length;
  const summary = error
    ? `not analysed: ${error}`
    : `${reached} of ${targets.length} targets reached, ${paths.filter((p) => p.verdict === "meets" || p.verdict === "marginal").length} of ${paths.length} paths followed` +
      (failedMusts.length ? `; fails must: ${failedMusts.join(", ")}` : "") + (unknownMusts.length ? `; unknown must: ${unknownMusts.join(", ")}` : "");
  return { ...ident, error, ranks: ctx?.ranks ?? null, targets, paths, specs, workspace, subScores: sub, failedMusts, unknownMusts, counts, summary };
}

const clamp01 = (x: number) => Math.min(1, Math.max(0, x));

/**
 * Sub-scores in [0, 1] (documented for the page):
 * - coverage: reached targets / targets (not applicable without targets);
 * - dexterity: the worst dexterity margin over the reached targets' chosen branches and the
 *   reached path samples (0 when nothing is reached);
 * - payload: 1 − L/C with L = tool + payload mass and C the smallest holdable total at the payload
 *   CoG over the reached targets (0 at the limit, ½ with twice the load); falls back to the rated
 *   payload without torque limits; unknown → 0 with a note;
 * - force: min over targets with a required force/moment of 1 − 1/s, s the capacity ratio (0 when
 *   just met or failed, ½ with twice the requirement); unknown → 0; not applicable without such targets;
 * - pathSpeed: min over paths of the achievable fraction of the required speed (0 for a path not
 *   followed); unknown (no speed limits) → 0;
 * - price: set by addPriceScores (cheapest price / this price).
 */
function subScores(ctx: ArmContext | null, targets: TargetAnalysis[], paths: PathAnalysis[], req: RequirementSet, error: string | null): Record<SubScoreKey, SubScore> {
  const out = {} as Record<SubScoreKey, SubScore>;
  const none = (note: string): SubScore => ({ value: 0, applicable: true, note });
  if (error || !ctx) {
    for (const k of SUB_SCORE_KEYS) out[k] = none("arm not analysed");
    return out;
  }
  const reached = targets.filter((t) => t.reached);
  out.coverage = targets.length === 0
    ? { value: 0, applicable: false, note: "no targets" }
    : { value: reached.length / targets.length, applicable: true, note: `${reached.length} of ${targets.length} targets reached` };

  const margins = [...reached.map((t) => t.dexterity!.margin), ...paths.map((p) => p.minDexterityMargin).filter((m): m is number => m !== null)];
  out.dexterity = targets.length + paths.length === 0
    ? { value: 0, applicable: false, note: "no targets or paths" }
    : margins.length === 0 ? none("nothing reached") : { value: clamp01(Math.min(...margins)), applicable: true, note: `worst dexterity margin ${Math.min(...margins).toFixed(2)}` };

  const L = ctx.loadMass;
  const caps = reached.map((t) => t.holding!).filter((h) => h.payloadCapacity !== null);
  if (targets.length === 0) out.payload = { value: 0, applicable: false, note: "no targets" };
  else if (reached.length === 0) out.payload = none("nothing reached");
  else if (reached.some((t) => t.holding!.verdict === "fails")) out.payload = none("cannot hold the load at some target");
  else if (caps.length === 0) out.payload = none(L === 0 ? "no load; no capacity figure" : "payload capacity unknown (no torque limits or rated payload): scored 0");
  else {
    const C = Math.min(...caps.map((h) => h.payloadCapacity!));
    const basis = caps[0].basis === "rated-payload" ? "rated payload (datasheet)" : "joint torque limits";
    out.payload = { value: C > 0 ? clamp01(1 - L / C) : 0, applicable: true, note: `load ${L.toFixed(2)} kg of ${C.toFixed(2)} kg holdable at the worst target (${basis})` };
  }

  const forceTargets = req.targets.map((t, i) => ({ t, a: targets[i] })).filter((x) => x.t.force || x.t.moment);
  if (forceTargets.length === 0) out.force = { value: 0, applicable: false, note: "no required forces" };
  else {
    let worst = 1, note = "";
    for (const { t, a } of forceTargets) {
      let v: number, why: string;
      if (!a.reached || !a.force) { v = 0; why = `${t.name} not reached`; }
      else if (a.force.status === "no-limits") { v = 0; why = `${t.name}: capability unknown (no torque limits), scored 0`; }
      else if (a.force.status === "unbounded") { v = 1; why = `${t.name}: carried by the structure`; }
      else { v = clamp01(1 - 1 / Math.max(a.force.capacityRatio!, 1e-12)); why = `${t.name}: capability ${a.force.capacityRatio!.toFixed(2)}× the requirement`; }
      if (v < worst || note === "") { worst = Math.min(worst, v); note = why; }
    }
    out.force = { value: worst, applicable: true, note };
  }

  if (paths.length === 0) out.pathSpeed = { value: 0, applicable: false, note: "no paths" };
  else {
    let worst = 1, note = "";
    for (const p of paths) {
      let v: number, why: string;
      if (p.verdict === "fails" && (p.reached < p.samples || p.flips.some((f) => f.joint !== null))) { v = 0; why = `${p.name} not followed`; }
      else if (p.speed.achievableFraction === null) { v = 0; why = `${p.name}: speed unknown (no joint speed limits), scored 0`; }
      else { v = p.speed.achievableFraction; why = `${p.name}: ${(v * 100).toFixed(0)} % of the required speed`; }
      if (v < worst || note === "") { worst = Math.min(worst, v); note = why; }
    }
    out.pathSpeed = { value: worst, applicable: true, note };
  }
  out.price = none("price unknown: scored 0");
  return out;
}

/** price sub-score = cheapest price / this price, among arms quoted in the cheapest arm's currency. */
function addPriceScores(results: ArmAnalysis[], arms: readonly ShortlistArm[]): void {
  const priced = arms.map((a, i) => ({ i, price: a.arm.specs?.price, currency: a.arm.specs?.currency ?? null }))
    .filter((x): x is { i: number; price: number; currency: string | null } => typeof x.price === "number" && x.price > 0);
  if (priced.length === 0) return;
  // Ties on price are broken by currency code (content, not list order).
  const cur = (x: { currency: string | null }) => x.currency ?? "\uffff";
  const cheapest = priced.reduce((a, b) => (b.price < a.price || (b.price === a.price && cur(b) < cur(a)) ? b : a));
  for (const p of priced) {
    const r = results[p.i];
    if (p.currency !== cheapest.currency) {
      r.subScores.price = { value: 0, applicable: true, note: `price in ${p.currency ?? "an unstated currency"}, not comparable with the cheapest (${cheapest.currency ?? "unstated"}): scored 0` };
    } else {
      r.subScores.price = { value: cheapest.price / p.price, applicable: true, note: p.price === cheapest.price ? "cheapest candidate" : `${(p.price / cheapest.price).toFixed(2)}× the cheapest candidate` };
    }
  }
}
