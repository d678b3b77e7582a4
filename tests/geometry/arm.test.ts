// Pairs of links that overlap in every configuration (lib/geometry/arm.ts, alwaysTouchingPairs).
// The claim "overlaps in every configuration" is checked by sampling: at random configurations the
// two links' capsules are placed by forward kinematics and their distance is taken with the
// distance engine, which tests/geometry/distance.test.ts checks against FCL.
import { describe, expect, it } from "vitest";
import { alwaysTouchingPairs, linkGeometry, type LinkGeometry } from "@/lib/geometry/arm";
import { shapeDistance } from "@/lib/geometry";
import { createData, createModel, createRng, forwardKinematics, randomConfiguration } from "@/lib/kinematics";
import type { ArmDocument } from "@/shared/schemas/arm";

type Vec3 = [number, number, number];
const rev = (xyz: Vec3, axis: Vec3, collision?: { from: Vec3; to: Vec3; radius: number }[]) => ({
  type: "revolute" as const, origin: { xyz, rpy: [0, 0, 0] as Vec3 }, axis, min: -3, max: 3, maxSpeed: 2, maxTorque: 50, mass: 1,
  ...(collision ? { collision } : {}),
});

/**
 * An invented six-axis chain arm with a spherical wrist (joints 4, 5 and 6 meet at one point,
 * 0.3 m beyond joint 3) and explicit capsules: the forearm (link 3) runs to the wrist centre, the
 * wrist housing (link 5) is a sphere whose centre is `wristOffset` from it.
 */
function wristArm(wristOffset: Vec3): ArmDocument {
  return {
    name: "Wrist test arm", maker: "Example Works", modelCode: "WT-6", convention: "chain",
    joints: [
      rev([0, 0, 0.3], [0, 0, 1], [{ from: [0, 0, 0], to: [0, 0, 0.1], radius: 0.06 }]),
      rev([0, 0, 0.1], [0, 1, 0], [{ from: [0, 0, 0], to: [0.4, 0, 0], radius: 0.05 }]),
      rev([0.4, 0, 0], [0, 1, 0], [{ from: [0, 0, 0], to: [0.3, 0, 0], radius: 0.04 }]),
      rev([0.3, 0, 0], [1, 0, 0]),
      rev([0, 0, 0], [0, 1, 0], [{ from: wristOffset, to: wristOffset, radius: 0.05 }]),
      rev([0, 0, 0], [1, 0, 0]),
    ],
    tool: [1, 0, 0, 0.08, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
    specs: {},
  } as unknown as ArmDocument;
}

/** Smallest distance between the capsules of two links at q (m; 0 when they overlap). */
function linkDistance(arm: ArmDocument, links: LinkGeometry[], a: number, b: number, q: Float64Array): number {
  const model = createModel(arm as Parameters<typeof createModel>[0]);
  const data = createData(model);
  forwardKinematics(model, data, q);
  const world = (link: number, p: readonly number[]): Vec3 => {
    const o = 16 * link, F = data.frames;
    return [0, 1, 2].map((r) => F[o + 4 * r] * p[0] + F[o + 4 * r + 1] * p[1] + F[o + 4 * r + 2] * p[2] + F[o + 4 * r + 3]) as Vec3;
  };
  let best = Infinity;
  for (const ca of links[a - 1].capsules) {
    for (const cb of links[b - 1].capsules) {
      const d = shapeDistance(
        { shape: "capsule", from: world(a, ca.from), to: world(a, ca.to), radius: ca.radius },
        { shape: "capsule", from: world(b, cb.from), to: world(b, cb.to), radius: cb.radius },
      );
      best = Math.min(best, d.distance);
    }
  }
  return best;
}

describe("links that touch in every configuration", () => {
  it("explicit capsules that both hold a spherical wrist's centre are set aside, and they do overlap at 200 random configurations", () => {
    const arm = wristArm([0, 0, 0]);
    const links = linkGeometry(arm);
    expect(alwaysTouchingPairs(links, arm)).toEqual([[3, 5]]);
    const model = createModel(arm as Parameters<typeof createModel>[0]);
    const rng = createRng(11);
    for (let k = 0; k < 200; k++) expect(linkDistance(arm, links, 3, 5, randomConfiguration(model, rng))).toBe(0);
  });

  it("a wrist housing moved off the centre is checked: the pair is kept, and some configuration separates it", () => {
    const arm = wristArm([0, 0, 0.12]);
    const links = linkGeometry(arm);
    expect(alwaysTouchingPairs(links, arm)).toEqual([]);
    const model = createModel(arm as Parameters<typeof createModel>[0]);
    const rng = createRng(12);
    let apart = 0;
    for (let k = 0; k < 200; k++) if (linkDistance(arm, links, 3, 5, randomConfiguration(model, rng)) > 0) apart++;
    expect(apart).toBeGreaterThan(0);
  });

  it("derived capsules joined through links shorter than the sum of their radii are set aside (the first rule)", () => {
    const arm = {
      ...wristArm([0, 0, 0]),
      joints: wristArm([0, 0, 0]).joints.map(({ collision: _c, ...j }) => ({ ...j, radius: 0.045 })),
    } as ArmDocument;
    const links = linkGeometry(arm);
    expect(links.every((l) => l.source === "derived")).toBe(true);
    // link 4 (wrist centre to wrist centre) and link 5 have no length: 3–5, 3–6 and 4–6 touch.
    expect(alwaysTouchingPairs(links, arm)).toEqual([[3, 5], [3, 6], [4, 6]]);
  });
});
