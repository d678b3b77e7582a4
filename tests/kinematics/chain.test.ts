import { describe, expect, it } from "vitest";
import {
  computeJacobian,
  computeLinkPointJacobian,
  createData,
  createModel,
  dhToChain,
  forwardKinematics,
  jointAxisWorld,
  originFromMatrix,
  originMatrix,
  solveIk,
  type ArmKinematics,
  type ChainArmKinematics,
  type DhArmKinematics,
} from "@/lib/kinematics";
import { armSchema } from "@/shared/schemas";
import { randomArm, SPHERICAL_WRIST_6R } from "../helpers/arms";
import { randomChain } from "../helpers/chains";
import { referencePositionError, referenceRotationError, referenceToolPose, referenceWithinLimits } from "../helpers/dh-reference";
import { fdJacobian, maxAbsDiff } from "../helpers/fd";
import { createRng, uniform } from "../helpers/rng";

function fkOf(arm: ArmKinematics, q: ArrayLike<number>) {
  const model = createModel(arm);
  const data = createData(model);
  forwardKinematics(model, data, q);
  return { model, data };
}

function randomQ(rng: () => number, n: number): number[] {
  return Array.from({ length: n }, () => uniform(rng, -2.5, 2.5));
}

/** Random DH arms with a link mass centre on every link. */
function armWithComs(rng: () => number, convention: "dh" | "mdh", n: number): DhArmKinematics {
  const arm = randomArm(rng, { n, convention, prismaticProbability: 0.25 });
  return { ...arm, joints: arm.joints.map((j) => ({ ...j, mass: 1, com: [uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2)] as [number, number, number] })) };
}

describe("chain convention: forward kinematics against closed forms", () => {
  // Two revolute joints about y in the x-z plane (link lengths l1, l2): rotating about +y turns x
  // towards −z, so the tool is at (l1 c1 + l2 c12, 0, −(l1 s1 + l2 s12)) with heading q1 + q2 about y.
  // Source: planar 2R arm, Craig, "Introduction to Robotics", ch. 3, rewritten for the y axis by hand.
  it("2R about y matches the planar closed form", () => {
    const [l1, l2] = [0.45, 0.3];
    const arm: ChainArmKinematics = {
      name: "2R about y",
      convention: "chain",
      joints: [
        { type: "revolute", origin: { xyz: [0, 0, 0], rpy: [0, 0, 0] }, axis: [0, 1, 0], min: -3, max: 3 },
        { type: "revolute", origin: { xyz: [l1, 0, 0], rpy: [0, 0, 0] }, axis: [0, 1, 0], min: -3, max: 3 },
      ],
      tool: [1, 0, 0, l2, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
    };
    const rng = createRng(3);
    for (let k = 0; k < 20; k++) {
      const q = [uniform(rng, -3, 3), uniform(rng, -3, 3)];
      const t = fkOf(arm, q).data.toolPose;
      const q12 = q[0] + q[1];
      expect(t[3]).toBeCloseTo(l1 * Math.cos(q[0]) + l2 * Math.cos(q12), 14);
      expect(t[7]).toBeCloseTo(0, 14);
      expect(t[11]).toBeCloseTo(-(l1 * Math.sin(q[0]) + l2 * Math.sin(q12)), 14);
      expect(t[0]).toBeCloseTo(Math.cos(q12), 14);
      expect(t[2]).toBeCloseTo(Math.sin(q12), 14);
    }
  });

  // One joint with a rotated origin and an oblique axis: T = T(origin)·Rot(u, q). Rot is written
  // here from the unit quaternion (cos q/2, u sin q/2) (Shoemake's formula; Craig §2.8 gives the
  // equivalent angle-axis matrix), a different route from the library's Rodrigues form.
  it("one joint: T(origin)·Rot(u, q) from the quaternion formula; the axis is normalised", () => {
    const origin = { xyz: [0.1, -0.2, 0.3] as [number, number, number], rpy: [0.4, -0.7, 1.9] as [number, number, number] };
    const raw: [number, number, number] = [1, 2, -2];
    const u = raw.map((v) => v / 3);
    const q = 0.83;
    const [w, x, y, z] = [Math.cos(q / 2), u[0] * Math.sin(q / 2), u[1] * Math.sin(q / 2), u[2] * Math.sin(q / 2)];
    const R = [
      1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w),
      2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w),
      2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y),
    ];
    const O = originMatrix(origin);
    const arm: ChainArmKinematics = { name: "one joint", convention: "chain", joints: [{ type: "revolute", origin, axis: raw, min: -3, max: 3 }] };
    const t = fkOf(arm, [q]).data.toolPose;
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) expect(t[4 * r + c]).toBeCloseTo(O[4 * r] * R[c] + O[4 * r + 1] * R[3 + c] + O[4 * r + 2] * R[6 + c], 14);
      expect(t[4 * r + 3]).toBeCloseTo(O[4 * r + 3], 15);
    }
    // A prismatic joint slides along R_origin·u.
    const slide = fkOf({ ...arm, joints: [{ ...arm.joints[0], type: "prismatic", min: 0, max: 1 }] }, [0.25]).data.toolPose;
    for (let r = 0; r < 3; r++) expect(slide[4 * r + 3]).toBeCloseTo(O[4 * r + 3] + 0.25 * (O[4 * r] * u[0] + O[4 * r + 1] * u[1] + O[4 * r + 2] * u[2]), 15);
  });

  it("refuses a zero axis, naming the joint (library and schema)", () => {
    const arm: ChainArmKinematics = { name: "zero axis", convention: "chain", joints: [{ type: "revolute", origin: { xyz: [0, 0, 0], rpy: [0, 0, 0] }, axis: [0, 0, 0], min: -1, max: 1 }] };
    expect(() => createModel(arm)).toThrow(/joints\.0\.axis: must not be zero/);
    const r = armSchema.safeParse(arm);
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(["joints", 0, "axis"]);
    expect(() => createModel({ ...arm, joints: [{ ...arm.joints[0], axis: [0, 0, 1], origin: { xyz: [0, NaN, 0], rpy: [0, 0, 0] } }] })).toThrow(/joints\.0\.origin\.xyz\.1/);
  });
});

