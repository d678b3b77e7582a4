import { describe, expect, it } from "vitest";
import { rankArms, SUB_SCORE_KEYS, type ArmScoreInput, type SubScoreKey, type SubScore } from "@/lib/analysis/ranking";
import { DEFAULT_WEIGHTS } from "@/shared/schemas/requirements";

function arm(id: string, values: Partial<Record<SubScoreKey, number | null>>, failedMusts: string[] = []): ArmScoreInput {
  const subScores = {} as Record<SubScoreKey, SubScore>;
  for (const k of SUB_SCORE_KEYS) {
    const v = values[k];
    subScores[k] = v === null ? { value: 0, applicable: false, note: "n/a" } : { value: v ?? 0.5, applicable: true, note: "" };
  }
  return { armId: id, subScores, failedMusts, unknownMusts: [] };
}

describe("rankArms", () => {
  it("is a weighted mean of the applicable sub-scores with each contribution returned (hand-computed)", () => {
    const w = { coverage: 2, dexterity: 1, payload: 1, force: 0, pathSpeed: 1, clearance: 0, cycleTime: 0, price: 0 };
    const [r] = rankArms([arm("a", { coverage: 1, dexterity: 0.4, payload: 0.2, force: null, pathSpeed: null, price: 0.9 })], w);
    // applicable weights: coverage 2, dexterity 1, payload 1, price 0 → sum 4
    expect(r.score).toBeCloseTo((2 * 1 + 0.4 + 0.2) / 4, 14);
    expect(r.contributions.coverage).toBeCloseTo(0.5, 14);
    expect(r.contributions.pathSpeed).toBe(0);
    expect(r.weights.dexterity).toBeCloseTo(0.25, 14);
    const sum = SUB_SCORE_KEYS.reduce((s, k) => s + r.contributions[k], 0);
    expect(sum).toBeCloseTo(r.score, 14);
  });
  it("failed musts rank after every qualified arm; ties break by id; weights change the order", () => {
    const arms = [arm("c", { coverage: 1, price: 0.1 }), arm("b", { coverage: 0.5, price: 1 }), arm("a", { coverage: 1, price: 1 }, ["IP code"])];
    const r1 = rankArms(arms, DEFAULT_WEIGHTS);
    expect(r1.map((r) => r.armId)).toEqual(["c", "b", "a"]);
    expect(r1[2].disqualified).toBe(true);
    const r2 = rankArms(arms, { ...DEFAULT_WEIGHTS, coverage: 0, price: 10 });
    expect(r2.map((r) => r.armId)).toEqual(["b", "c", "a"]);
    const tie = rankArms([arm("y", {}), arm("x", {})], DEFAULT_WEIGHTS);
    expect(tie.map((r) => r.armId)).toEqual(["x", "y"]);
    expect(tie.map((r) => r.rank)).toEqual([1, 2]);
  });
  it("all-zero weights give score 0 rather than NaN", () => {
    const zero = { coverage: 0, dexterity: 0, payload: 0, force: 0, pathSpeed: 0, clearance: 0, cycleTime: 0, price: 0 };
    expect(rankArms([arm("a", { coverage: 1 })], zero)[0].score).toBe(0);
  });
});
