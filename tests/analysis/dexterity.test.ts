import { describe, expect, it } from "vitest";
import {
  dexterityAt, isotropyDistance, jointLimitMargin, spdDistanceAffineInvariant, spdDistanceLogEuclidean,
  dexterityMargin, structuralRanksFromJacobians,
} from "@/lib/analysis/dexterity";
import { computeJacobian, createData, createModel } from "@/lib/kinematics";
import { AXIS_REF, poseOf, REF } from "./fixtures";

/** A 6×2 geometric Jacobian of a planar 2R arm in the x-y plane (the convention of docs/references.md#2r-dexterity-check-values). */
function jac2r(l1: number, l2: number, q1: number, q2: number): Float64Array {
  const s1 = Math.sin(q1), c1 = Math.cos(q1), s12 = Math.sin(q1 + q2), c12 = Math.cos(q1 + q2);
  return Float64Array.from([-l1 * s1 - l2 * s12, -l2 * s12, l1 * c1 + l2 * c12, l2 * c12, 0, 0, 0, 0, 0, 0, 1, 1]);
}
const limits2 = { n: 2, lower: [-Math.PI, -Math.PI], upper: [Math.PI, Math.PI] };
const planarRanks = { translation: 2, orientation: 0, rotation: 1, axisOrientation: 0 };

describe("translational block measures on the 2R arm", () => {
  // Source: docs/references.md#2r-dexterity-check-values, recomputed with numpy in analysis_reference.py;
  // closed form w = l1·l2·|sin q2| (Yoshikawa 1985).
  for (const c of REF.twoR) {
    it(`l = (${c.l1.toFixed(3)}, ${c.l2}), q = (${(c.q[0] * 180 / Math.PI).toFixed(0)}°, ${(c.q[1] * 180 / Math.PI).toFixed(0)}°)`, () => {
      const d = dexterityAt(jac2r(c.l1, c.l2, c.q[0], c.q[1]), 2, limits2, c.q, "point", planarRanks);
      const t = d.translation;
      expect(t.singularValues[0]).toBeCloseTo(c.sigma[0], 10);
      expect(t.singularValues[1]).toBeCloseTo(c.sigma[1], 10);
      expect(t.manipulability).toBeCloseTo(c.w, 10);
      expect(t.manipulability).toBeCloseTo(c.wClosedForm, 10);
      expect(1 / t.inverseCondition).toBeCloseTo(c.kappa, 8);
      expect(t.isotropyDistance!).toBeCloseTo(c.isotropyDistance, 9);
      // For two singular values the scale-free distance is √2·ln κ (docs/references.md#spd-distances).
      expect(t.isotropyDistance!).toBeCloseTo(Math.SQRT2 * Math.log(c.kappa), 9);
    });
  }

  it("w is largest at q2 = ±90° for any q1 (Yoshikawa 1985)", () => {
    for (const q1 of [0, 0.4, -1.2]) {
      let best = -1, bestQ2 = 0;
      for (let deg = -179; deg <= 179; deg++) {
        const w = dexterityAt(jac2r(1, 0.6, q1, (deg * Math.PI) / 180), 2, limits2, [0, 0], "point", planarRanks).translation.manipulability;
        if (w > best + 1e-15) { best = w; bestQ2 = deg; }
      }
      expect(Math.abs(bestQ2)).toBe(90);
      expect(best).toBeCloseTo(0.6, 12);
    }
  });

  it("the Salisbury–Craig arm (l1 = √2·l2, q2 = 135°) is isotropic: κ = 1, distance 0", () => {
    const d = dexterityAt(jac2r(Math.SQRT2, 1, 0.7, (3 * Math.PI) / 4), 2, limits2, [0, 0], "point", planarRanks);
    expect(d.translation.inverseCondition).toBeCloseTo(1, 12);
    expect(d.translation.isotropyDistance!).toBeCloseTo(0, 10);
  });

  it("a stretched arm is singular: 1/κ = 0, distance null, margin 0", () => {
    const d = dexterityAt(jac2r(1, 1, 0.3, 0), 2, limits2, [0.3, 0], "point", planarRanks);
    expect(d.translation.inverseCondition).toBeLessThan(1e-12);
    expect(d.translation.isotropyDistance).toBeNull();
    expect(d.margin).toBeLessThan(1e-6);
    expect(d.marginal).toBe(true);
    expect(d.limiting.factor).toBe("translation");
  });
});

