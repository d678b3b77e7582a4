// Round trips: URDF → arm → URDF → arm gives the same forward kinematics (to 1e-12), limits,
// masses, centres of mass and collision shapes; any arm (DH table or chain) exported and imported
// back keeps its forward kinematics. Reference: the product's forward kinematics, itself checked
// against Orocos KDL (tests/reference/urdf_kdl.test.ts, tests/reference/kdl.test.ts).
import { readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createData, createModel, forwardKinematics, type ArmKinematics } from "@/lib/kinematics";
import { exportUrdf, importUrdf } from "@/lib/urdf";
import { armSchema, type ArmDocument, type ChainJointSpec } from "@/shared/schemas";
import { randomArm } from "../helpers/arms";
import { randomChain } from "../helpers/chains";
import { maxAbsDiff } from "../helpers/fd";
import { createRng, uniform } from "../helpers/rng";

const file = (name: string) => readFileSync(path.join(__dirname, "../reference/urdf", name), "utf8");

/** Largest tool-pose difference over random configurations within the first arm's limits. */
function fkDifference(a: ArmKinematics, b: ArmKinematics, seed: number): number {
  const ma = createModel(a), mb = createModel(b);
  const da = createData(ma), db = createData(mb);
  const rng = createRng(seed);
  let worst = 0;
  for (let k = 0; k < 20; k++) {
    const q = Array.from({ length: ma.n }, (_, i) => uniform(rng, ma.lower[i], ma.upper[i]));
    forwardKinematics(ma, da, q);
    forwardKinematics(mb, db, q);
    worst = Math.max(worst, maxAbsDiff(da.toolPose, db.toolPose));
  }
  return worst;
}

/** Same limits, speeds, torques, masses exactly; centres of mass, inertias and capsules to `tol`. */
function expectSameLinks(a: ArmDocument, b: ArmDocument, tol = 1e-12) {
  expect(b.joints.length).toBe(a.joints.length);
  a.joints.forEach((ja, i) => {
    const jb = b.joints[i];
    expect([jb.type, jb.min, jb.max, jb.maxSpeed, jb.maxTorque, jb.mass], `joint ${i + 1}`).toEqual([ja.type, ja.min, ja.max, ja.maxSpeed, ja.maxTorque, ja.mass]);
    if (ja.com) expect(maxAbsDiff(jb.com!, ja.com)).toBeLessThanOrEqual(tol);
    else expect(jb.com).toBeUndefined();
    const ia = (ja as ChainJointSpec).inertia, ib = (jb as ChainJointSpec).inertia;
    if (ia) expect(maxAbsDiff(ib!, ia)).toBeLessThanOrEqual(tol);
    expect((jb.collision ?? []).length).toBe((ja.collision ?? []).length);
    (ja.collision ?? []).forEach((c, k) => {
      const d = jb.collision![k];
      expect(maxAbsDiff([...d.from, ...d.to, d.radius], [...c.from, ...c.to, c.radius]), `joint ${i + 1} capsule ${k + 1}`).toBeLessThanOrEqual(tol);
    });
  });
  expect((b.baseCollision ?? []).length).toBe((a.baseCollision ?? []).length);
}

describe("URDF round trip: import → export → import", () => {
  for (const [name, opts] of [["slanted-six.urdf", {}], ["rail-wrist.urdf", {}], ["twin-branch.urdf", { tip: "right_tool" }], ["twin-branch.urdf", { base: "torso", tip: "left_tip" }]] as const) {
    it(`${name} ${JSON.stringify(opts)}: same FK to 1e-12, same limits, masses, centres of mass and shapes`, () => {
      const first = importUrdf(file(name), opts).arm;
      const text = exportUrdf(first);
      const second = importUrdf(text).arm;
      expect(fkDifference(first, second, 3)).toBeLessThanOrEqual(1e-12);
      expectSameLinks(first, second);
      // A third pass changes nothing more: the exported text is stable.
      expect(exportUrdf(importUrdf(text).arm)).toBe(exportUrdf(second));
    });
  }
});

describe("URDF export of any arm imports back to the same arm", () => {
  it("random chains with masses, inertias and capsules (property test)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 - 1 }), fc.integer({ min: 1, max: 8 }), (seed, n) => {
        const rng = createRng(seed);
        const chain = randomChain(rng, { n, prismaticProbability: 0.3 });
        const arm = armSchema.parse({
          ...chain,
          joints: chain.joints.map((j, i) => ({
            ...j,
            maxSpeed: uniform(rng, 0.5, 4),
            ...(i % 2 ? {} : { maxTorque: uniform(rng, 5, 300) }),
            mass: uniform(rng, 0.1, 8),
            com: [uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2), uniform(rng, -0.2, 0.2)],
            ...(i % 3 === 0 ? { inertia: [0.02, 0.03, 0.01, 0.001, -0.002, 0.0005] } : {}),
            collision: [
              { from: [0, 0, 0], to: [uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3), uniform(rng, -0.3, 0.3)], radius: uniform(rng, 0.02, 0.1) },
              { from: [0.01, 0.02, 0.03], to: [0.01, 0.02, 0.03], radius: 0.04 },
            ],
          })),
          baseCollision: [{ from: [0, 0, 0], to: [0, 0, 0.2], radius: 0.1 }],
        });
        const back = importUrdf(exportUrdf(arm)).arm;
        expect(fkDifference(arm, back, seed)).toBeLessThanOrEqual(1e-12);
        expectSameLinks(arm, back);
        expect(back.baseCollision).toEqual(arm.baseCollision);
      }),
      { numRuns: 60, seed: 424242 },
    );
  });

  it("DH and MDH tables export as their equivalent chains (same FK)", () => {
    const rng = createRng(17);
    for (let k = 0; k < 20; k++) {
      const dh = randomArm(rng, { n: 1 + (k % 7), convention: k % 2 ? "mdh" : "dh", prismaticProbability: 0.3 });
      const doc = armSchema.parse(dh);
      const back = importUrdf(exportUrdf(doc)).arm;
      expect(back.convention).toBe("chain");
      expect(fkDifference(doc, back, k)).toBeLessThanOrEqual(1e-12);
    }
  });

  it("names and text are escaped; the robot name round-trips", () => {
    const arm = armSchema.parse({ ...randomChain(createRng(1), { n: 2 }), name: `Quote " & <angle> 'x' -- dash` });
    const text = exportUrdf(arm);
    expect(text).toContain('<robot name="Quote &quot; &amp; &lt;angle&gt; &apos;x&apos; -- dash">');
    expect(importUrdf(text).arm.name).toBe(`Quote " & <angle> 'x' -- dash`);
  });
});
