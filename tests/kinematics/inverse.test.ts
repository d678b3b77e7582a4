// Every answer is judged with an independent forward kinematics written from the DH formula in
// tests/helpers/dh-reference.ts (checked against Orocos KDL in tests/reference/kdl.test.ts), never
// with the solver's own error function; targets are made with it too.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  createData,
  createModel,
  createRng,
  mat4MulRigid,
  randomConfiguration,
  solveIk,
  solveIkMulti,
  type ArmModel,
  type DhArmKinematics,
  type IkMode,
  type IkResult,
} from "@/lib/kinematics";
import { planarArm, randomArm, SPHERICAL_WRIST_6R } from "../helpers/arms";
import { referenceAxisError, referencePositionError, referenceRotationError, referenceToolPose, referenceWithinLimits } from "../helpers/dh-reference";

/**
 * Independent check of an IK answer: the forward kinematics written in the test from the DH
 * formula (tests/helpers/dh-reference.ts, itself checked against Orocos KDL) puts the tool within
 * tolerance of the target, q lies within the limits, and the solver's reported errors agree with
 * the independently measured ones.
 */
function expectHits(arm: DhArmKinematics, target: ArrayLike<number>, r: IkResult, mode: IkMode, tolP = 1e-5, tolR = 1e-4) {
  expect(r.status).toBe("reached");
  expect(referenceWithinLimits(arm.joints, r.q)).toBe(true);
  const pose = referenceToolPose(arm, r.q);
  // 1e-9 m / rad of slack: the solver's own FK and this one round differently.
  expect(referencePositionError(pose, target)).toBeLessThanOrEqual(tolP + 1e-9);
  if (mode === "pose") expect(referenceRotationError(pose, target)).toBeLessThanOrEqual(tolR + 1e-9);
  if (mode === "axis") expect(referenceAxisError(pose, target)).toBeLessThanOrEqual(tolR + 1e-9);
  expect(r.positionError).toBeCloseTo(referencePositionError(pose, target), 9);
}

function translation(x: number, y: number, z: number): Float64Array {
  return Float64Array.from([1, 0, 0, x, 0, 1, 0, y, 0, 0, 1, z, 0, 0, 0, 1]);
}