describe("SPD distances", () => {
  // Source: scipy.linalg.eigh(B, A) and logm (analysis_reference.py); Pennec et al. 2006, Arsigny et al. 2006.
  for (const c of REF.spd) {
    it(`${c.k}×${c.k} pair: affine-invariant and log-Euclidean distances match scipy`, () => {
      expect(spdDistanceAffineInvariant(c.a, c.b, c.k)!).toBeCloseTo(c.dAi, 9);
      expect(c.dAiLogm).toBeCloseTo(c.dAi, 9); // the two scipy forms agree
      expect(spdDistanceLogEuclidean(c.a, c.b, c.k)!).toBeCloseTo(c.dLe, 9);
      if (c.g) {
        const ga = congruence(c.g, c.a, c.k), gb = congruence(c.g, c.b, c.k);
        // d_AI is invariant under A → G A Gᵀ; d_LE is not.
        expect(spdDistanceAffineInvariant(ga, gb, c.k)!).toBeCloseTo(c.dAi, 7);
        expect(spdDistanceAffineInvariant(ga, gb, c.k)!).toBeCloseTo(c.dAiTransformed, 7);
        expect(spdDistanceLogEuclidean(ga, gb, c.k)!).toBeCloseTo(c.dLeTransformed, 7);
      }
    });
  }
  it("check values of docs/references.md#spd-check-values", () => {
    expect(spdDistanceAffineInvariant([1, 0, 0, 1], [4, 0, 0, 0.25], 2)!).toBeCloseTo(Math.SQRT2 * Math.log(4), 12);
    expect(spdDistanceAffineInvariant([2, 1, 1, 2], [1, 0, 0, 3], 2)!).toBeCloseTo(1.124817, 6);
    expect(spdDistanceLogEuclidean([2, 1, 1, 2], [1, 0, 0, 3], 2)!).toBeCloseTo(1.098612, 6);
    const G = [1, 2, 0.5, 3];
    expect(spdDistanceLogEuclidean(congruence(G, [2, 1, 1, 2], 2), congruence(G, [1, 0, 0, 3], 2), 2)!).toBeCloseTo(0.537495, 6);
  });
  it("the isotropy distance is the affine-invariant distance to the best c·I", () => {
    const sigma = [2.0, 0.7, 0.2];
    const m = [sigma[0] ** 2, 0, 0, 0, sigma[1] ** 2, 0, 0, 0, sigma[2] ** 2];
    let best = Infinity;
    for (let lc = -6; lc <= 3; lc += 0.0005) {
      const c = Math.exp(lc);
      best = Math.min(best, spdDistanceAffineInvariant(m, [c, 0, 0, 0, c, 0, 0, 0, c], 3)!);
    }
    expect(isotropyDistance(sigma)!).toBeCloseTo(best, 6);
  });
  it("non-SPD input gives null", () => {
    expect(spdDistanceAffineInvariant([1, 0, 0, -1], [1, 0, 0, 1], 2)).toBeNull();
    expect(spdDistanceLogEuclidean([1, 0, 0, 0], [1, 0, 0, 1], 2)).toBeNull();
  });
});

function congruence(g: number[], a: number[], k: number): number[] {
  const out = new Array(k * k).fill(0);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
    let s = 0;
    for (let p = 0; p < k; p++) for (let q = 0; q < k; q++) s += g[i * k + p] * a[p * k + q] * g[j * k + q];
    out[i * k + j] = s;
  }
  return out;
}

