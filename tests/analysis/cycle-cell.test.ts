// Cycle time in the cell (docs/design.md#cycle-time): moves checked along their joint-space line
// by the conservative motion bound, blocked moves left out of the branch choice, a sequence with
// no free combination named as such. References: brute force over every branch combination that
// has no blocked move; dense sampling of a move (2000 configurations) with the distance engine,
// itself checked against FCL (docs/references.md#fcl); elementary geometry of a planar arm.
import { describe, expect, it } from "vitest";
import { analyzeCycle, effectiveLimits, evaluateChoice, type CycleInputs, type MoveCheck, type MoveChecker, type StepRef } from "@/lib/analysis/cycle";
import { createMoveChecker, MOVE_SEGMENT } from "@/lib/analysis/cycle-cell";
import { createArmContext, type ArmContext } from "@/lib/analysis/context";
import { checkCell, createCellCheck } from "@/lib/analysis/cell";
import { analyzeShortlist } from "@/lib/analysis";
import { createRng } from "@/lib/kinematics/rng";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet, type Sequence } from "@/shared/schemas/requirements";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const LIMITS = { n: 2, maxSpeed: [1.2, 2], maxAcceleration: [3, 6] };

/** An invented planar arm (joints about z, links along x) with capsules of radius r on each link. */
function planar(lengths: number[], r = 0.03, speeds = lengths.map(() => 2)): ArmDocument {
  return armSchema.parse({
    name: "Planar cycle arm", convention: "dh",
    joints: lengths.map((a, i) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -Math.PI, max: Math.PI, maxSpeed: speeds[i], maxAcceleration: 4 * speeds[i], collision: [{ from: [-a, 0, 0], to: [0, 0, 0], radius: r }] })),
  });
}
function cellReq(obstacles: unknown[], extra: Record<string, unknown> = {}): RequirementSet {
  return requirementSetSchema.parse({
    name: "Cycle cell", base: I, tool: { tcp: I, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
    targets: [], paths: [], specs: [], cell: { obstacles, clearance: 0.01 }, ...extra,
  });
}
const A: StepRef = { kind: "move", name: "a" }, B: StepRef = { kind: "move", name: "b" };

/** Dense sampling of the move: the smallest distance and whether any configuration collides. */
function sampled(ctx: ArmContext, qa: number[], qb: number[], n = 2000) {
  const out = createCellCheck();
  let lowest = Infinity, collides = false;
  for (let i = 0; i <= n; i++) {
    const q = qa.map((x, j) => x + (i / n) * (qb[j] - x));
    const c = checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, null, out);
    if (!c.collisionFree) collides = true;
    lowest = Math.min(lowest, c.clearance);
  }
  return { lowest, collides };
}

