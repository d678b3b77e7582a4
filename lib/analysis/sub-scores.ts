/**
 * The computation of each ranking sub-score, one rule per row of the table in
 * `shared/sub-scores.ts` (same key). A rule returns a value in [0, 1], whether it applies to the
 * requirement set, and a note in words; the definitions are in docs/design.md#ranking. Pure.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet } from "@/shared/schemas/requirements";
import type { SubScoreKey } from "@/shared/sub-scores";
import type { ArmContext } from "./context";
import type { PathAnalysis } from "./paths";
import type { SubScore } from "./ranking";
import type { TargetAnalysis } from "./targets";
import type { CycleResult } from "./cycle";
import { fixed } from "@/shared/format";

/** What a rule sees of an analysed arm. */
interface AnalysedArm {
  arm: ArmDocument;
  ctx: ArmContext;
  /** Same order as the requirement set's targets and paths. */
  targets: readonly TargetAnalysis[];
  paths: readonly PathAnalysis[];
  /** The cycle of each requirement-set sequence, same order (empty without sequences). */
  cycles: readonly CycleResult[];
  req: RequirementSet;
  /** Every arm document of the shortlist, for relative scores (price); never their order. */
  candidates: readonly ArmDocument[];
}

interface SubScoreRule {
  /** Scores an analysed arm. */
  score(input: AnalysedArm): SubScore;
  /**
   * Scores an arm whose model could not be analysed, from its document alone. Without it such an
   * arm scores 0 with the note "arm not analysed".
   */
  unanalysed?(arm: ArmDocument, candidates: readonly ArmDocument[]): SubScore;
}

const clamp01 = (x: number) => Math.min(1, Math.max(0, x));
/** 0, applicable, with a note (missing data is never a pass). */
export const zeroScore = (note: string): SubScore => ({ value: 0, applicable: true, note });
const notApplicable = (note: string): SubScore => ({ value: 0, applicable: false, note });

/** coverage: reached targets / targets; not applicable without targets. */
const coverage: SubScoreRule = {
  score({ targets }) {
    const reached = targets.filter((t) => t.reached).length;
    return targets.length === 0
      ? notApplicable("no targets")
      : { value: reached / targets.length, applicable: true, note: `${reached} of ${targets.length} targets reached` };
  },
};

/** dexterity: the worst dexterity margin over the reached targets' chosen branches and the reached path samples. */
const dexterity: SubScoreRule = {
  score({ targets, paths }) {
    if (targets.length + paths.length === 0) return notApplicable("no targets or paths");
    const margins = [...targets.filter((t) => t.reached).map((t) => t.dexterity!.margin), ...paths.map((p) => p.minDexterityMargin).filter((m): m is number => m !== null)];
    if (margins.length === 0) return zeroScore("nothing reached");
    const worst = Math.min(...margins);
    return { value: clamp01(worst), applicable: true, note: `worst dexterity margin ${fixed(worst, 2)}` };
  },
};

/**
 * payload: 1 − L/C with L = tool + payload mass and C the smallest holdable total over the reached
 * targets, the tool at its CoG and the payload at the payload CoG (tool mass + holdable payload;
 * 0 at the limit, ½ with twice the load); the rated payload stands in without torque limits;
 * unknown → 0 with a note.
 */
const payload: SubScoreRule = {
  score({ ctx, targets }) {
    const L = ctx.loadMass;
    const reached = targets.filter((t) => t.reached);
    const caps = reached.map((t) => t.holding!).filter((h) => h.payloadCapacity !== null);
    if (targets.length === 0) return notApplicable("no targets");
    if (reached.length === 0) return zeroScore("nothing reached");
    if (reached.some((t) => t.holding!.verdict === "fails")) return zeroScore("cannot hold the load at some target");
    if (caps.length === 0) return zeroScore(L === 0 ? "no load; no capacity figure" : "payload capacity unknown (no torque limits or rated payload): scored 0");
    const C = Math.min(...caps.map((h) => h.payloadCapacity!));
    const basis = caps[0].basis === "rated-payload" ? "rated payload (datasheet)" : "joint torque limits";
    return { value: C > 0 ? clamp01(1 - L / C) : 0, applicable: true, note: `tool + payload ${fixed(L, 2)} kg of ${fixed(C, 2)} kg holdable at the worst target (tool at its CoG, payload at the payload CoG; ${basis})` };
  },
};