describe("joint-limit margin and the dexterity margin", () => {
  it("is 0 at a limit, 1 at mid-range, and names the joint (common practice, no source)", () => {
    const lim = { n: 3, lower: [-1, 0, -2], upper: [1, 2, 2] };
    expect(jointLimitMargin(lim, [0, 1, 0]).margin).toBeCloseTo(1, 14);
    const m = jointLimitMargin(lim, [0.5, 1.9, -2]);
    expect(m.perJoint[0]).toBeCloseTo(0.5, 14);
    expect(m.perJoint[1]).toBeCloseTo(0.1, 14);
    expect(m.margin).toBe(0);
    expect(m.joint).toBe(3);
  });
  it("the margin is the documented geometric mean with a threshold", () => {
    expect(dexterityMargin(0.2, 0.2, 0.2, "pose")).toBeCloseTo(0.2, 12);
    expect(dexterityMargin(0.04, 1, 1, "point")).toBeCloseTo(0.2, 12);
    expect(dexterityMargin(1, 1, 0, "axis")).toBe(0);
  });
  it("a reached pose is marginal exactly when D < 0.2 (the threshold of docs/design.md#dexterity)", () => {
    // 2R arm, elbow from stretched to bent: D rises through 0.2, and `marginal` must flip there.
    let seen = { below: false, above: false };
    for (let deg = 1; deg <= 90; deg++) {
      const q = [0, (deg * Math.PI) / 180];
      const d = dexterityAt(jac2r(1, 1, q[0], q[1]), 2, limits2, q, "point", planarRanks);
      expect(d.marginal).toBe(d.margin < 0.2);
      seen = { below: seen.below || d.margin < 0.2, above: seen.above || d.margin >= 0.2 };
    }
    expect(seen).toEqual({ below: true, above: true });
  });
  it("catches a wrist singularity that neither block shows alone (reference six-axis arm)", () => {
    const model = createModel(REF.endToEnd.arm);
    const data = createData(model);
    const jac = new Float64Array(6 * model.n);
    const jacs = [[0.1, -0.4, 0.5, 0.3, 0.8, -0.2], [0.7, 0.2, -0.3, -1.0, 0.5, 0.4], [-0.5, 0.9, 0.6, 0.2, -1.2, 1.0]].map((q) => Float64Array.from(computeJacobian(model, data, q, jac)));
    const ranks = structuralRanksFromJacobians(jacs, 6);
    expect(ranks).toEqual({ translation: 3, orientation: 3, rotation: 3, axisOrientation: 2 });
    const q = [0.2, -0.3, 0.4, 0.5, 0, 0.1]; // joint 5 at 0: axes 4 and 6 aligned
    computeJacobian(model, data, q, jac);
    const d = dexterityAt(jac, 6, model, q, "pose", ranks);
    expect(d.rotation.inverseCondition).toBeGreaterThan(0.05);
    expect(d.translation.inverseCondition).toBeGreaterThan(0.05);
    expect(d.orientation.inverseCondition).toBeLessThan(1e-9);
    expect(d.limiting.factor).toBe("orientation");
    expect(d.marginal).toBe(true);
    // Point targets do not care about the wrist.
    expect(dexterityAt(jac, 6, model, q, "point", ranks).marginal).toBe(false);
  });
});

