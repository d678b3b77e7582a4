/**
 * Ranking: a weighted sum of bounded sub-scores, gated by `must` requirements. Pure and cheap, so
 * the shortlist page can re-run it in the browser when someone moves a weight slider (no
 * kinematics is recomputed).
 */
import type { Weights } from "@/shared/schemas/requirements";
import { SUB_SCORES, type SubScoreKey } from "@/shared/sub-scores";

export type { SubScoreKey };
/** The sub-scores, in display order (the keys of the table in shared/sub-scores.ts). */
export const SUB_SCORE_KEYS: readonly SubScoreKey[] = SUB_SCORES.keys;

/** One bounded sub-score. */
export interface SubScore {
  /** In [0, 1]; 0 when unknown (with a note saying so). */
  value: number;
  /** False when the requirement set gives nothing to score (e.g. no paths): the weight is dropped. */
  applicable: boolean;
  /** How the value was obtained, in words (e.g. "price unknown: scored 0"). */
  note: string;
}

/**
 * An arm's sub-score `k`. A result stored before the sub-score existed has none: it counts as
 * not applicable (its weight is dropped) and says why, instead of failing the page or the export.
 */
export function subScoreOf(subScores: Partial<Record<SubScoreKey, SubScore>>, k: SubScoreKey): SubScore {
  return subScores[k] ?? { value: 0, applicable: false, note: "not in this result (computed before this sub-score existed; run the analysis again)" };
}

/** What {@link rankArms} needs per arm. */
export interface ArmScoreInput {
  armId: string;
  subScores: Record<SubScoreKey, SubScore>;
  /** Names of the failed `must` requirements (non-empty: disqualified). */
  failedMusts: string[];
  /** Names of the `must` requirements whose data is missing (flagged, not disqualifying). */
  unknownMusts: string[];
}

/** One arm's place in the ranking. */
export interface RankedArm {
  armId: string;
  /** 1-based; qualified arms first (by score, then armId), disqualified arms after them. */
  rank: number;
  /** Σ contributions ∈ [0, 1]. */
  score: number;
  /** wₖ·sₖ / Σ w (over applicable sub-scores) per sub-score; 0 where not applicable. */
  contributions: Record<SubScoreKey, number>;
  /** wₖ / Σ w as used (0 where not applicable). */
  weights: Record<SubScoreKey, number>;
  disqualified: boolean;
  failedMusts: string[];
  unknownMusts: string[];
}

/**
 * Scores and orders arms: score = Σₖ wₖ sₖ / Σₖ wₖ over the applicable sub-scores k (weights ≥ 0
 * on any scale). An arm failing a `must` requirement is disqualified: it keeps its score for
 * reference but ranks after every qualified arm. Ties are broken by `armId` so the order is
 * deterministic. Does not modify its inputs.
 */
export function rankArms(arms: readonly ArmScoreInput[], weights: Weights): RankedArm[] {
  const keys = SUB_SCORES.keys;
  const scored = arms.map((a) => {
    let total = 0;
    for (const k of keys) if (subScoreOf(a.subScores, k).applicable) total += Math.max(0, weights[k] ?? 0);
    const contributions = {} as Record<SubScoreKey, number>;
    const used = {} as Record<SubScoreKey, number>;
    let score = 0;
    for (const k of keys) {
      const s = subScoreOf(a.subScores, k);
      const w = s.applicable && total > 0 ? Math.max(0, weights[k] ?? 0) / total : 0;
      const v = Math.min(1, Math.max(0, Number.isFinite(s.value) ? s.value : 0));
      used[k] = w;
      contributions[k] = w * v;
      score += w * v;
    }
    return {
      armId: a.armId, rank: 0, score, contributions, weights: used,
      disqualified: a.failedMusts.length > 0, failedMusts: [...a.failedMusts], unknownMusts: [...a.unknownMusts],
    };
  });
  scored.sort((x, y) => Number(x.disqualified) - Number(y.disqualified) || y.score - x.score || (x.armId < y.armId ? -1 : x.armId > y.armId ? 1 : 0));
  scored.forEach((s, i) => { s.rank = i + 1; });
  return scored;
}
