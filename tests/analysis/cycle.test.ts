import { describe, expect, it } from "vitest";
import { analyzeCycle, ASSUMED_ACCELERATION_TIME, effectiveLimits, evaluateChoice, jointMoveTime, moveTime, type CycleInputs, type CyclePath } from "@/lib/analysis/cycle";
import { createRng } from "@/lib/kinematics/rng";
import type { Sequence } from "@/shared/schemas/requirements";

/**
 * Distance covered by the fastest speed profile of duration T under limits v and a, the speed
 * min(v, a·t, a·(T − t)), by the trapezoidal rule on N intervals (a numerical integration, not
 * the closed form); the move time is the least T covering d, found by bisection.
 */
function integratedDistance(T: number, v: number, a: number, N = 4000): number {
  const h = T / N;
  let sum = 0;
  for (let i = 0; i <= N; i++) {
    const t = i * h;
    const speed = Math.max(0, Math.min(v, a * t, a * (T - t)));
    sum += (i === 0 || i === N ? 0.5 : 1) * speed;
  }
  return sum * h;
}
function integratedMoveTime(d: number, v: number, a: number): number {
  let lo = 0, hi = 1;
  while (integratedDistance(hi, v, a) < d) hi *= 2;
  for (let k = 0; k < 60; k++) {
    const mid = 0.5 * (lo + hi);
    if (integratedDistance(mid, v, a) < d) lo = mid; else hi = mid;
  }
  return hi;
}

describe("point-to-point move time (docs/references.md#biagiotti-and-melchiorri-trajectory-planning, ch. 3, from memory)", () => {
  it("matches the closed forms on hand cases", () => {
    // Trapezoidal: d = 1 rad, v = 1 rad/s, a = 2 rad/s²: 1/1 + 1/2 = 1.5 s.
    expect(jointMoveTime(1, 1, 2)).toBeCloseTo(1.5, 12);
    // Triangular: d = 0.2 < v²/a = 0.5: 2·√(0.2/2) = 0.632456 s.
    expect(jointMoveTime(0.2, 1, 2)).toBeCloseTo(2 * Math.sqrt(0.1), 12);
    // At the switch d = v²/a both forms give 2v/a = 1 s.
    expect(jointMoveTime(0.5, 1, 2)).toBeCloseTo(1, 12);
    expect(jointMoveTime(0.5 * (1 - 1e-12), 1, 2)).toBeCloseTo(1, 9);
    expect(jointMoveTime(0, 1, 2)).toBe(0);
  });

  it("agrees with a numerical integration of the velocity profile", () => {
    const rng = createRng(7);
    for (let i = 0; i < 40; i++) {
      const v = 0.5 + 3 * rng(), a = 1 + 20 * rng(), d = 4 * rng() * rng();
      const t = jointMoveTime(d, v, a);
      expect(Math.abs(integratedMoveTime(d, v, a) - t)).toBeLessThan(1e-5 * t);
    }
  });

  it("synchronises the joints to the slowest and names it (lowest on a tie)", () => {
    const lim = effectiveLimits({ n: 3, maxSpeed: [1, 2, 1], maxAcceleration: [2, 4, 2] });
    const out = { limitingJoint: null as number | null };
    const t = moveTime(lim, [0, 0, 0], [0.2, 3, 0.4], out);
    expect(t).toBeCloseTo(3 / 2 + 2 / 4, 12);
    expect(out.limitingJoint).toBe(2);
    expect(moveTime(lim, [0, 0, 0], [1, 0, -1], out)).toBeCloseTo(1.5, 12);
    expect(out.limitingJoint).toBe(1);
    expect(moveTime(lim, [1, 1, 1], [1, 1, 1], out)).toBe(0);
    expect(out.limitingJoint).toBeNull();
  });

  it("assumes full speed in 0.5 s where the acceleration limit is missing", () => {
    const lim = effectiveLimits({ n: 2, maxSpeed: [1, 2], maxAcceleration: [NaN, 5] });
    expect(lim.acceleration[0]).toBeCloseTo(1 / ASSUMED_ACCELERATION_TIME, 12);
    expect(lim.assumedAcceleration).toEqual([1]);
  });
});

// A small invented 2-joint cell: targets with several branches, a path, waits.
const LIMITS = { n: 2, maxSpeed: [1.2, 2], maxAcceleration: [3, 6] };
const path: CyclePath = { first: [0.3, -0.4], last: [0.6, -0.1], length: 0.25, followedSpeed: 0.1, limitingJoint: 2 };