describe("axis targets: the orientation factor counts only the constrained rotations", () => {
  // Source: numpy.linalg.svd of A = [xᵀ·J_o; yᵀ·J_o] with J_o = J_r·P (P the projector onto the
  // null space of J_t), in tests/reference/axis_dexterity_reference.py; the spin about the tool z
  // axis is free for an axis target, so it must not enter the factor.
  const free = (n: number) => ({ n, lower: new Array(n).fill(-10), upper: new Array(n).fill(10) });
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1e-300, Math.abs(b));

  it("random Jacobians and tool frames: σ of the 2-direction block and of the full block agree with numpy", () => {
    let compared = 0;
    for (const c of AXIS_REF.random) {
      const d = dexterityAt(c.jacobian, c.n, free(c.n), new Array(c.n).fill(0), "axis", undefined, poseOf(c.toolRotation));
      const a = d.axisOrientation!;
      expect(a.singularValues).toHaveLength(2);
      // Absolute tolerance on the scale of the block (rank-deficient cases have σ ≈ 1e-16 on both sides).
      const tol = 1e-12 * Math.max(1, c.sigmaOrientation[0]);
      for (let k = 0; k < 2; k++) expect(Math.abs(a.singularValues[k] - c.sigmaAxis[k])).toBeLessThan(tol);
      for (let k = 0; k < 3; k++) expect(Math.abs(d.orientation.singularValues[k] - c.sigmaOrientation[k])).toBeLessThan(tol);
      if (c.sigmaAxis[0] < 1e-12 * c.sigmaOrientation[0]) {
        // Zero in exact arithmetic (the only motion keeping the point still is the free spin): no constrained rotation, neutral.
        expect(a.rank).toBe(0);
        expect(a.inverseCondition).toBe(1);
      } else if (c.sigmaAxis[1] > 1e-6 * c.sigmaAxis[0]) {
        expect(a.rank).toBe(2);
        expect(rel(a.inverseCondition, c.inverseConditionAxis)).toBeLessThan(1e-10);
        compared++;
      }
      // The principal directions lie in the tool's x-y plane (cell frame, unit length).
      const z = [c.toolRotation[2], c.toolRotation[5], c.toolRotation[8]];
      for (const u of a.directions) {
        expect(Math.hypot(u[0], u[1], u[2])).toBeCloseTo(1, 12);
        expect(u[0] * z[0] + u[1] * z[1] + u[2] * z[2]).toBeCloseTo(0, 12);
      }
    }
    expect(compared).toBeGreaterThanOrEqual(20);
  });

  it("a joint that only spins the tool about its z axis changes nothing in the axis factor", () => {
    for (const c of AXIS_REF.random.filter((x: { spinJoint: boolean }) => x.spinJoint)) {
      const d = dexterityAt(c.jacobian, c.n, free(c.n), new Array(c.n).fill(0), "axis", undefined, poseOf(c.toolRotation));
      const without = Float64Array.from(c.jacobian);
      for (let r = 0; r < 6; r++) without[r * c.n + c.n - 1] = 0;
      const d0 = dexterityAt(without, c.n, free(c.n), new Array(c.n).fill(0), "axis", undefined, poseOf(c.toolRotation));
      for (let k = 0; k < 2; k++) expect(d.axisOrientation!.singularValues[k]).toBeCloseTo(d0.axisOrientation!.singularValues[k], 12);
    }
  });

  it("six-axis arm (own numpy kinematics): the margin uses σ₂/σ₁ of the constrained block, the full block is reported beside it", () => {
    const model = createModel(AXIS_REF.arm.arm);
    const data = createData(model);
    const jac = new Float64Array(6 * model.n);
    for (const c of AXIS_REF.arm.cases) {
      computeJacobian(model, data, c.q, jac);
      for (let k = 0; k < 36; k++) expect(jac[k]).toBeCloseTo(c.jacobian[k], 12);
      const d = dexterityAt(jac, 6, model, c.q, "axis", undefined, data.toolPose);
      expect(rel(d.axisOrientation!.inverseCondition, c.inverseConditionAxis)).toBeLessThan(1e-10);
      expect(rel(d.orientation.inverseCondition, c.sigmaOrientation[2] / c.sigmaOrientation[0])).toBeLessThan(1e-10);
      expect(d.margin).toBeCloseTo(dexterityMargin(d.translation.inverseCondition, c.inverseConditionAxis, d.jointLimitFactor, "axis"), 12);
      // Pose targets keep the full three-direction block.
      const p = dexterityAt(jac, 6, model, c.q, "pose", undefined, data.toolPose);
      expect(p.axisOrientation).toBeNull();
      expect(p.margin).toBeCloseTo(dexterityMargin(p.translation.inverseCondition, c.sigmaOrientation[2] / c.sigmaOrientation[0], p.jointLimitFactor, "pose"), 12);
    }
  });

  it("axis mode needs the tool pose", () => {
    const c = AXIS_REF.random[0];
    expect(() => dexterityAt(c.jacobian, c.n, free(c.n), new Array(c.n).fill(0), "axis")).toThrow(/toolPose/);
  });
});
