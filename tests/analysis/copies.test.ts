// Copies of a joint angle 2π apart reach the same pose with a different joint-limit margin; the
// analysis reports the in-limit copy farthest from the limits and says which it chose.
// Source of the check: the definitions themselves (jointLimitMargin, common practice), evaluated
// here over every in-limit copy by brute force.
import { describe, expect, it } from "vitest";
import { analyzeShortlist, centredCopy, DEFAULT_BUDGET, jointLimitMargin } from "@/lib/analysis";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { SPHERICAL_WRIST_6R } from "../helpers/arms";

const DEG = Math.PI / 180;
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

describe("centredCopy", () => {
  const model = createModel({
    name: "copies", convention: "dh",
    joints: [
      { type: "revolute", a: 0.3, alpha: 0, d: 0, theta: 0, min: -350 * DEG, max: 350 * DEG },
      { type: "revolute", a: 0.2, alpha: 0, d: 0, theta: 0, min: -170 * DEG, max: 170 * DEG },
      { type: "prismatic", a: 0, alpha: 0, d: 0, theta: 0, min: -0.15, max: 0.15 },
      { type: "revolute", a: 0, alpha: 0, d: 0.1, theta: 0, min: -360 * DEG, max: 360 * DEG },
    ],
  });

  it("moves a revolute joint by whole turns to the in-limit copy nearest mid-range and lists the others", () => {
    const r = centredCopy(model, [-5.67, 2.5, -0.1499, 4.0]);
    expect(r.q[0]).toBeCloseTo(-5.67 + 2 * Math.PI, 14);
    expect(r.q[1]).toBe(2.5); // range below one turn: one copy only
    expect(r.q[2]).toBe(-0.1499); // prismatic
    expect(r.q[3]).toBeCloseTo(4.0 - 2 * Math.PI, 13); // a range of two turns: copies 4.0 and −2.28 rad, the second nearer mid-range
    expect(r.copies.map((c) => c.joint)).toEqual([1, 4]);
    expect(r.copies[0].others).toEqual([-5.67]);
    expect(r.copies[1].others).toHaveLength(1);
    // Same pose: forward kinematics of both configurations agree.
    const d = createData(model);
    forwardKinematics(model, d, [-5.67, 2.5, -0.1499, 4.0]);
    const a = Float64Array.from(d.toolPose);
    forwardKinematics(model, d, r.q);
    for (let k = 0; k < 12; k++) expect(d.toolPose[k]).toBeCloseTo(a[k], 12);
  });
});

describe("target analysis: the chosen copy has the largest joint-limit margin", () => {
  const arm = armSchema.parse({ ...SPHERICAL_WRIST_6R, name: "wide wrist" });
  const model = createModel(arm);
  // Targets from forward kinematics of configurations whose joint 6 sits near −330° (invented cell).
  const data = createData(model);
  const configs = [[0.2, -0.3, 0.5, 0.4, 0.9, -5.67], [-0.4, 0.1, 0.3, -1.0, 0.6, -5.9], [0.9, -0.6, 0.8, 0.2, -0.7, 5.5], [0.1, 0.2, -0.2, 0.3, 1.2, -4.9]];
  const targets = configs.map((q, i) => {
    forwardKinematics(model, data, q);
    const t = data.toolPose;
    return { name: `t${i}`, position: [t[3], t[7], t[11]], rpy: [Math.atan2(t[9], t[10]), Math.asin(-t[8]), Math.atan2(t[4], t[0])], mode: "pose" as const };
  });
  const req = requirementSetSchema.parse({ name: "copies cell", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, targets, paths: [], specs: [] });
  const result = analyzeShortlist([{ id: "w", revision: 1, arm }], req, { budget: { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 100 } } });
  const limits = { n: 6, lower: model.lower, upper: model.upper };

  it("no other in-limit copy of any joint of any solution is farther from that joint's limits", () => {
    let withChoice = 0;
    for (const t of result.arms[0].targets) {
      expect(t.reached).toBe(true);
      for (const s of t.solutions) {
        const m = jointLimitMargin(limits, s.q).perJoint;
        for (let j = 0; j < 6; j++) {
          for (const k of [-2, -1, 1, 2]) {
            const v = s.q[j] + k * 2 * Math.PI;
            if (v < model.lower[j] || v > model.upper[j]) continue;
            const alt = [...s.q];
            alt[j] = v;
            expect(jointLimitMargin(limits, alt).perJoint[j], `${t.name} joint ${j + 1}`).toBeLessThanOrEqual(m[j] + 1e-12);
          }
        }
        // The copies listed are exactly the joints with a choice, and the reported value is the chosen one.
        for (const c of s.copies) {
          expect(s.q[c.joint - 1]).toBe(c.chosen);
          for (const o of c.others) expect(Math.abs(Math.abs(o - c.chosen) / (2 * Math.PI) - Math.round(Math.abs(o - c.chosen) / (2 * Math.PI)))).toBeLessThan(1e-9);
        }
        if (s.copies.length) withChoice++;
      }
      // The chosen branch says which copy it used.
      const chosen = t.solutions[t.chosen!];
      for (const c of chosen.copies) expect(t.reason).toContain(`joint ${c.joint} at`);
    }
    expect(withChoice).toBeGreaterThan(0);
  });
});
