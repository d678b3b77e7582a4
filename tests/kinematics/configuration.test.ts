import { describe, expect, it } from "vitest";
import {
  createModel,
  createRng,
  maxJointDistance,
  neutralConfiguration,
  randomConfiguration,
  withinLimits,
  wrapToLimits,
  type ArmKinematics,
} from "@/lib/kinematics";

const arm: ArmKinematics = {
  name: "limits",
  convention: "dh",
  joints: [
    { type: "revolute", a: 0.3, alpha: 0, d: 0, theta: 0, min: -Math.PI / 2, max: Math.PI / 2 },
    { type: "revolute", a: 0.2, alpha: 0, d: 0, theta: 0, min: 0.5, max: 2 },
    { type: "prismatic", a: 0, alpha: 0, d: 0, theta: 0, min: 0.05, max: 0.3 },
  ],
};
const model = createModel(arm);

describe("configuration helpers", () => {
  it("neutral is 0 where allowed, else mid-range", () => {
    expect(Array.from(neutralConfiguration(model))).toEqual([0, 1.25, 0.175]);
  });

  it("randomConfiguration is seeded and within limits", () => {
    const a = randomConfiguration(model, createRng(5));
    const b = randomConfiguration(model, createRng(5));
    expect(Array.from(a)).toEqual(Array.from(b));
    const rng = createRng(9);
    for (let k = 0; k < 200; k++) expect(withinLimits(model, randomConfiguration(model, rng))).toBe(true);
  });

  it("wrapToLimits moves revolute joints by 2π, never prismatic ones", () => {
    const out = new Float64Array(3);
    expect(wrapToLimits(model, [0.1 + 2 * Math.PI, 1 - 4 * Math.PI, 0.1], out)).toBe(true);
    expect(out[0]).toBeCloseTo(0.1, 12);
    expect(out[1]).toBeCloseTo(1, 12);
    expect(wrapToLimits(model, [Math.PI, 1, 0.1], out)).toBe(false); // π is outside ±π/2 in every turn
    expect(wrapToLimits(model, [0, 1, 0.4], out)).toBe(false);
    expect(out[2]).toBe(0.4);
  });

  it("maxJointDistance compares revolute joints modulo 2π", () => {
    expect(maxJointDistance(model, [0.1, 1, 0.1], [0.1 + 2 * Math.PI, 1, 0.1])).toBeCloseTo(0, 12);
    expect(maxJointDistance(model, [0, 1, 0.1], [0, 1, 0.3])).toBeCloseTo(0.2, 12);
  });

  it("createRng (mulberry32) is deterministic and roughly uniform", () => {
    const r = createRng(42);
    let sum = 0;
    for (let i = 0; i < 10000; i++) {
      const v = r();
      expect(v >= 0 && v < 1).toBe(true);
      sum += v;
    }
    expect(sum / 10000).toBeGreaterThan(0.48);
    expect(sum / 10000).toBeLessThan(0.52);
    expect(createRng(1)()).not.toBe(createRng(2)());
  });
});