function randomInputs(seed: number, nTargets: number, branches: number): CycleInputs {
  const rng = createRng(seed);
  const targets = new Map<string, number[][]>();
  for (let i = 0; i < nTargets; i++) {
    const b: number[][] = [];
    for (let k = 0; k < branches; k++) b.push([6 * rng() - 3, 6 * rng() - 3]);
    targets.set(`t${i}`, b);
  }
  return { targets, paths: new Map([["seam", path]]) };
}

/** Every combination of branches (one per move or path layer). */
function allChoices(sizes: number[]): number[][] {
  let out: number[][] = [[]];
  for (const s of sizes) out = out.flatMap((c) => Array.from({ length: s }, (_, k) => [...c, k]));
  return out;
}

describe("cycle of a sequence (docs/design.md#cycle-time)", () => {
  it("finds the least cycle over all branch combinations (brute force)", () => {
    for (let seed = 1; seed <= 12; seed++) {
      const inputs = randomInputs(seed, 4, 1 + (seed % 4));
      const rng = createRng(100 + seed);
      const steps: Sequence["steps"] = [];
      const len = 2 + (seed % 4);
      for (let i = 0; i < len; i++) {
        const r = rng();
        if (r < 0.6) steps.push({ kind: "move", target: `t${Math.floor(rng() * 4)}`, dwell: rng() < 0.5 ? 0.3 : undefined });
        else if (r < 0.8) steps.push({ kind: "path", path: "seam" });
        else steps.push({ kind: "wait", seconds: 0.7 });
      }
      if (!steps.some((s) => s.kind !== "wait")) steps.push({ kind: "move", target: "t0" });
      const seq: Sequence = { name: `s${seed}`, steps };
      const lim = effectiveLimits(LIMITS);
      const sizes = steps.filter((s) => s.kind !== "wait").map((s) => (s.kind === "move" ? inputs.targets.get(s.target)!.length : 1));
      let brute = Infinity;
      for (const c of allChoices(sizes)) brute = Math.min(brute, evaluateChoice(lim, seq, inputs, c).reduce((a, s) => a + s.time, 0));
      const r = analyzeCycle(LIMITS, seq, inputs);
      expect(r.time).not.toBeNull();
      expect(Math.abs(r.time! - brute)).toBeLessThan(1e-12 * Math.max(1, brute));
    }
  });

  it("makes each step's time the one recomputed from the returned configurations, and the cycle their sum", () => {
    const inputs = randomInputs(42, 5, 4);
    const seq: Sequence = { name: "loop", required: 10, steps: [{ kind: "move", target: "t0", dwell: 0.4 }, { kind: "path", path: "seam" }, { kind: "wait", seconds: 1 }, { kind: "move", target: "t3" }, { kind: "move", target: "t1", dwell: 0.2 }] };
    const r = analyzeCycle(LIMITS, seq, inputs);
    const lim = effectiveLimits(LIMITS);
    let prev = r.steps[r.steps.length - 1].q; // closed cycle: starts where the last step ends
    let sum = 0;
    r.steps.forEach((s, i) => {
      const st = seq.steps[i];
      let expected: number;
      if (st.kind === "wait") { expected = st.seconds; expect(s.q).toEqual(prev); }
      else if (st.kind === "move") {
        expect(inputs.targets.get(st.target)!.some((b) => b.every((x, j) => x === s.q[j]))).toBe(true);
        expected = moveTime(lim, prev, s.q) + (st.dwell ?? 0);
      } else {
        expect(s.q).toEqual(path.last);
        expected = moveTime(lim, prev, path.first!) + path.length / path.followedSpeed!;
      }
      expect(s.time).toBeCloseTo(expected, 12);
      sum += expected;
      prev = s.q;
    });
    expect(r.time).toBeCloseTo(sum, 12);
    expect(r.partsPerHour).toBeCloseTo(3600 / sum, 9);
    expect(r.verdict).toBe(sum <= 10 ? "meets" : "fails");
    expect(r.estimate).toBe(false);
  });

  it("works a hand case: two single-branch targets and a dwell", () => {
    const inputs: CycleInputs = { targets: new Map([["a", [[0, 0]]], ["b", [[1, 0.2]]]]), paths: new Map() };
    const r = analyzeCycle(LIMITS, { name: "ab", required: 2, steps: [{ kind: "move", target: "a", dwell: 0.5 }, { kind: "move", target: "b" }] }, inputs);
    // Joint 1: d = 1 ≥ v²/a = 0.48 → 1/1.2 + 1.2/3 = 1.2333 s; joint 2: d = 0.2 < 4/6 → 2√(0.2/6) = 0.3651 s.
    const move = 1 / 1.2 + 1.2 / 3;
    expect(r.steps.map((s) => s.time)).toEqual([expect.closeTo(move + 0.5, 12), expect.closeTo(move, 12)]);
    expect(r.steps.map((s) => s.limitingJoint)).toEqual([1, 1]);
    expect(r.time).toBeCloseTo(2 * move + 0.5, 12);
    expect(r.verdict).toBe("fails");
  });

  it("says which joints lacked an acceleration limit and marks the cycle an estimate", () => {
    const inputs: CycleInputs = { targets: new Map([["a", [[0, 0]]], ["b", [[1, 0]]]]), paths: new Map() };
    const r = analyzeCycle({ n: 2, maxSpeed: [1, 1], maxAcceleration: [NaN, 4] }, { name: "ab", steps: [{ kind: "move", target: "a" }, { kind: "move", target: "b" }] }, inputs);
    expect(r.estimate).toBe(true);
    expect(r.assumedAcceleration).toEqual([1]);
    expect(r.time).toBeCloseTo(2 * (1 + 0.5), 12); // a = 1 / 0.5 s = 2 rad/s²
    expect(r.reason).toMatch(/estimate: joint 1 without an acceleration limit/);
  });

  it("is unknown when a target is not reached, a path not followed or a speed limit missing", () => {
    const inputs: CycleInputs = { targets: new Map([["a", [[0, 0]]], ["b", []]]), paths: new Map([["p", { ...path, first: null, last: null }]]) };
    expect(analyzeCycle(LIMITS, { name: "x", steps: [{ kind: "move", target: "b" }] }, inputs)).toMatchObject({ time: null, verdict: "unknown", reason: 'target "b" is not reached: the cycle time is unknown' });
    expect(analyzeCycle(LIMITS, { name: "x", steps: [{ kind: "path", path: "p" }] }, inputs).time).toBeNull();
    expect(analyzeCycle({ n: 2, maxSpeed: [1, NaN], maxAcceleration: [1, 1] }, { name: "x", steps: [{ kind: "move", target: "a" }] }, inputs).reason).toMatch(/joint 2 without a speed limit/);
  });

  it("does not depend on the order the branches are listed in", () => {
    const inputs = randomInputs(5, 3, 4);
    const seq: Sequence = { name: "o", steps: [{ kind: "move", target: "t0" }, { kind: "move", target: "t1" }, { kind: "move", target: "t2" }] };
    const reversed: CycleInputs = { targets: new Map([...inputs.targets].map(([k, b]) => [k, [...b].reverse()])), paths: inputs.paths };
    expect(analyzeCycle(LIMITS, seq, reversed).time).toBeCloseTo(analyzeCycle(LIMITS, seq, inputs).time!, 12);
  });
});

