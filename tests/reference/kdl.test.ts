// Golden tests against Orocos KDL (PyKDL; ChainFkSolverPos_recursive and ChainJntToJacSolver).
// Fixtures: tests/reference/fixtures/kdl.json, written by tests/reference/kdl_fixtures.py
// (regenerate with tests/reference/regenerate.sh).
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { computeJacobian, createData, createModel, forwardKinematics, type ArmKinematics } from "@/lib/kinematics";
import { referenceToolPose, type DhArmLike } from "../helpers/dh-reference";
import { maxAbsDiff } from "../helpers/fd";

interface KdlCase {
  arm: ArmKinematics;
  configs: number[][];
  toolPose: number[][];
  jacobian: number[][][];
}
const fixture = JSON.parse(readFileSync(path.join(__dirname, "fixtures", "kdl.json"), "utf8")) as { cases: KdlCase[] };

describe("forward kinematics and Jacobian match Orocos KDL to 1e-9", () => {
  it("covers 3, 6 and 7 joints, both conventions and prismatic joints", () => {
    const sizes = new Set(fixture.cases.map((c) => c.arm.joints.length));
    expect([...sizes].sort()).toEqual([3, 6, 7]);
    expect(new Set(fixture.cases.map((c) => c.arm.convention)).size).toBe(2);
    expect(fixture.cases.some((c) => c.arm.joints.some((j) => j.type === "prismatic"))).toBe(true);
  });

  for (const c of fixture.cases) {
    it(c.arm.name, () => {
      const model = createModel(c.arm);
      const data = createData(model);
      const J = new Float64Array(6 * model.n);
      c.configs.forEach((q, k) => {
        forwardKinematics(model, data, q);
        expect(maxAbsDiff(data.toolPose, c.toolPose[k])).toBeLessThan(1e-9);
        computeJacobian(model, data, q, J);
        expect(maxAbsDiff(J, c.jacobian[k].flat())).toBeLessThan(1e-9);
      });
    });
  }
});

describe("the tests' own DH forward kinematics (tests/helpers/dh-reference.ts) matches Orocos KDL to 1e-9", () => {
  // The IK tests judge answers with it, so it is checked against the outside library as well.
  for (const c of fixture.cases) {
    if (c.arm.convention === "chain") continue;
    it(c.arm.name, () => {
      c.configs.forEach((q, k) => expect(maxAbsDiff(referenceToolPose(c.arm as DhArmLike, q), c.toolPose[k])).toBeLessThan(1e-9));
    });
  }
});