/**
 * force: min over the targets with a required force or moment of 1 − 1/s, s the capability
 * ratio (0 when just met or failed, ½ with twice the requirement); unknown → 0; not applicable
 * without such targets.
 */
const force: SubScoreRule = {
  score({ req, targets }) {
    const forceTargets = req.targets.map((t, i) => ({ t, a: targets[i] })).filter((x) => x.t.force || x.t.moment);
    if (forceTargets.length === 0) return notApplicable("no required forces");
    let worst = 1, note = "";
    for (const { t, a } of forceTargets) {
      let v: number, why: string;
      if (!a.reached || !a.force) { v = 0; why = `${t.name} not reached`; }
      else if (a.force.status === "no-limits") { v = 0; why = `${t.name}: capability unknown (no torque limits), scored 0`; }
      else if (a.force.status === "unbounded") { v = 1; why = `${t.name}: carried by the structure`; }
      else { v = clamp01(1 - 1 / Math.max(a.force.capacityRatio!, 1e-12)); why = `${t.name}: capability ${fixed(a.force.capacityRatio!, 2)}× the requirement`; }
      if (v < worst || note === "") { worst = Math.min(worst, v); note = why; }
    }
    return { value: worst, applicable: true, note };
  },
};

/** pathSpeed: min over paths of the achievable fraction of the required speed (0 for a path not followed); unknown → 0. */
const pathSpeed: SubScoreRule = {
  score({ paths }) {
    if (paths.length === 0) return notApplicable("no paths");
    let worst = 1, note = "";
    for (const p of paths) {
      let v: number, why: string;
      if (p.verdict === "fails" && (p.reached < p.samples || p.flips.some((f) => f.joint !== null) || p.cell?.collisionFree === false)) { v = 0; why = `${p.name} not followed`; }
      else if (p.speed.achievableFraction === null) { v = 0; why = `${p.name}: speed unknown (no joint speed limits), scored 0`; }
      else { v = p.speed.achievableFraction; why = `${p.name}: ${fixed(v * 100, 0)} % of the required speed`; }
      if (v < worst || note === "") { worst = Math.min(worst, v); note = why; }
    }
    return { value: worst, applicable: true, note };
  },
};

/** The clearance that scores 1: twice the required one, and at least this (m). */
const CLEARANCE_SCORE_FLOOR = 0.02;

/**
 * clearance: min over the reached targets (chosen branch) and the paths of c / c₁ clipped to
 * [0, 1], with c the smallest distance over the checked pairs (a colliding path scores 0) and
 * c₁ = max(2 × required clearance, 20 mm): ½ at the required clearance, 0 in contact. Applies
 * when the cell has obstacles, the tool or payload has shapes, or any candidate arm has collision
 * geometry; an arm with nothing checked scores 0 (unknown is never a pass).
 */
const clearance: SubScoreRule = {
  score({ ctx, targets, paths, req, candidates }) {
    const modelled = req.cell.obstacles.length > 0 || (req.tool.collision?.length ?? 0) > 0 || (req.payload.collision?.length ?? 0) > 0 ||
      candidates.some((a) => (a.baseCollision?.length ?? 0) > 0 || a.joints.some((j) => (j.collision?.length ?? 0) > 0 || (j.radius ?? 0) > 0));
    if (!modelled) return notApplicable("no collision geometry in the cell or on the arms");
    if (!ctx.cell.active) return zeroScore("nothing checked for this arm (no collision geometry on it, the tool or the payload): scored 0");
    const ref = Math.max(2 * req.cell.clearance, CLEARANCE_SCORE_FLOOR);
    let worst = Infinity, note = "";
    const consider = (c: number, why: string) => { if (c < worst) { worst = c; note = why; } };
    targets.forEach((t) => {
      if (!t.reached || !t.cell || t.cell.clearance === null || !t.cell.closest) return;
      consider(t.cell.clearance, `${t.name}: ${fixed(t.cell.clearance * 1000, 1)} mm (${t.cell.closest.a} to ${t.cell.closest.b})`);
    });
    paths.forEach((p) => {
      if (!p.cell) return;
      if (!p.cell.collisionFree) consider(0, `${p.name}: collides`);
      else if (p.cell.clearance !== null && p.cell.closest) consider(p.cell.clearance, `${p.name}: ${fixed(p.cell.clearance * 1000, 1)} mm (${p.cell.closest.a} to ${p.cell.closest.b})`);
    });
    if (worst === Infinity) return zeroScore("no reached target or path to measure: scored 0");
    return { value: clamp01(worst / ref), applicable: true, note: `smallest clearance ${note}; scores 1 at ${fixed(ref * 1000, 0)} mm` };
  },
};