describe("cycle time in the shortlist analysis", () => {
  it("gives each arm one cycle per sequence, the sum of its steps, unknown where a target is out of reach", async () => {
    const { analyzeShortlist } = await import("@/lib/analysis");
    const { armSchema } = await import("@/shared/schemas/arm");
    const { requirementSetSchema } = await import("@/shared/schemas/requirements");
    const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
    const arm = armSchema.parse({ name: "planar 2R", convention: "dh", joints: [1, 0.8].map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: 2 })) });
    const req = requirementSetSchema.parse({
      name: "two loops", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, paths: [], specs: [],
      targets: [{ name: "a", position: [1.2, 0.5, 0], rpy: [0, 0, 0], mode: "point" }, { name: "b", position: [-0.4, 1.3, 0], rpy: [0, 0, 0], mode: "point" }, { name: "far", position: [3, 0, 0], rpy: [0, 0, 0], mode: "point" }],
      sequences: [{ name: "ab", required: 1, steps: [{ kind: "move", target: "a" }, { kind: "move", target: "b" }] }, { name: "far", steps: [{ kind: "move", target: "far" }] }],
    });
    const out = analyzeShortlist([{ id: "1", revision: 1, arm }], req);
    expect(out.requirementSet.sequences).toEqual(["ab", "far"]);
    const [ab, far] = out.arms[0].cycles;
    expect(ab.time).toBeCloseTo(ab.steps.reduce((s, x) => s + x.time, 0), 12);
    expect(ab.verdict).toBe("fails"); // two moves of well over 0.5 s each
    expect(ab.estimate).toBe(true);
    expect(ab.assumedAcceleration).toEqual([1, 2]);
    expect(far).toMatchObject({ time: null, verdict: "unknown" });
  });
});

