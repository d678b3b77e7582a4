import { describe, expect, it } from "vitest";
import {
  createData,
  createModel,
  forwardKinematics,
  mat4MulRigid,
  type ArmKinematics,
} from "@/lib/kinematics";
import { planarArm, randomArm } from "../helpers/arms";
import { dhToMdh } from "../helpers/convert";
import { createRng, uniform } from "../helpers/rng";
import { maxAbsDiff } from "../helpers/fd";

function fk(arm: ArmKinematics, q: number[]) {
  const model = createModel(arm);
  const data = createData(model);
  forwardKinematics(model, data, q);
  return { model, data };
}

describe("forwardKinematics: closed forms", () => {
  // Planar 2R: x = l1 c1 + l2 c12, y = l1 s1 + l2 s12, heading θ1 + θ2.
  // Source: Craig, "Introduction to Robotics", ch. 3 (planar arm example); Spong et al., "Robot Modeling and Control", §3.
  it("planar 2R matches x = l1c1 + l2c12, y = l1s1 + l2s12", () => {
    const [l1, l2] = [0.4, 0.3];
    const rng = createRng(7);
    for (let k = 0; k < 20; k++) {
      const q = [uniform(rng, -3, 3), uniform(rng, -3, 3)];
      const { data } = fk(planarArm([l1, l2]), q);
      const t = data.toolPose;
      expect(t[3]).toBeCloseTo(l1 * Math.cos(q[0]) + l2 * Math.cos(q[0] + q[1]), 14);
      expect(t[7]).toBeCloseTo(l1 * Math.sin(q[0]) + l2 * Math.sin(q[0] + q[1]), 14);
      expect(t[11]).toBeCloseTo(0, 14);
      expect(t[0]).toBeCloseTo(Math.cos(q[0] + q[1]), 14);
      expect(t[4]).toBeCloseTo(Math.sin(q[0] + q[1]), 14);
    }
  });

  // Planar 3R: x = Σ lᵢ cos(θ1+…+θi), heading φ = θ1+θ2+θ3. Source: Craig ch. 3 / ch. 4 (3R planar example).
  it("planar 3R matches the sum of link vectors and the heading θ1+θ2+θ3", () => {
    const l = [0.5, 0.35, 0.1];
    const q = [0.3, -1.1, 0.7];
    const { data } = fk(planarArm(l), q);
    const c = (x: number) => Math.cos(x), s = (x: number) => Math.sin(x);
    const q12 = q[0] + q[1], q123 = q12 + q[2];
    expect(data.toolPose[3]).toBeCloseTo(l[0] * c(q[0]) + l[1] * c(q12) + l[2] * c(q123), 14);
    expect(data.toolPose[7]).toBeCloseTo(l[0] * s(q[0]) + l[1] * s(q12) + l[2] * s(q123), 14);
    expect(Math.atan2(data.toolPose[4], data.toolPose[0])).toBeCloseTo(q123, 14);
    // intermediate frames: frame 1 sits at the end of link 1
    expect(data.frames[16 + 3]).toBeCloseTo(l[0] * c(q[0]), 14);
    expect(data.frames[16 + 7]).toBeCloseTo(l[0] * s(q[0]), 14);
  });

  // SCARA (RRPR), standard DH table: (a1, 0, 0, θ1*), (a2, π, 0, θ2*), (0, 0, d3*, 0), (0, 0, d4, θ4*).
  // T04: position (a1c1 + a2c12, a1s1 + a2s12, −d3 − d4), R = [[cφ, sφ, 0], [sφ, −cφ, 0], [0, 0, −1]], φ = θ1+θ2−θ4.
  // Source: Spong, Hutchinson & Vidyasagar, "Robot Modeling and Control", §3.3 (SCARA example; from memory),
  // re-derived by hand from the table.
  it("SCARA RRPR matches its closed-form T04", () => {
    const [a1, a2, d4] = [0.35, 0.25, 0.08];
    const arm: ArmKinematics = {
      name: "invented SCARA",
      convention: "dh",
      joints: [
        { type: "revolute", a: a1, alpha: 0, d: 0, theta: 0, min: -2.5, max: 2.5 },
        { type: "revolute", a: a2, alpha: Math.PI, d: 0, theta: 0, min: -2.5, max: 2.5 },
        { type: "prismatic", a: 0, alpha: 0, d: 0, theta: 0, min: 0, max: 0.2 },
        { type: "revolute", a: 0, alpha: 0, d: d4, theta: 0, min: -6, max: 6 },
      ],
    };
    const q = [0.4, -0.9, 0.12, 1.3];
    const { data } = fk(arm, q);
    const phi = q[0] + q[1] - q[3];
    const expected = [
      Math.cos(phi), Math.sin(phi), 0, a1 * Math.cos(q[0]) + a2 * Math.cos(q[0] + q[1]),
      Math.sin(phi), -Math.cos(phi), 0, a1 * Math.sin(q[0]) + a2 * Math.sin(q[0] + q[1]),
      0, 0, -1, -q[2] - d4,
      0, 0, 0, 1,
    ];
    expect(maxAbsDiff(data.toolPose, expected)).toBeLessThan(1e-14);
  });
});

