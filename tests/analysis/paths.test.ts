import { describe, expect, it } from "vitest";
import { analyzePath, createArmContext, DEFAULT_PATH_BUDGET, samplePath } from "@/lib/analysis";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const L1 = 1.0, L2 = 0.8;
const arm = armSchema.parse({
  name: "planar 2R", convention: "dh",
  joints: [
    { type: "revolute", a: L1, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: 1.0 },
    { type: "revolute", a: L2, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: 1.5 },
  ],
});
const P0 = [1.2, 0.3, 0], P1 = [0.5, 1.2, 0];
const SPEED = 0.5;
const req = requirementSetSchema.parse({
  name: "straight line", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [], specs: [],
  paths: [{ name: "line", mode: "point", step: 0.01, speed: SPEED, waypoints: [{ position: P0, rpy: [0, 0, 0] }, { position: P1, rpy: [0, 0, 0] }] }],
});

/** Closed-form 2R inverse kinematics (both elbows) and q̇ = J⁻¹ v (Craig ch. 4–5; the 2R Jacobian of docs/references.md#2r-dexterity-check-values). */
function closedForm(x: number, y: number, elbow: 1 | -1) {
  const c2 = (x * x + y * y - L1 * L1 - L2 * L2) / (2 * L1 * L2);
  const q2 = elbow * Math.acos(c2);
  const q1 = Math.atan2(y, x) - Math.atan2(L2 * Math.sin(q2), L1 + L2 * Math.cos(q2));
  const s1 = Math.sin(q1), c1 = Math.cos(q1), s12 = Math.sin(q1 + q2), c12 = Math.cos(q1 + q2);
  const J = [[-L1 * s1 - L2 * s12, -L2 * s12], [L1 * c1 + L2 * c12, L2 * c12]];
  const det = J[0][0] * J[1][1] - J[0][1] * J[1][0];
  const len = Math.hypot(P1[0] - P0[0], P1[1] - P0[1]);
  const vx = (SPEED * (P1[0] - P0[0])) / len, vy = (SPEED * (P1[1] - P0[1])) / len;
  const qd1 = (J[1][1] * vx - J[0][1] * vy) / det, qd2 = (-J[1][0] * vx + J[0][0] * vy) / det;
  return { q: [q1, q2], qd: [qd1, qd2] };
}