describe("cycle-time sub-score (docs/design.md#ranking)", () => {
  const rule = async () => (await import("@/lib/analysis/sub-scores")).SUB_SCORE_RULES.cycleTime;
  const cycle = (name: string, time: number | null, required: number | null, estimate = false) =>
    ({ name, time, required, estimate, partsPerHour: time ? 3600 / time : null, verdict: required === null || time === null ? "unknown" : time <= required ? "meets" : "fails", assumedAcceleration: [], reason: "", steps: [] }) as const;
  const score = async (cycles: ReturnType<typeof cycle>[]) => (await rule()).score({ cycles } as unknown as Parameters<Awaited<ReturnType<typeof rule>>["score"]>[0]);

  it("is 1 − t/(2R), clipped, on the worst sequence with a required time (hand values)", async () => {
    // t = 3 s against R = 4 s: 1 − 3/8 = 0.625; t = 4 s against R = 4 s: ½; t = 9 s against 4 s: 0 (clipped).
    expect((await score([cycle("a", 3, 4)])).value).toBeCloseTo(0.625, 12);
    expect((await score([cycle("a", 4, 4)])).value).toBeCloseTo(0.5, 12);
    expect((await score([cycle("a", 9, 4)])).value).toBe(0);
    const two = await score([cycle("fast", 1, 4), cycle("slow", 5, 8), cycle("free", 50, null)]);
    expect(two.value).toBeCloseTo(Math.min(1 - 1 / 8, 1 - 5 / 16), 12);
    expect(two.note).toMatch(/^slow: 5\.00 s against the required 8\.00 s; 1 sequence without a required time not scored$/);
  });

  it("scores an unknown cycle 0, marks an estimate, and does not apply without sequences or required times", async () => {
    expect(await score([cycle("a", null, 4)])).toMatchObject({ value: 0, applicable: true, note: "a: cycle time unknown, scored 0" });
    expect((await score([cycle("a", 2, 4, true)])).note).toMatch(/an estimate/);
    expect(await score([])).toMatchObject({ applicable: false, note: "no sequences" });
    expect(await score([cycle("a", 2, null)])).toMatchObject({ applicable: false });
  });

  it("is computed from the arm's cycles in the shortlist analysis and enters the ranking with its weight", async () => {
    const { analyzeShortlist, rerank } = await import("@/lib/analysis");
    const { armSchema } = await import("@/shared/schemas/arm");
    const { requirementSetSchema } = await import("@/shared/schemas/requirements");
    const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
    const planar = (name: string, v: number) => armSchema.parse({ name, convention: "dh", joints: [1, 0.8].map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: v, maxAcceleration: 4 * v })) });
    const base = {
      name: "loop", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, paths: [], specs: [],
      targets: [{ name: "a", position: [1.2, 0.5, 0], rpy: [0, 0, 0], mode: "point" }, { name: "b", position: [-0.4, 1.3, 0], rpy: [0, 0, 0], mode: "point" }],
    };
    const req = requirementSetSchema.parse({ ...base, sequences: [{ name: "ab", required: 3, steps: [{ kind: "move", target: "a" }, { kind: "move", target: "b" }] }] });
    const out = analyzeShortlist([{ id: "slow", revision: 1, arm: planar("slow", 1) }, { id: "quick", revision: 1, arm: planar("quick", 3) }], req);
    for (const a of out.arms) {
      const t = a.cycles[0].time!;
      expect(a.subScores.cycleTime.value).toBeCloseTo(Math.max(0, 1 - t / 6), 12);
      expect(a.subScores.cycleTime.applicable).toBe(true);
    }
    // Everything else equal (same reach, dexterity, no price), the cycle weight alone orders them.
    const only = Object.fromEntries(Object.keys(out.weights).map((k) => [k, k === "cycleTime" ? 1 : 0])) as typeof out.weights;
    expect(rerank(out, only).map((r) => r.armId)).toEqual(["quick", "slow"]);
    const none = analyzeShortlist([{ id: "slow", revision: 1, arm: planar("slow", 1) }], requirementSetSchema.parse(base));
    expect(none.arms[0].subScores.cycleTime).toMatchObject({ applicable: false, note: "no sequences" });
    expect(none.ranking[0].weights.cycleTime).toBe(0);
  });
});