describe("forwardKinematics: conventions, base and tool", () => {
  // The same arm in dh and in mdh gives the same tool pose (Craig §3.4: the two conventions describe
  // the same chain; conversion in tests/helpers/convert.ts).
  it("the same arm in dh and mdh gives the same tool pose (planar 2R by hand)", () => {
    const mdh: ArmKinematics = {
      name: "2R mdh",
      convention: "mdh",
      joints: [
        { type: "revolute", a: 0, alpha: 0, d: 0, theta: 0, min: -3, max: 3 },
        { type: "revolute", a: 0.4, alpha: 0, d: 0, theta: 0, min: -3, max: 3 },
      ],
      tool: [1, 0, 0, 0.3, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
    };
    const q = [0.7, -0.2];
    expect(maxAbsDiff(fk(mdh, q).data.toolPose, fk(planarArm([0.4, 0.3]), q).data.toolPose)).toBeLessThan(1e-15);
  });

  it("random dh arms rewritten in mdh give the same tool pose", () => {
    const rng = createRng(11);
    for (let k = 0; k < 30; k++) {
      const arm = randomArm(rng, { n: 2 + (k % 6), convention: "dh", prismaticProbability: 0.3 });
      const q = arm.joints.map((j) => uniform(rng, j.min, j.max));
      const a = fk(arm, q).data.toolPose;
      const b = fk(dhToMdh(arm), q).data.toolPose;
      expect(maxAbsDiff(a, b)).toBeLessThan(1e-13);
    }
  });

  it("flange = base · links, tool = flange · tool, frame 0 = base", () => {
    const rng = createRng(3);
    const arm = randomArm(rng, { n: 5, convention: "mdh" });
    const noBase = { ...arm, base: undefined, tool: undefined };
    const q = arm.joints.map((j) => uniform(rng, j.min, j.max));
    const withBoth = fk(arm, q).data;
    const bare = fk(noBase, q).data;
    const expFlange = mat4MulRigid(new Float64Array(16), arm.base!, bare.flange);
    expect(maxAbsDiff(withBoth.flange, expFlange)).toBeLessThan(1e-14);
    expect(maxAbsDiff(withBoth.toolPose, mat4MulRigid(new Float64Array(16), expFlange, arm.tool!))).toBeLessThan(1e-14);
    expect(maxAbsDiff(withBoth.frames.subarray(0, 16), arm.base!)).toBe(0);
    expect(withBoth.frames.length).toBe(16 * 6);
  });

  it("prismatic q adds to d, revolute q adds to θ", () => {
    const arm: ArmKinematics = {
      name: "RP",
      convention: "dh",
      joints: [
        { type: "revolute", a: 0.2, alpha: 0, d: 0, theta: 0.5, min: -3, max: 3 },
        { type: "prismatic", a: 0, alpha: 0, d: 0.1, theta: 0, min: 0, max: 0.3 },
      ],
    };
    const t = fk(arm, [0.25, 0.15]).data.toolPose;
    expect(t[3]).toBeCloseTo(0.2 * Math.cos(0.75), 15);
    expect(t[11]).toBeCloseTo(0.25, 15);
  });
});

describe("model and data checks", () => {
  it("throws RangeError naming the field on a bad spec or wrong q size", () => {
    const arm = planarArm([0.3, 0.2]);
    expect(() => createModel({ ...arm, joints: [] })).toThrow(/joints/);
    expect(() => createModel({ ...arm, joints: [{ ...arm.joints[0], min: 1, max: 0 }] })).toThrow(/joints\.0\.max/);
    expect(() => createModel({ ...arm, tool: [1, 2, 3] })).toThrow(/tool/);
    expect(() => createModel({ ...arm, joints: [{ ...arm.joints[0], a: NaN }] })).toThrow(RangeError);
    const model = createModel(arm);
    const data = createData(model);
    expect(() => forwardKinematics(model, data, [0])).toThrow(/expected 2, got 1/);
    expect(() => forwardKinematics(createModel(arm), data, [0, 0])).toThrow(/different model/);
    expect(Object.isFrozen(model)).toBe(true);
  });
});