describe("a move in the cell (planar arm, links 0.5 m and 0.4 m, capsules of radius 30 mm)", () => {
  it("a free move: its clearance is the gap at its nearer end, by elementary geometry", () => {
    // Sphere of radius 50 mm at (0.7, 0, 0). The straight arm at angle θ passes it at 0.7·|sin θ|;
    // the move θ₁ = −1.2 → −0.3 is nearest at −0.3: 0.7·sin 0.3 − 0.03 − 0.05 = 0.12686 m.
    const ctx = createArmContext(planar([0.5, 0.4]), cellReq([{ name: "ball", shape: "sphere", center: [0.7, 0, 0], radius: 0.05 }]));
    const r = createMoveChecker(ctx, cellReq([]))!.check([-1.2, 0], [-0.3, 0], A, B);
    expect(r.free).toBe(true);
    expect(r.clearance!).toBeCloseTo(0.7 * Math.sin(0.3) - 0.08, 6);
    expect(r.closest).toEqual({ a: "link 2", b: "ball" });
    const s = sampled(ctx, [-1.2, 0], [-0.3, 0]);
    expect(s.collides).toBe(false);
    expect(r.clearance!).toBeLessThanOrEqual(s.lowest + 1e-9);
  });

  it("a move sweeping through the ball is blocked, link 2 hits it half-way (|θ| < asin(0.08/0.7) there)", () => {
    const ctx = createArmContext(planar([0.5, 0.4]), cellReq([{ name: "ball", shape: "sphere", center: [0.7, 0, 0], radius: 0.05 }]));
    const r = createMoveChecker(ctx, cellReq([]))!.check([-1.2, 0], [1.2, 0], A, B);
    expect(r.free).toBe(false);
    expect(r.hit).toMatchObject({ a: "link 2", b: "ball" });
    // θ = −1.2 + 2.4·f collides for |θ| < asin(0.08/0.7) = 0.11455 rad
    expect(Math.abs(-1.2 + 2.4 * r.hit!.fraction)).toBeLessThan(Math.asin(0.08 / 0.7) + 1e-9);
  });

  it("a thin obstacle between two sampled configurations is not stepped over", () => {
    // A 1 mm ball: the arm touches it only for |θ| < asin(0.031/0.7) = 0.0443 rad. The move is cut into
    // ⌈M/0.25 m⌉ steps of about 0.27 rad, whose configurations all miss it; the motion bound finds it.
    const ctx = createArmContext(planar([0.5, 0.4]), cellReq([{ name: "pin", shape: "sphere", center: [0.7, 0, 0], radius: 0.001 }]));
    const qa = [-1.2, 0], qb = [1.2, 0];
    const reach = 0.9 + 0.03; // bound on any point's distance from joint 1's axis
    const steps = Math.ceil((reach * 2.4) / MOVE_SEGMENT);
    const sampledOnly = Array.from({ length: steps + 1 }, (_, i) => -1.2 + (2.4 * i) / steps);
    expect(sampledOnly.every((t) => Math.abs(t) > Math.asin(0.031 / 0.7))).toBe(true);
    const r = createMoveChecker(ctx, cellReq([]))!.check(qa, qb, A, B);
    expect(r.free).toBe(false);
    expect(sampled(ctx, qa, qb).collides).toBe(true);
  });

  it("agrees with dense sampling on random moves: never free where a sample collides, its clearance a lower bound", () => {
    const ctx = createArmContext(planar([0.5, 0.4]), cellReq([
      { name: "ball", shape: "sphere", center: [0.55, 0.35, 0], radius: 0.06 },
      { name: "post", shape: "box", pose: [1, 0, 0, -0.2, 0, 1, 0, -0.6, 0, 0, 1, 0, 0, 0, 0, 1], size: [0.1, 0.1, 0.3] },
    ]));
    const checker = createMoveChecker(ctx, cellReq([]))!;
    const rng = createRng(11);
    let free = 0, blocked = 0;
    for (let i = 0; i < 40; i++) {
      const qa = [6 * rng() - 3, 6 * rng() - 3], qb = [6 * rng() - 3, 6 * rng() - 3];
      const ends = [qa, qb].map((q) => checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, null, createCellCheck()).collisionFree);
      if (!ends[0] || !ends[1]) continue;
      const r = checker.check(qa, qb, A, B);
      const s = sampled(ctx, qa, qb);
      if (s.collides) expect(r.free).toBe(false);
      // below the required clearance the figure is exact or a proven bound; at or above it the move is
      // proven to keep the required clearance (to the check's 0.1 mm tolerance)
      if (r.free) {
        free++;
        if (r.clearance! < 0.01) expect(r.clearance!).toBeLessThanOrEqual(s.lowest + 1e-9);
        else expect(s.lowest).toBeGreaterThanOrEqual(0.01 - 1e-4 - 1e-9);
      } else blocked++;
    }
    expect(free).toBeGreaterThan(3);
    expect(blocked).toBeGreaterThan(3);
  });

  it("lets the tool touch what an end's contact list names, along that move only", () => {
    // A 0.2 m tool capsule along x from the flange; the box it presses against is the target's contact.
    const req = cellReq([{ name: "anvil", shape: "box", pose: [1, 0, 0, 1.15, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], size: [0.1, 0.4, 0.2] }], {
      tool: { tcp: I, mass: 0, cog: [0, 0, 0], collision: [{ from: [0, 0, 0], to: [0.2, 0, 0], radius: 0.02 }] },
      targets: [{ name: "press", position: [1.1, 0, 0], rpy: [0, 0, 0], mode: "point", contact: ["anvil"] }, { name: "away", position: [0, 0.9, 0], rpy: [0, 0, 0], mode: "point" }],
    });
    const ctx = createArmContext(planar([0.5, 0.4]), req);
    const checker = createMoveChecker(ctx, req)!;
    // q = (0, 0): the tool reaches x = 1.1 + 0.02 > 1.1, the anvil's face: touching.
    expect(checker.check([Math.PI / 2, 0], [0, 0], { kind: "move", name: "away" }, { kind: "move", name: "press" }).free).toBe(true);
    expect(checker.check([Math.PI / 2, 0], [0, 0], { kind: "move", name: "away" }, { kind: "move", name: "away" }).free).toBe(false);
  });
});

