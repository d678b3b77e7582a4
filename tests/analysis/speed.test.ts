// Exact achievable path speed: the largest s with A·q̇ = s·ẋ under the joint speed limits and the
// position limits a joint sits at, per sample.
//
// Sources: scipy's linprog (HiGHS dual simplex) on Jacobians from Orocos KDL, at every sample of
// random paths on random invented arms (3 to 8 joints, redundant ones included) and at
// configurations with joints at, near and just outside a position limit
// (tests/reference/path_speed_cases.ts writes the cases, path_speed_reference.py the answers);
// closed forms for the small hand-made cases.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  analyzePath, AT_LIMIT_FRACTION, createArmContext, LIMIT_HIT_MARGIN, maxSpeedScale, samplePath, speedBounds, speedRatioAt,
} from "@/lib/analysis";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

const load = (f: string) => JSON.parse(readFileSync(path.resolve(__dirname, "../reference/fixtures", f), "utf8"));
const CASES = load("path_speed_cases.json");
const REFS = load("path_speed_reference.json");
const req = requirementSetSchema.parse(CASES.requirements);
const contexts = CASES.arms.map((a: unknown) => createArmContext(armSchema.parse(a), req, 1));

describe("maxSpeedScale: small closed forms", () => {
  it("square non-singular A: the ratio test on A⁻¹ẋ", () => {
    const r = maxSpeedScale([2, 0, 0, 1], 2, 2, [1, 1], [-1, -3], [1, 3]);
    expect(r.method).toBe("closed-form");
    expect(r.scale).toBeCloseTo(2, 14); // q̇ = s·(0.5, 1): joint 1 binds at s = 2
  });
  it("a redundant task uses the spare joint: q̇₁ + q̇₂ = s with |q̇| ≤ 1 gives s = 2, where A⁺ẋ gives the same split", () => {
    expect(maxSpeedScale([1, 1], 1, 2, [1], [-1, -1], [1, 1]).scale).toBeCloseTo(2, 14);
    // Unequal limits: A⁺ẋ = (s/2, s/2) allows s = 0.2 (joint 2 at 0.1), the exact answer is 1.1.
    expect(maxSpeedScale([1, 1], 1, 2, [1], [-1, -0.1], [1, 0.1]).scale).toBeCloseTo(1.1, 14);
  });
  it("a joint at its limit is not asked to move past it", () => {
    expect(maxSpeedScale([1, 1], 1, 2, [1], [-1, -1], [1, 0]).scale).toBeCloseTo(1, 14);
    expect(maxSpeedScale([1, 0, 0, 1], 2, 2, [1, -1], [-1, 0], [1, 1]).scale).toBe(0);
  });
  it("unbounded when joints without a limit carry the motion; 0 when the motion is impossible", () => {
    expect(maxSpeedScale([1, 1], 1, 2, [1], [-1, -Infinity], [1, Infinity]).scale).toBe(Infinity);
    expect(maxSpeedScale([1, 0, 0, 0, 0, 0], 2, 3, [0, 1], [-1, -1, -1], [1, 1, 1]).scale).toBe(0);
  });
  it("the at-limit band is within 1 % of the range and matches the limit hits", () => {
    expect(AT_LIMIT_FRACTION).toBeLessThanOrEqual(0.01);
    expect(LIMIT_HIT_MARGIN).toBe(2 * AT_LIMIT_FRACTION);
    const b = speedBounds([-0.15, -1], [0.15, 1], [0.1, NaN], [-0.14993, 0.2]);
    expect([b.lower[0], b.upper[0]]).toEqual([0, 0.1]); // the prismatic joint at −0.14993 m of −0.15 m may only move up
    expect([b.lower[1], b.upper[1]]).toEqual([-Infinity, Infinity]);
    expect(b.atLimit).toEqual([-1, 0]);
  });
});

