import { describe, expect, it } from "vitest";
import {
  computeJacobian,
  computeLinkPointJacobian,
  createData,
  createModel,
  randomConfiguration,
} from "@/lib/kinematics";
import { planarArm, randomArm } from "../helpers/arms";
import { createRng, uniform } from "../helpers/rng";
import { fdJacobian, maxAbsDiff } from "../helpers/fd";
import { dhToMdh } from "../helpers/convert";

describe("computeJacobian: closed forms", () => {
  // Planar 2R: J = [[−l1s1 − l2s12, −l2s12], [l1c1 + l2c12, l2c12]], wz row = [1, 1].
  // Source: Craig ch. 5 (2R Jacobian example); Spong §4; docs/references.md#2r-dexterity-check-values states the same convention.
  it("planar 2R linear and angular rows", () => {
    const [l1, l2] = [0.45, 0.3];
    const model = createModel(planarArm([l1, l2]));
    const data = createData(model);
    const q = [0.6, 1.1];
    const J = computeJacobian(model, data, q, new Float64Array(12));
    const s1 = Math.sin(q[0]), c1 = Math.cos(q[0]), s12 = Math.sin(q[0] + q[1]), c12 = Math.cos(q[0] + q[1]);
    const expected = [
      -l1 * s1 - l2 * s12, -l2 * s12,
      l1 * c1 + l2 * c12, l2 * c12,
      0, 0,
      0, 0,
      0, 0,
      1, 1,
    ];
    expect(maxAbsDiff(J, expected)).toBeLessThan(1e-15);
  });

  // Planar 3R at the tool point: column j = ẑ × (p − oⱼ) (Craig ch. 5, Spong §4.6 geometric Jacobian).
  it("planar 3R: columns are ẑ × (p − oⱼ); a point in the tool frame shifts the reference point", () => {
    const l = [0.4, 0.3, 0.2];
    const model = createModel(planarArm(l));
    const data = createData(model);
    const q = [0.2, -0.5, 0.9];
    const J = computeJacobian(model, data, q, new Float64Array(18));
    const o = [[0, 0], [l[0] * Math.cos(q[0]), l[0] * Math.sin(q[0])]];
    o.push([o[1][0] + l[1] * Math.cos(q[0] + q[1]), o[1][1] + l[1] * Math.sin(q[0] + q[1])]);
    const p = [data.toolPose[3], data.toolPose[7]];
    for (let j = 0; j < 3; j++) {
      expect(J[j]).toBeCloseTo(-(p[1] - o[j][1]), 14);
      expect(J[3 + j]).toBeCloseTo(p[0] - o[j][0], 14);
    }
    // The point (−l3, 0, 0) in the tool frame is the wrist: the last column's linear part vanishes.
    const Jw = computeJacobian(model, data, q, new Float64Array(18), [-l[2], 0, 0]);
    expect(Math.hypot(Jw[2], Jw[5], Jw[8])).toBeLessThan(1e-15);
  });
});

describe("computeJacobian against central finite differences of FK", () => {
  // Central differences (KDL solvertest FkPosAndJacLocal; Pinocchio unittest/finite-differences.cpp):
  // with h = 1e-6 the truncation error is O(h²) and rounding about 1e-10/h, so 1e-7 is a tight bound.
  for (const convention of ["dh", "mdh"] as const) {
    it(`random ${convention} arms with prismatic joints, tool point and offset point`, () => {
      const rng = createRng(convention === "dh" ? 101 : 202);
      for (let k = 0; k < 25; k++) {
        const arm = randomArm(rng, { n: 1 + (k % 8), convention, prismaticProbability: 0.3 });
        const model = createModel(arm);
        const data = createData(model);
        const q = randomConfiguration(model, rng);
        const J = computeJacobian(model, data, q, new Float64Array(6 * model.n));
        expect(maxAbsDiff(J, fdJacobian(model, q))).toBeLessThan(1e-7);
        const pt = [uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2)];
        const Jp = computeJacobian(model, data, q, new Float64Array(6 * model.n), pt);
        const fd = fdJacobian(model, q, 1e-6, (_f, t) => t, (t) => [
          t[0] * pt[0] + t[1] * pt[1] + t[2] * pt[2] + t[3],
          t[4] * pt[0] + t[5] * pt[1] + t[6] * pt[2] + t[7],
          t[8] * pt[0] + t[9] * pt[1] + t[10] * pt[2] + t[11],
        ]);
        expect(maxAbsDiff(Jp, fd)).toBeLessThan(1e-7);
      }
    });

    it(`random ${convention} arms: link-point Jacobians, columns beyond the link zero`, () => {
      const rng = createRng(convention === "dh" ? 303 : 404);
      for (let k = 0; k < 15; k++) {
        const arm = randomArm(rng, { n: 3 + (k % 5), convention, prismaticProbability: 0.3 });
        const model = createModel(arm);
        const data = createData(model);
        const q = randomConfiguration(model, rng);
        for (let link = 1; link <= model.n; link++) {
          const pt = [uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3)];
          const J = computeLinkPointJacobian(model, data, q, link, pt, new Float64Array(6 * model.n));
          const b = 16 * link;
          const fd = fdJacobian(
            model,
            q,
            1e-6,
            (f) => f.subarray(b, b + 16),
            (f) => [
              f[0] * pt[0] + f[1] * pt[1] + f[2] * pt[2] + f[3],
              f[4] * pt[0] + f[5] * pt[1] + f[6] * pt[2] + f[7],
              f[8] * pt[0] + f[9] * pt[1] + f[10] * pt[2] + f[11],
            ],
          );
          expect(maxAbsDiff(J, fd)).toBeLessThan(1e-7);
          for (let r = 0; r < 6; r++) for (let c = link; c < model.n; c++) expect(J[r * model.n + c]).toBe(0);
        }
      }
    });
  }

  it("dh and mdh forms of one arm have the same tool-point Jacobian", () => {
    const rng = createRng(55);
    for (let k = 0; k < 10; k++) {
      const arm = randomArm(rng, { n: 6, convention: "dh", prismaticProbability: 0.3 });
      const a = createModel(arm), b = createModel(dhToMdh(arm));
      const q = randomConfiguration(a, rng);
      const Ja = computeJacobian(a, createData(a), q, new Float64Array(36));
      const Jb = computeJacobian(b, createData(b), q, new Float64Array(36));
      expect(maxAbsDiff(Ja, Jb)).toBeLessThan(1e-13);
    }
  });

  it("rejects a short output, a bad link index and a bad point", () => {
    const model = createModel(planarArm([0.3, 0.2]));
    const data = createData(model);
    expect(() => computeJacobian(model, data, [0, 0], new Float64Array(6))).toThrow(/out/);
    expect(() => computeLinkPointJacobian(model, data, [0, 0], 3, [0, 0, 0], new Float64Array(12))).toThrow(/link/);
    expect(() => computeLinkPointJacobian(model, data, [0, 0], 1, [0, 0], new Float64Array(12))).toThrow(/pointInLink/);
  });
});