/** A checker that blocks a fixed, content-derived set of moves (for the graph tests). */
function fakeChecker(blocks: (qa: readonly number[], qb: readonly number[], to: StepRef) => boolean): MoveChecker & { calls: number } {
  const c = {
    required: 0.01, calls: 0,
    check(qa: readonly number[], qb: readonly number[], _from: StepRef, to: StepRef): MoveCheck {
      c.calls++;
      return blocks(qa, qb, to) ? { free: false, clearance: 0, closest: { a: "link 1", b: "wall" }, hit: { a: "link 1", b: "wall", fraction: 0.5 }, evaluations: 1 } : { free: true, clearance: 0.05, closest: { a: "link 1", b: "wall" }, hit: null, evaluations: 1 };
    },
  };
  return c;
}

function randomInputs(seed: number, nTargets: number, branches: number): CycleInputs {
  const rng = createRng(seed);
  const targets = new Map<string, number[][]>();
  for (let i = 0; i < nTargets; i++) targets.set(`t${i}`, Array.from({ length: branches }, () => [6 * rng() - 3, 6 * rng() - 3]));
  return { targets, paths: new Map([["seam", { first: [0.3, -0.4], last: [0.6, -0.1], length: 0.25, followedSpeed: 0.1, limitingJoint: 2 }]]) };
}
function allChoices(sizes: number[]): number[][] {
  let out: number[][] = [[]];
  for (const s of sizes) out = out.flatMap((c) => Array.from({ length: s }, (_, k) => [...c, k]));
  return out;
}
/** Blocks a move when a hash of its two ends falls below the rate (deterministic, content only). */
const hashBlock = (rate: number) => (qa: readonly number[], qb: readonly number[]) => {
  const h = Math.sin(qa[0] * 12.9898 + qa[1] * 78.233 + qb[0] * 37.719 + qb[1] * 4.581) * 43758.5453;
  return h - Math.floor(h) < rate;
};

describe("the branch choice with blocked moves", () => {
  it("is the least cycle over the combinations whose moves are all free (brute force)", () => {
    let compared = 0, infeasible = 0;
    for (let seed = 1; seed <= 30; seed++) {
      const inputs = randomInputs(seed, 4, 1 + (seed % 4));
      const rng = createRng(300 + seed);
      const steps: Sequence["steps"] = [];
      for (let i = 0; i < 3 + (seed % 3); i++) {
        const r = rng();
        steps.push(r < 0.75 ? { kind: "move", target: `t${Math.floor(rng() * 4)}` } : r < 0.9 ? { kind: "path", path: "seam" } : { kind: "wait", seconds: 0.5 });
      }
      if (!steps.some((s) => s.kind !== "wait")) steps.push({ kind: "move", target: "t0" });
      const seq: Sequence = { name: `s${seed}`, steps };
      const block = hashBlock(0.35);
      const checked: CycleInputs = { ...inputs, moves: fakeChecker((qa, qb) => block(qa, qb)) };
      const lim = effectiveLimits(LIMITS);
      const sizes = steps.filter((s) => s.kind !== "wait").map((s) => (s.kind === "move" ? inputs.targets.get(s.target)!.length : 1));
      let brute = Infinity;
      for (const c of allChoices(sizes)) {
        const st = evaluateChoice(lim, seq, inputs, c);
        // the configuration before each step: the last step's end for the first (closed cycle)
        const before = st.map((_, i) => st[(i + st.length - 1) % st.length].q);
        const entries = steps.map((s, i) => (s.kind === "path" ? [0.3, -0.4] : st[i].q));
        const anyBlocked = steps.some((s, i) => s.kind !== "wait" && before[i].some((x, j) => x !== entries[i][j]) && block(before[i], entries[i]));
        if (!anyBlocked) brute = Math.min(brute, st.reduce((a, s) => a + s.time, 0));
      }
      const r = analyzeCycle(LIMITS, seq, checked);
      if (brute === Infinity) {
        infeasible++;
        expect(r).toMatchObject({ time: null, verdict: "fails" });
        expect(r.blocked).not.toBeNull();
      } else {
        compared++;
        expect(r.time).not.toBeNull();
        expect(Math.abs(r.time! - brute)).toBeLessThan(1e-12 * Math.max(1, brute));
      }
    }
    expect(compared).toBeGreaterThan(15);
    expect(infeasible).toBeGreaterThan(0);
  });

  it("checks only what the choice needs when nothing blocks (one pass over the chosen moves)", () => {
    const inputs = randomInputs(8, 5, 4);
    const seq: Sequence = { name: "loop", steps: ["t0", "t1", "t2", "t3", "t4"].map((t) => ({ kind: "move" as const, target: t })) };
    const checker = fakeChecker(() => false);
    const r = analyzeCycle(LIMITS, seq, { ...inputs, moves: checker });
    expect(r.time).toBeCloseTo(analyzeCycle(LIMITS, seq, inputs).time!, 12);
    expect(checker.calls).toBe(5);
    expect(r).toMatchObject({ movesChecked: 5, movesBlocked: 0, blocked: null });
    expect(r.steps.every((s) => s.clearance === 0.05)).toBe(true);
  });

  it("names the step no combination gets past, with what hits what, and the verdict fails", () => {
    const inputs = randomInputs(9, 3, 3);
    const seq: Sequence = { name: "loop", required: 100, steps: [{ kind: "move", target: "t0" }, { kind: "wait", seconds: 1 }, { kind: "move", target: "t1" }, { kind: "move", target: "t2" }] };
    const t2 = inputs.targets.get("t2")!;
    const r = analyzeCycle(LIMITS, seq, { ...inputs, moves: fakeChecker((_qa, qb) => t2.some((b) => b.every((x, j) => x === qb[j]))) });
    expect(r).toMatchObject({ time: null, partsPerHour: null, verdict: "fails", steps: [] });
    expect(r.blocked).toEqual({ step: 4, kind: "move", name: "t2", a: "link 1", b: "wall" });
    // every move into t2 had to be found blocked (9), none checked twice
    expect(r.movesChecked).toBeGreaterThanOrEqual(9);
    expect(r.movesChecked).toBeLessThanOrEqual(3 * 3 + 3 * 3 + 3 * 3);
    expect(r.movesBlocked).toBe(9);
    expect(r.reason).toMatch(/^no collision-free combination of branches: every combination has a move that collides, at the move to target "t2" \(step 4\) at the latest \(link 1 hits wall\)/);
  });
});