describe("solveIk: closed forms", () => {
  // Planar 2R analytic IK: cos θ2 = (x² + y² − l1² − l2²) / (2 l1 l2), two branches ±θ2
  // (Craig, "Introduction to Robotics", ch. 4, planar 2R; Spong et al. §3.3 / ch. 4 elbow up/down).
  it("planar 2R: point target reached; solveIkMulti finds both elbow branches", () => {
    const [l1, l2] = [0.4, 0.3];
    const arm = planarArm([l1, l2]);
    const model = createModel(arm);
    const data = createData(model);
    const target = translation(0.45, 0.25, 0);
    const c2 = (0.45 ** 2 + 0.25 ** 2 - l1 ** 2 - l2 ** 2) / (2 * l1 * l2);
    expect(Math.abs(c2)).toBeLessThan(1); // reachable by the closed form
    const r = solveIk(model, data, target, { mode: "point" });
    expectHits(arm, target, r, "point");
    const all = solveIkMulti(model, data, target, { mode: "point" });
    expect(all.length).toBe(2); // the closed form has exactly two solutions
    for (const s of all) {
      expectHits(arm, target, s, "point");
      // each answer satisfies the closed-form elbow equation (to the 1e-5 m IK tolerance)
      expect(Math.abs(Math.cos(s.q[1]) - c2)).toBeLessThan(1e-4);
    }
    expect(Math.sign(Math.sin(all[0].q[1]))).toBe(-Math.sign(Math.sin(all[1].q[1]))); // elbow up and elbow down
  });

  // Planar 3R with orientation (x, y, φ): wrist point = (x − l3 cφ, y − l3 sφ), then the 2R solution;
  // Craig ch. 4 (3R planar example). Pose targets of a planar arm are consistent 6-D poses.
  it("planar 3R: pose target (x, y, φ) reached in pose mode, two branches", () => {
    const l = [0.5, 0.35, 0.1];
    const arm = planarArm(l);
    const model = createModel(arm);
    const data = createData(model);
    const phi = 0.8, x = 0.4, y = 0.5;
    const target = Float64Array.from([Math.cos(phi), -Math.sin(phi), 0, x, Math.sin(phi), Math.cos(phi), 0, y, 0, 0, 1, 0, 0, 0, 0, 1]);
    const wx = x - l[2] * Math.cos(phi), wy = y - l[2] * Math.sin(phi);
    const c2 = (wx * wx + wy * wy - l[0] ** 2 - l[1] ** 2) / (2 * l[0] * l[1]);
    const all = solveIkMulti(model, data, target, { mode: "pose" });
    expect(all.length).toBe(2);
    for (const s of all) {
      expectHits(arm, target, s, "pose");
      expect(Math.abs(Math.cos(s.q[1]) - c2)).toBeLessThan(1e-3);
      expect(Math.abs(s.q[0] + s.q[1] + s.q[2] - phi)).toBeLessThan(1e-4); // heading within the rotation tolerance
    }
  });

  // SCARA RRPR (Spong §3.3 SCARA): z fixes d3 = −z − d4, heading fixes θ4; 2 branches of θ1, θ2.
  it("SCARA RRPR: pose target reached, prismatic joint within its range", () => {
    const arm: DhArmKinematics = {
      name: "invented SCARA",
      convention: "dh",
      joints: [
        { type: "revolute", a: 0.35, alpha: 0, d: 0, theta: 0, min: -2.5, max: 2.5 },
        { type: "revolute", a: 0.25, alpha: Math.PI, d: 0, theta: 0, min: -2.5, max: 2.5 },
        { type: "prismatic", a: 0, alpha: 0, d: 0, theta: 0, min: 0, max: 0.2 },
        { type: "revolute", a: 0, alpha: 0, d: 0.08, theta: 0, min: -6, max: 6 },
      ],
    };
    const model = createModel(arm);
    const target = referenceToolPose(arm, [0.3, 1.2, 0.15, -0.7]);
    const r = solveIk(model, createData(model), target);
    expectHits(arm, target, r, "pose");
    expect(r.q[2]).toBeCloseTo(0.15, 9); // d3 = −z − d4 is unique
  });
});

describe("solveIk: properties on random arms (fast-check)", () => {
  // Round trip (RTB tests/test_IK.py, KDL solvertest FkPosAndIkPosLocal): the target is FK of a random
  // in-limit configuration, so it is reachable; IK must reach it and FK of the answer must hit it.
  const arms = (() => {
    const rng = createRng(4242);
    const list: { arm: DhArmKinematics; model: ArmModel }[] = [];
    for (let i = 0; i < 12; i++) {
      const arm = randomArm(rng, { n: [6, 7, 6, 5][i % 4], convention: i % 2 ? "mdh" : "dh" });
      list.push({ arm, model: createModel(arm) });
    }
    list.push({ arm: SPHERICAL_WRIST_6R, model: createModel(SPHERICAL_WRIST_6R) });
    return list;
  })();
  for (const mode of ["pose", "axis", "point"] as const) {
    it(`${mode} mode: targets from FK of random in-limit configurations are reached`, () => {
      fc.assert(
        fc.property(fc.integer({ min: 0, max: arms.length - 1 }), fc.integer({ min: 0, max: 2 ** 31 - 1 }), (armIndex, seed) => {
          const { arm, model } = arms[armIndex];
          const q = randomConfiguration(model, createRng(seed));
          const target = Float64Array.from(referenceToolPose(arm, q));
          const r = solveIk(model, createData(model), target, { mode, seed });
          expectHits(arm, target, r, mode);
        }),
        { numRuns: 120, seed: mode.length },
      );
    });
  }

  it("FK of any IK answer (reached or not) matches the reported errors", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: arms.length - 1 }), fc.integer({ min: 0, max: 2 ** 31 - 1 }), (armIndex, seed) => {
        const { arm, model } = arms[armIndex];
        const rng = createRng(seed);
        const target = Float64Array.from(referenceToolPose(arm, randomConfiguration(model, rng)));
        target[3] += 0.05; // perturbed: may or may not be reachable
        const r = solveIk(model, createData(model), target, { seed, maxRestarts: 3 });
        const pose = referenceToolPose(arm, r.q);
        expect(r.positionError).toBeCloseTo(referencePositionError(pose, target), 9);
        expect(r.rotationError).toBeCloseTo(referenceRotationError(pose, target), 8);
        expect(referenceWithinLimits(arm.joints, r.q)).toBe(true);
        if (r.status === "reached") expectHits(arm, target, r, "pose");
        else expect(r.reason).toMatch(/not reached/);
      }),
      { numRuns: 60, seed: 9 },
    );
  });
});

