import { describe, expect, it } from "vitest";
import {
  dexterityAt, isotropyDistance, jointLimitMargin, spdDistanceAffineInvariant, spdDistanceLogEuclidean,
  dexterityMargin, structuralRanksFromJacobians, DEXTERITY_MARGINAL_THRESHOLD,
} from "@/lib/analysis/dexterity";
import { computeJacobian, createData, createModel } from "@/lib/kinematics";
import { REF } from "./fixtures";

/** A 6×2 geometric Jacobian of a planar 2R arm in the x-y plane (REFERENCES.md §7 convention). */
function jac2r(l1: number, l2: number, q1: number, q2: number): Float64Array {
  const s1 = Math.sin(q1), c1 = Math.cos(q1), s12 = Math.sin(q1 + q2), c12 = Math.cos(q1 + q2);
  return Float64Array.from([-l1 * s1 - l2 * s12, -l2 * s12, l1 * c1 + l2 * c12, l2 * c12, 0, 0, 0, 0, 0, 0, 1, 1]);
}
const limits2 = { n: 2, lower: [-Math.PI, -Math.PI], upper: [Math.PI, Math.PI] };
const planarRanks = { translation: 2, orientation: 0, rotation: 1 };

describe("translational block measures on the 2R arm", () => {
  // Source: REFERENCES.md §2.2 check values, recomputed with numpy in analysis_reference.py;
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
      // For two singular values the scale-free distance is √2·ln κ (REFERENCES.md §3).
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
  it("REFERENCES.md §3 check values", () => {
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
    expect(DEXTERITY_MARGINAL_THRESHOLD).toBe(0.2);
  });
  it("catches a wrist singularity that neither block shows alone (reference six-axis arm)", () => {
    const model = createModel(REF.endToEnd.arm);
    const data = createData(model);
    const jac = new Float64Array(6 * model.n);
    const jacs = [[0.1, -0.4, 0.5, 0.3, 0.8, -0.2], [0.7, 0.2, -0.3, -1.0, 0.5, 0.4], [-0.5, 0.9, 0.6, 0.2, -1.2, 1.0]].map((q) => Float64Array.from(computeJacobian(model, data, q, jac)));
    const ranks = structuralRanksFromJacobians(jacs, 6);
    expect(ranks).toEqual({ translation: 3, orientation: 3, rotation: 3 });
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