describe("the cycle in the shortlist analysis with a cell", () => {
  it("leaves out a branch whose move sweeps through an obstacle, and every chosen move is free by dense sampling", () => {
    // Targets at (0.6, 0.45) and (0.6, −0.45), each with an elbow-up and an elbow-down branch (elbow
    // ±1.18 rad). Keeping the elbow, the tip circles at 0.75 m from joint 1 (capsule to 0.78 m) and
    // passes a ball of radius 20 mm at (0.88, 0) 80 mm off; flipping the elbow straightens the arm
    // (capsule to 0.93 m) through it. Joint 1 is slow and joint 2 fast, so the flips would be quicker.
    const req = cellReq([{ name: "ball", shape: "sphere", center: [0.88, 0, 0], radius: 0.02 }], {
      targets: [{ name: "up", position: [0.6, 0.45, 0], rpy: [0, 0, 0], mode: "point" }, { name: "down", position: [0.6, -0.45, 0], rpy: [0, 0, 0], mode: "point" }],
      sequences: [{ name: "swing", required: 4, steps: [{ kind: "move", target: "up", dwell: 0.2 }, { kind: "move", target: "down", dwell: 0.2 }] }],
    });
    const arm = planar([0.5, 0.4], 0.03, [0.5, 4]);
    const out = analyzeShortlist([{ id: "p", revision: 1, arm }], req).arms[0];
    const c = out.cycles[0];
    expect(out.targets.map((t) => t.solutions.length)).toEqual([2, 2]);
    expect(c.time).not.toBeNull();
    expect(c.movesBlocked).toBeGreaterThan(0);
    // the elbow keeps its sign through the cycle
    expect(Math.sign(c.steps[0].q[1])).toBe(Math.sign(c.steps[1].q[1]));
    const ctx = createArmContext(arm, req);
    c.steps.forEach((s, i) => {
      const before = c.steps[(i + c.steps.length - 1) % c.steps.length].q;
      expect(sampled(ctx, before, s.q).collides).toBe(false);
      expect(s.clearance).not.toBeNull();
    });
    // Without the ball the cycle is no slower (a blocked move is only ever left out).
    const open = analyzeShortlist([{ id: "p", revision: 1, arm }], cellReq([], { targets: req.targets, sequences: req.sequences })).arms[0].cycles[0];
    expect(open.time!).toBeLessThan(c.time!);
    expect(Math.sign(open.steps[0].q[1])).toBe(-Math.sign(open.steps[1].q[1]));
    expect(c.time).toBeCloseTo(c.steps.reduce((t, s) => t + s.time, 0), 12);
  });
});