/** The cycle time that scores 0, as a multiple of the required time. */
const CYCLE_SCORE_ZERO = 2;

/**
 * cycleTime: min over the sequences with a required time R of 1 − t/(2R) clipped to [0, 1], t the
 * arm's cycle time: 1 for an instant cycle, ½ at the required time, 0 at twice it or slower; a
 * cycle that cannot be estimated (a target not reached, a path not followed, every branch
 * combination blocked, a speed limit missing) scores 0. Sequences without a required time give
 * the time no scale and are left out; not applicable without sequences or without any required
 * time. An estimate (an assumed acceleration) scores like a figure and says so in the note.
 */
const cycleTime: SubScoreRule = {
  score({ cycles }) {
    if (cycles.length === 0) return notApplicable("no sequences");
    const timed = cycles.filter((c): c is CycleResult & { required: number } => c.required !== null);
    if (timed.length === 0) return notApplicable("no sequence has a required cycle time");
    let worst = Infinity, note = "";
    for (const c of timed) {
      let v: number, why: string;
      if (c.time === null) { v = 0; why = `${c.name}: cycle time unknown, scored 0`; }
      else {
        v = clamp01(1 - c.time / (CYCLE_SCORE_ZERO * c.required));
        why = `${c.name}: ${fixed(c.time, 2)} s against the required ${fixed(c.required, 2)} s${c.estimate ? " (an estimate: assumed acceleration)" : ""}`;
      }
      if (v < worst) { worst = v; note = why; }
    }
    const skipped = cycles.length - timed.length;
    return { value: worst, applicable: true, note: note + (skipped ? `; ${skipped} sequence${skipped === 1 ? "" : "s"} without a required time not scored` : "") };
  },
};

/** The priced candidates' cheapest offer; ties on price broken by currency code (content, not list order). */
function cheapestOffer(candidates: readonly ArmDocument[]): { price: number; currency: string | null } | null {
  const priced = candidates
    .map((a) => ({ price: a.specs?.price, currency: a.specs?.currency ?? null }))
    .filter((x): x is { price: number; currency: string | null } => typeof x.price === "number" && x.price > 0);
  if (priced.length === 0) return null;
  const cur = (x: { currency: string | null }) => x.currency ?? "\uffff";
  return priced.reduce((a, b) => (b.price < a.price || (b.price === a.price && cur(b) < cur(a)) ? b : a));
}

/** price: cheapest price / this price, among arms quoted in the cheapest arm's currency; null when this arm has no price. */
function priceScore(arm: ArmDocument, candidates: readonly ArmDocument[]): SubScore | null {
  const price = arm.specs?.price;
  if (!(typeof price === "number" && price > 0)) return null;
  const cheapest = cheapestOffer(candidates)!;
  const currency = arm.specs?.currency ?? null;
  if (currency !== cheapest.currency) {
    return zeroScore(`price in ${currency ?? "an unstated currency"}, not comparable with the cheapest (${cheapest.currency ?? "unstated"}): scored 0`);
  }
  return { value: cheapest.price / price, applicable: true, note: price === cheapest.price ? "cheapest candidate" : `${fixed(price / cheapest.price, 2)}× the cheapest candidate` };
}

const price: SubScoreRule = {
  score: ({ arm, candidates }) => priceScore(arm, candidates) ?? zeroScore("price unknown: scored 0"),
  unanalysed: (arm, candidates) => priceScore(arm, candidates) ?? zeroScore("arm not analysed"),
};

/** One rule per row of the sub-score table. */
export const SUB_SCORE_RULES: Readonly<Record<SubScoreKey, SubScoreRule>> = { coverage, dexterity, payload, force, pathSpeed, clearance, cycleTime, price };