describe("path speed on a 2R arm (point mode)", () => {
  const ctx = createArmContext(arm, req);
  const r = analyzePath(ctx, req.paths[0], DEFAULT_PATH_BUDGET, 1);
  const len = Math.hypot(P1[0] - P0[0], P1[1] - P0[1]);

  it("samples the line at the step, ends included", () => {
    const s = samplePath(req.paths[0], 1000);
    expect(s.samples.length).toBe(Math.ceil(len / 0.01) + 1);
    expect(s.samples[0].pose[3]).toBeCloseTo(P0[0], 14);
    expect(s.samples.at(-1)!.pose[7]).toBeCloseTo(P1[1], 14);
    expect(r.samples).toBe(s.samples.length);
  });

  it("follows the line on one elbow branch without flips", () => {
    expect(r.reached).toBe(r.samples);
    expect(r.flips).toEqual([]);
    const elbow = Math.sign(r.q[0]![1]) as 1 | -1;
    r.q.forEach((q, k) => {
      const t = r.profile.s[k] / len;
      const cf = closedForm(P0[0] + t * (P1[0] - P0[0]), P0[1] + t * (P1[1] - P0[1]), elbow);
      expect(Math.atan2(Math.sin(q![0] - cf.q[0]), Math.cos(q![0] - cf.q[0]))).toBeCloseTo(0, 4);
      expect(q![1]).toBeCloseTo(cf.q[1], 4);
    });
  });

  it("needs the joint speeds q̇ = J⁻¹ v of the closed form; the achievable fraction follows", () => {
    const elbow = Math.sign(r.q[0]![1]) as 1 | -1;
    let worst = Infinity;
    r.profile.s.forEach((s, k) => {
      const t = s / len;
      const cf = closedForm(P0[0] + t * (P1[0] - P0[0]), P0[1] + t * (P1[1] - P0[1]), elbow);
      const ratio = Math.min(1.0 / Math.abs(cf.qd[0]), 1.5 / Math.abs(cf.qd[1]));
      expect(r.profile.speedRatio[k]!).toBeCloseTo(ratio, 3);
      worst = Math.min(worst, ratio);
    });
    expect(r.speed.ratio!).toBeCloseTo(worst, 3);
    expect(r.speed.achievableFraction!).toBeCloseTo(Math.min(1, worst), 3);
    expect(r.verdict).toBe(worst < 1 ? "fails" : worst < 1.2 ? "marginal" : "meets");
  });

  it("a faster required speed scales the joint speeds linearly", () => {
    const fast = { ...req.paths[0], speed: SPEED * 4 };
    const r4 = analyzePath(ctx, fast, DEFAULT_PATH_BUDGET, 1);
    expect(r4.speed.ratio!).toBeCloseTo(r.speed.ratio! / 4, 6);
  });

  it("a path leaving the workspace is not followed and says where", () => {
    const out = { ...req.paths[0], waypoints: [{ position: [1.2, 0.3, 0] as [number, number, number], rpy: [0, 0, 0] as [number, number, number] }, { position: [2.5, 0.3, 0] as [number, number, number], rpy: [0, 0, 0] as [number, number, number] }] };
    const ro = analyzePath(ctx, out, DEFAULT_PATH_BUDGET, 1);
    expect(ro.verdict).toBe("fails");
    expect(ro.firstUnreached!.s).toBeGreaterThan(0.4); // reach ends at |p| = 1.8 m, i.e. about 0.55 m along
    expect(ro.firstUnreached!.s).toBeLessThan(0.6);
    expect(ro.reason).toMatch(/not reached/);
  });
});

describe("a joint that would have to pass its limit: an unwinding, not a small step", () => {
  // Planar 2R (invented): joint 1 limited to ±3.1 rad, the elbow kept on one side (q2 ∈ [0.5, 3]),
  // and a line behind the base, where the tool's bearing passes ±π. Past q1 = 3.1 the only way on
  // is the copy near −π: joint 1 must turn back almost a full turn. Source: the geometry itself.
  const I4b = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  const arm2 = armSchema.parse({
    name: "2R behind", convention: "dh",
    joints: [
      { type: "revolute", a: 0.5, alpha: 0, d: 0, theta: 0, min: -3.1, max: 3.1, maxSpeed: 2 },
      { type: "revolute", a: 0.1, alpha: 0, d: 0, theta: 0, min: 0.5, max: 3, maxSpeed: 2 },
    ],
  });
  const cell = requirementSetSchema.parse({
    name: "behind", base: I4b, tool: { tcp: I4b, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, targets: [], specs: [],
    paths: [{ name: "behind", mode: "point", step: 0.01, speed: 0.1, waypoints: [{ position: [-0.55, 0.12, 0], rpy: [0, 0, 0] }, { position: [-0.55, -0.12, 0], rpy: [0, 0, 0] }] }],
  });
  const r2 = analyzePath(createArmContext(arm2, cell), cell.paths[0], DEFAULT_PATH_BUDGET, 5);

  it("is reported as a flip of that joint and the path fails", () => {
    const unwinding = r2.flips.find((f) => f.joint === 1);
    expect(unwinding, r2.reason).toBeDefined();
    expect(unwinding!.detail).toMatch(/joint 1 jumps 3\d\d\.\d°/);
    expect(r2.verdict).toBe("fails");
    // The joint values themselves stay within the limits at every sample.
    for (const q of r2.q) if (q) expect(Math.abs(q[0])).toBeLessThanOrEqual(3.1 + 1e-12);
  });
});