describe("DH and MDH tables convert to equivalent chains", () => {
  // The conversion is the regrouping documented in lib/kinematics/chain.ts; the check is the
  // product's own DH forward kinematics (itself checked against KDL in tests/reference).
  it("tool pose, link mass centres and Jacobians agree to 1e-12 on random arms (both conventions, prismatic joints)", () => {
    const rng = createRng(11);
    let worst = 0;
    for (const convention of ["dh", "mdh"] as const) {
      for (let trial = 0; trial < 60; trial++) {
        const n = 1 + (trial % 8);
        const dh = armWithComs(rng, convention, n);
        const chain = dhToChain(dh);
        expect(armSchema.safeParse({ ...chain, name: "x" }).success).toBe(true);
        const q = randomQ(rng, n);
        const a = fkOf(dh, q), b = fkOf(chain, q);
        worst = Math.max(worst, maxAbsDiff(a.data.toolPose, b.data.toolPose));
        const ja = new Float64Array(6 * n), jb = new Float64Array(6 * n);
        computeJacobian(a.model, a.data, q, ja);
        computeJacobian(b.model, b.data, q, jb);
        worst = Math.max(worst, maxAbsDiff(ja, jb));
        for (let link = 1; link <= n; link++) {
          computeLinkPointJacobian(a.model, a.data, q, link, dh.joints[link - 1].com!, ja);
          computeLinkPointJacobian(b.model, b.data, q, link, chain.joints[link - 1].com!, jb);
          worst = Math.max(worst, maxAbsDiff(ja, jb));
        }
        // Joint axes: same direction, and each chain axis point lies on the DH axis line.
        for (let j = 1; j <= n; j++) {
          const u = jointAxisWorld(a.model, a.data, j, new Float64Array(6)), v = jointAxisWorld(b.model, b.data, j, new Float64Array(6));
          worst = Math.max(worst, maxAbsDiff(u.slice(0, 3), v.slice(0, 3)));
          const d = [v[3] - u[3], v[4] - u[4], v[5] - u[5]];
          const along = d[0] * u[0] + d[1] * u[1] + d[2] * u[2];
          worst = Math.max(worst, Math.hypot(d[0] - along * u[0], d[1] - along * u[1], d[2] - along * u[2]));
        }
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-12);
  });

  it("MDH link frames are the chain's link frames", () => {
    const rng = createRng(5);
    const mdh = armWithComs(rng, "mdh", 6);
    const q = randomQ(rng, 6);
    expect(maxAbsDiff(fkOf(mdh, q).data.frames, fkOf(dhToChain(mdh), q).data.frames)).toBeLessThanOrEqual(1e-12);
  });

  it("keeps limits, speeds, torques, masses and the arm's other fields", () => {
    const arm = { ...SPHERICAL_WRIST_6R, joints: SPHERICAL_WRIST_6R.joints.map((j, i) => ({ ...j, maxSpeed: 2 + i, maxTorque: 100 - i, mass: 3 - 0.2 * i, radius: 0.05 })) };
    const chain = dhToChain(arm);
    chain.joints.forEach((j, i) => {
      expect([j.type, j.min, j.max, j.maxSpeed, j.maxTorque, j.mass, j.radius]).toEqual([arm.joints[i].type, arm.joints[i].min, arm.joints[i].max, 2 + i, 100 - i, 3 - 0.2 * i, 0.05]);
    });
    expect(chain.name).toBe(arm.name);
  });

  it("origin ↔ matrix round trip holds at pitch ±90° too", () => {
    for (const rpy of [[0.3, Math.PI / 2, -1.1], [0.3, -Math.PI / 2, 2.2], [1, 1.5707963, 0.5], [-2, 0.2, 3]] as [number, number, number][]) {
      const m = originMatrix({ xyz: [1, 2, 3], rpy });
      expect(maxAbsDiff(originMatrix(originFromMatrix(m)), m)).toBeLessThanOrEqual(1e-15);
    }
  });
});

describe("chain convention: Jacobians and inverse kinematics", () => {
  // Central finite differences of the forward kinematics (as KDL's and Pinocchio's solver tests do).
  it("geometric Jacobian matches finite differences on random chains (rotated origins, oblique axes, prismatic joints)", () => {
    const rng = createRng(21);
    for (let trial = 0; trial < 30; trial++) {
      const n = 1 + (trial % 7);
      const arm = randomChain(rng, { n, prismaticProbability: 0.3 });
      const model = createModel(arm);
      const data = createData(model);
      const q = randomQ(rng, n);
      const J = computeJacobian(model, data, q, new Float64Array(6 * n));
      expect(maxAbsDiff(J, fdJacobian(model, q))).toBeLessThan(1e-8);
    }
  });

  it("IK reaches poses of a chain arm (the 6R test arm rewritten as a chain): pose error, limits, status", () => {
    // Judged with the DH formula of the original arm, written in the test (tests/helpers/dh-reference.ts),
    // not with the library's forward kinematics or error functions.
    const chain = dhToChain(SPHERICAL_WRIST_6R);
    const model = createModel(chain);
    const data = createData(model);
    const rng = createRng(8);
    for (let k = 0; k < 10; k++) {
      const q = Array.from({ length: 6 }, (_, i) => uniform(rng, model.lower[i], model.upper[i]) * 0.8);
      const target = Float64Array.from(referenceToolPose(SPHERICAL_WRIST_6R, q));
      const r = solveIk(model, data, target, { seed: k + 1 });
      expect(r.status).toBe("reached");
      expect(referenceWithinLimits(SPHERICAL_WRIST_6R.joints, r.q)).toBe(true);
      const pose = referenceToolPose(SPHERICAL_WRIST_6R, r.q);
      expect(referencePositionError(pose, target)).toBeLessThanOrEqual(1e-5 + 1e-9);
      expect(referenceRotationError(pose, target)).toBeLessThanOrEqual(1e-4 + 1e-9);
    }
  });

  it("the reach bound covers every sampled tool position of random chains", () => {
    const rng = createRng(2);
    for (let trial = 0; trial < 20; trial++) {
      const arm = randomChain(rng, { n: 5, prismaticProbability: 0.4 });
      const model = createModel(arm);
      const data = createData(model);
      for (let k = 0; k < 50; k++) {
        const q = Array.from({ length: 5 }, (_, i) => uniform(rng, model.lower[i], model.upper[i]));
        forwardKinematics(model, data, q);
        const f0 = data.frames;
        expect(Math.hypot(data.toolPose[3] - f0[3], data.toolPose[7] - f0[7], data.toolPose[11] - f0[11])).toBeLessThanOrEqual(model.reach + 1e-12);
      }
    }
  });
});
