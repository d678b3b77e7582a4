// URDF import against Orocos KDL (PyKDL; ChainFkSolverPos_recursive and ChainJntToJacSolver on
// chains built from the URDF joint origins the way KDL's URDF parser builds them), with a plain
// numpy/scipy reading of the URDF specification as a second reference.
// Fixtures: tests/reference/fixtures/urdf_kdl.json, written by tests/reference/urdf_kdl.py from
// the invented files in tests/reference/urdf (regenerate with tests/reference/regenerate.sh).
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { computeJacobian, createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { importUrdf } from "@/lib/urdf";
import { maxAbsDiff } from "../helpers/fd";

interface Case {
  file: string;
  base: string;
  tip: string;
  joints: string[];
  configs: number[][];
  pose: number[][];
  jacobian: number[][][];
  numpyPose: number[][];
  numpyJacobian: number[][][];
}
const fixture = JSON.parse(readFileSync(path.join(__dirname, "fixtures", "urdf_kdl.json"), "utf8")) as { kdlVsNumpyMaxDifference: number; cases: Case[] };

describe("imported URDF chains match Orocos KDL (and the numpy reading) to 1e-9", () => {
  it("the fixture covers rotated origins, oblique axes, fixed joints mid-chain and at the end, prismatic and continuous joints, a chosen tip of a tree", () => {
    expect(fixture.kdlVsNumpyMaxDifference).toBeLessThan(1e-12);
    const files = new Set(fixture.cases.map((c) => c.file));
    expect(files).toEqual(new Set(["slanted-six.urdf", "rail-wrist.urdf", "twin-branch.urdf"]));
    const text = (f: string) => readFileSync(path.join(__dirname, "urdf", f), "utf8");
    expect(text("slanted-six.urdf")).toMatch(/type="fixed"[\s\S]*type="revolute"/);
    expect(text("rail-wrist.urdf")).toMatch(/type="continuous"/);
    expect(text("rail-wrist.urdf")).toMatch(/type="prismatic"/);
    expect(fixture.cases.filter((c) => c.file === "twin-branch.urdf").map((c) => c.tip).sort()).toEqual(["left_tip", "right_tool"]);
  });

  for (const c of fixture.cases) {
    it(`${c.file}: ${c.base} → ${c.tip}`, () => {
      const { arm, report } = importUrdf(readFileSync(path.join(__dirname, "urdf", c.file), "utf8"), { base: c.base, tip: c.tip });
      expect(report.joints.map((j) => j.name)).toEqual(c.joints);
      const model = createModel(arm);
      const data = createData(model);
      const J = new Float64Array(6 * model.n);
      c.configs.forEach((q, k) => {
        forwardKinematics(model, data, q);
        expect(maxAbsDiff(data.toolPose, c.pose[k])).toBeLessThan(1e-9);
        expect(maxAbsDiff(data.toolPose, c.numpyPose[k])).toBeLessThan(1e-9);
        computeJacobian(model, data, q, J);
        expect(maxAbsDiff(J, c.jacobian[k].flat())).toBeLessThan(1e-9);
        expect(maxAbsDiff(J, c.numpyJacobian[k].flat())).toBeLessThan(1e-9);
      });
    });
  }
});