describe("exact path speed against scipy's linprog (HiGHS) on KDL Jacobians", () => {
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

  it("every sample: the same s to 1e-9 relative (0 and unbounded alike), and the same joints at a limit", () => {
    const counts = { path: 0, limit: 0, redundant: 0, atLimit: 0, unbounded: 0, zero: 0 };
    CASES.samples.forEach((s: { arm: number; kind: "path" | "limit"; mode: "pose" | "axis" | "point"; q: number[]; twist: number[] }, i: number) => {
      const ctx = contexts[s.arm];
      const got = speedRatioAt(ctx, s.q, s.twist, s.mode).scale;
      const want = REFS.ratios[i];
      const where = `sample ${i} (${s.kind}, arm ${s.arm + 1}, ${s.mode})`;
      if (want === null) { expect(got, where).toBe(Infinity); counts.unbounded++; }
      // An optimum of exactly 0 (a joint at a limit blocks the motion) comes back from HiGHS as 0 or as rounding (~1e-14).
      else if (Math.abs(want) < 1e-12) { expect(got, where).toBeLessThan(1e-12); counts.zero++; }
      else expect(rel(got, want), `${where}: ${got} vs ${want}`).toBeLessThan(1e-9);
      const bounds = speedBounds(ctx.model.lower, ctx.model.upper, ctx.model.maxSpeed, s.q);
      const at = bounds.atLimit.map((v, j) => (v !== 0 || (bounds.lower[j] === 0 && bounds.upper[j] === 0) ? j + 1 : 0)).filter(Boolean);
      expect(at, where).toEqual(REFS.atLimit[i]);
      counts[s.kind]++;
      if (at.length) counts.atLimit++;
      if (ctx.model.n > ({ pose: 6, axis: 5, point: 3 } as const)[s.mode]) counts.redundant++;
    });
    expect(counts.path).toBeGreaterThan(300);
    expect(counts.limit).toBeGreaterThan(100);
    expect(counts.redundant).toBeGreaterThan(150);
    expect(counts.atLimit).toBeGreaterThan(80);
    expect(counts.unbounded).toBeGreaterThan(0);
    expect(counts.zero).toBeGreaterThan(10);
  });

  it("analyzePath reports that exact figure at each of its samples and its minimum as the path's ratio", () => {
    let compared = 0;
    for (const p of CASES.paths) {
      const ctx = contexts[p.arm];
      const r = analyzePath(ctx, p.path, CASES.budget, p.seed);
      const sampled = samplePath(p.path, CASES.budget.maxSamples).samples;
      let min = Infinity;
      r.q.forEach((q, k) => {
        if (!q || !sampled[k].twist) { expect(r.profile.speedRatio[k]).toBeNull(); return; }
        const exact = speedRatioAt(ctx, q, sampled[k].twist!, p.path.mode).scale;
        expect(r.profile.speedRatio[k]).toBe(Number.isFinite(exact) ? exact : null);
        min = Math.min(min, exact);
        compared++;
      });
      if (Number.isFinite(min)) {
        expect(r.speed.ratio).toBe(min);
        expect(r.speed.achievableFraction).toBe(Math.min(1, min));
      }
    }
    expect(compared).toBeGreaterThan(300);
  });
});

describe("the joint trajectory's own speed ratio, beside the exact one", () => {
  // A redundant planar 3R arm on a line (invented): the exact ratio may exceed what the returned
  // trajectory allows, never the other way round at a sample (the trajectory is one feasible motion).
  const arm = armSchema.parse({
    name: "planar 3R", convention: "dh",
    joints: [0.5, 0.4, 0.3].map((a, i) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: [1.0, 0.3, 2.0][i] })),
  });
  const cell = requirementSetSchema.parse({
    name: "line", base: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
    targets: [], specs: [],
    paths: [{ name: "line", mode: "point", step: 0.01, speed: 0.4, waypoints: [{ position: [0.9, 0.2, 0], rpy: [0, 0, 0] }, { position: [0.4, 0.7, 0], rpy: [0, 0, 0] }] }],
  });
  const ctx = createArmContext(arm, cell);
  const r = analyzePath(ctx, cell.paths[0], { maxSamples: 1000, continuationIterations: 20, fallbackRestarts: 6, restartBudget: 48, startBranches: 2 }, 7);

  it("is reported per sample from the trajectory's differences; the exact ratio is at least the one the trajectory needs", () => {
    expect(r.reached).toBe(r.samples);
    expect(r.profile.trajectorySpeedRatio).toHaveLength(r.samples);
    let finer = 0;
    for (let k = 1; k + 1 < r.samples; k++) {
      const t = r.profile.trajectorySpeedRatio[k]!, e = r.profile.speedRatio[k]!;
      // Finite differences over 1 cm steps: agree with the instantaneous figure to first order.
      expect(e).toBeGreaterThanOrEqual(t * (1 - 0.05));
      if (e > t * 1.05) finer++;
    }
    expect(r.speed.trajectoryRatio).toBe(Math.min(...r.profile.trajectorySpeedRatio.filter((x): x is number => x !== null)));
    expect(finer).toBeGreaterThan(0); // the redundant arm can go faster than the trajectory found
  });

  it("a path whose trajectory needs more than the limits says so in its reason", () => {
    const fast = { ...cell.paths[0], speed: 0.4 / Math.max(1e-9, r.speed.trajectoryRatio!) * 1.3 };
    const rf = analyzePath(ctx, fast, { maxSamples: 1000, continuationIterations: 20, fallbackRestarts: 6, restartBudget: 48, startBranches: 2 }, 7);
    expect(rf.speed.trajectoryRatio!).toBeLessThan(1);
    expect(rf.reason).toMatch(/the joint trajectory found needs \d+\.\d+× joint \d's speed limit/);
  });
});