describe("solveIk: modes, branches, determinism", () => {
  it("axis mode leaves the spin about the tool z-axis free (5-joint arm)", () => {
    // A 5-joint arm cannot set all 6 pose coordinates; a target spun about its own z keeps the
    // position and tool axis, so axis mode must reach it (common practice, no source).
    const five: DhArmKinematics = { ...SPHERICAL_WRIST_6R, name: "5R", joints: SPHERICAL_WRIST_6R.joints.slice(0, 5) };
    const model = createModel(five);
    const data = createData(model);
    const target = referenceToolPose(five, [0.3, 0.2, -0.4, 0.5, 0.9]);
    const spin = Float64Array.from([Math.cos(1), -Math.sin(1), 0, 0, Math.sin(1), Math.cos(1), 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
    const spun = mat4MulRigid(new Float64Array(16), target, spin);
    const r = solveIk(model, data, spun, { mode: "axis" });
    expectHits(five, spun, r, "axis");
    const p = solveIk(model, data, spun, { mode: "pose", maxRestarts: 10 });
    expect(p.status).toBe("not-reached");
    expect(p.rotationError).toBeGreaterThan(0.1);
  });

  it("spherical-wrist 6R: several distinct branches (shoulder, elbow, wrist flip) for one target", () => {
    const model = createModel(SPHERICAL_WRIST_6R);
    const data = createData(model);
    const target = Float64Array.from(referenceToolPose(SPHERICAL_WRIST_6R, [0.4, 0.3, 0.2, 0.5, 0.8, -0.3]));
    const all = solveIkMulti(model, data, target, { maxRestarts: 200 });
    expect(all.length).toBeGreaterThanOrEqual(4);
    for (const s of all) expectHits(SPHERICAL_WRIST_6R, target, s, "pose");
    // wrist flip: both signs of joint 5 appear (θ5 ↔ −θ5 with θ4 ± π, θ6 ± π)
    expect(all.some((s) => s.q[4] > 0) && all.some((s) => s.q[4] < 0)).toBe(true);
  });

  it("same seed, same answer; answers carry diagnostics", () => {
    const model = createModel(SPHERICAL_WRIST_6R);
    const target = Float64Array.from(referenceToolPose(SPHERICAL_WRIST_6R, [1, -0.5, 0.7, 2, -1, 0.3]));
    const a = solveIk(model, createData(model), target, { seed: 17 });
    const b = solveIk(model, createData(model), target, { seed: 17 });
    expect(Array.from(a.q)).toEqual(Array.from(b.q));
    expect(a.iterations).toBeGreaterThan(0);
    expect(a.restarts).toBeGreaterThanOrEqual(0);
    expect(a.minSingularValue).toBeGreaterThan(0);
    expect(a.reason).toMatch(/reached/);
  });

  it("revolute answers are wrapped into the limits", () => {
    // joint 1 allowed only in [2, 4] rad; the start (neutral, mid-range) and steps may leave the range mod 2π
    const arm = planarArm([0.4, 0.3]);
    arm.joints[0] = { ...arm.joints[0], min: 2, max: 4 };
    const model = createModel(arm);
    const target = Float64Array.from(referenceToolPose(arm, [3.5, 0.6]));
    const r = solveIk(model, createData(model), target, { mode: "point", initial: [2.1, 0.3] });
    expectHits(arm, target, r, "point");
    expect(r.q[0]).toBeGreaterThanOrEqual(2);
    expect(r.q[0]).toBeLessThanOrEqual(4);
  });
});

describe("solveIk: degenerate cases", () => {
  it("singular target (2R stretched out, aligned links): reached with a near-zero smallest singular value", () => {
    // At q2 = 0 the 2R Jacobian loses rank: det J = l1 l2 sin q2 = 0 (Craig ch. 5 singularity example).
    const model = createModel(planarArm([0.4, 0.3]));
    const target = translation(0.7 * Math.cos(0.3), 0.7 * Math.sin(0.3), 0);
    const r = solveIk(model, createData(model), target, { mode: "point" });
    expect(r.status).toBe("reached");
    expect(r.positionError).toBeLessThanOrEqual(1e-5);
    expect(r.minSingularValue).toBeLessThan(1e-2);
  });

  it("singular start (wrist axes 4 and 6 aligned at q5 = 0): the solver leaves it and reaches the target", () => {
    const model = createModel(SPHERICAL_WRIST_6R);
    const target = Float64Array.from(referenceToolPose(SPHERICAL_WRIST_6R, [0.2, 0.1, 0.3, 1, 0.7, 0.4]));
    const r = solveIk(model, createData(model), target, { initial: [0, 0, 0, 0, 0, 0], maxRestarts: 0 });
    expectHits(SPHERICAL_WRIST_6R, target, r, "pose");
  });

  it("target beyond reach: not reached, with a reason and the best residual", () => {
    const model = createModel(planarArm([0.4, 0.3]));
    const r = solveIk(model, createData(model), translation(1.5, 0, 0), { mode: "point" });
    expect(r.status).toBe("not-reached");
    expect(r.reason).toMatch(/beyond/);
    expect(r.positionError).toBeCloseTo(0.8, 4); // closest point of the 0.7 m circle
    const far = solveIkMulti(model, createData(model), translation(0.71, 0, 0), { mode: "point", maxRestarts: 5 });
    expect(far.length).toBe(1);
    expect(far[0].status).toBe("not-reached");
    expect(far[0].positionError).toBeCloseTo(0.01, 4);
  });

  it("joint limits that exclude the only remaining branch: not reached, answer stays in limits", () => {
    // Elbow limited to one side (q2 ∈ [0.05, 3]) and the shoulder to ±0.2 rad: the target FK(0, −1) is
    // reachable only by the elbow-negative branch, which the limits forbid.
    const arm = planarArm([0.3, 0.3]);
    arm.joints[0] = { ...arm.joints[0], min: -0.2, max: 0.2 };
    arm.joints[1] = { ...arm.joints[1], min: 0.05, max: 3 };
    const model = createModel(arm);
    const freeArm = planarArm([0.3, 0.3]);
    const free = createModel(freeArm);
    const target = Float64Array.from(referenceToolPose(freeArm, [0, -1]));
    const r = solveIk(model, createData(model), target, { mode: "point", maxRestarts: 20 });
    expect(r.status).toBe("not-reached");
    expect(referenceWithinLimits(arm.joints, r.q)).toBe(true);
    expect(r.positionError).toBeGreaterThan(1e-3);
    expect(r.reason).toMatch(/at a limit/);
    // without the limits the same target is reached (the closed form has a solution)
    expectHits(freeArm, target, solveIk(free, createData(free), target, { mode: "point" }), "point");
  });

  it("rejects malformed input with RangeError, never for a numerical outcome", () => {
    const model = createModel(planarArm([0.4, 0.3]));
    const data = createData(model);
    expect(() => solveIk(model, data, new Float64Array(12))).toThrow(/target/);
    expect(() => solveIk(model, data, translation(0.5, 0, 0), { initial: [0] })).toThrow(/initial/);
    expect(() => solveIk(model, data, translation(0.5, 0, 0), { mode: "bad" as IkMode })).toThrow(/mode/);
    expect(() => solveIk(model, data, translation(NaN, 0, 0))).toThrow(/target\.3/);
  });
});

describe("solveIk: structured cause of the outcome", () => {
  // Planar 2R (l1 = 0.4 m, l2 = 0.2 m): the reachable set is the annulus 0.2 m ≤ r ≤ 0.6 m
  // (Craig ch. 4, planar 2R workspace), so its failures have closed-form causes.
  const model = createModel(planarArm([0.4, 0.2], 3.5));
  const data = createData(model);

  it("reached targets say so", () => {
    const r = solveIk(model, data, translation(0.45, 0.2, 0), { mode: "point" });
    expect(r.status).toBe("reached");
    expect(r.cause).toBe("reached");
    expect(solveIkMulti(model, data, translation(0.45, 0.2, 0), { mode: "point" }).every((s) => s.cause === "reached")).toBe(true);
  });

  it("beyond the largest possible reach (r > l1 + l2): beyond-reach, from either search, without restarts", () => {
    const target = translation(0.7, 0.1, 0);
    const one = solveIk(model, data, target, { mode: "point" });
    expect(one.cause).toBe("beyond-reach");
    const multi = solveIkMulti(model, data, target, { mode: "point", maxRestarts: 50 });
    expect(multi).toHaveLength(1);
    expect(multi[0].cause).toBe("beyond-reach");
    expect(multi[0].restarts).toBe(0);
    // The nearest miss is the stretched arm: error = r − (l1 + l2).
    expect(multi[0].positionError).toBeCloseTo(Math.hypot(0.7, 0.1) - 0.6, 5);
  });

  it("inside the inner hole (r < l1 − l2): the search stalls at the folded arm, a singularity", () => {
    const r = solveIkMulti(model, data, translation(0.08, 0.03, 0), { mode: "point", maxRestarts: 20 })[0];
    expect(r.status).toBe("not-reached");
    expect(r.cause).toBe("singularity");
    // Folded: |q2| = π and the nearest miss is (l1 − l2) − r.
    expect(Math.abs(Math.abs(r.q[1]) - Math.PI)).toBeLessThan(1e-2);
    expect(r.positionError).toBeCloseTo(0.2 - Math.hypot(0.08, 0.03), 4);
  });

  it("a pose excluded by a joint limit: joint-limit", () => {
    // Joint 2 limited to [0, 0.5] rad; the target needs cos q2 = (r² − l1² − l2²)/(2 l1 l2) with q2 ≈ 1.6 rad.
    const limited = createModel({ ...planarArm([0.4, 0.2], 3.5), joints: planarArm([0.4, 0.2], 3.5).joints.map((j, i) => (i === 1 ? { ...j, min: 0, max: 0.5 } : j)) });
    const d = createData(limited);
    const r = solveIkMulti(limited, d, translation(0.3, 0.3, 0), { mode: "point", maxRestarts: 20 })[0];
    expect(r.status).toBe("not-reached");
    expect(r.cause).toBe("joint-limit");
    expect(r.q[1]).toBeGreaterThan(0.5 - 0.01 * 0.5); // at the upper limit, within 1 % of the range
    expect(r.reason).toMatch(/joint 2 at a limit/);
  });

  it("a reachable target with too small a budget: budget", () => {
    const r = solveIk(model, data, translation(-0.3, 0.35, 0), { mode: "point", maxRestarts: 0, maxIterations: 1 });
    expect(r.status).toBe("not-reached");
    expect(r.cause).toBe("budget");
  });
});
