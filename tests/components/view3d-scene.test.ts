// What the 3-D view draws (components/view3d/scene.ts; docs/design.md#3-d-view), checked against
// sources outside the view:
// - Orocos KDL fixtures (docs/references.md#orocos-kdl; tests/reference/fixtures/kdl.json, PyKDL
//   ChainFkSolverPos_recursive and ChainJntToJacSolver): the drawn tool frame is KDL's tool pose;
//   each drawn joint axis is KDL's Jacobian column (angular part ω = axis for a revolute joint,
//   linear part = axis for a prismatic one), and the drawn axis point satisfies
//   v = ω × (p_tool − o) with KDL's linear part;
// - the Denavit–Hartenberg definitions (docs/references.md#denavit-and-hartenberg-1955,
//   docs/references.md#craig-introduction-to-robotics): the stick figure runs d along z and a
//   along x between consecutive frames;
// - the analysis' own placement (createArmContext), which the shortlist view must draw.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { dhToChain, type ArmKinematics, type DhArmKinematics } from "@/lib/kinematics";
import { kinematicsOf } from "@/shared/schemas/arm";
import { createArmContext, placedArmKinematics } from "@/lib/analysis/context";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { axisOf, bounds, boxAt, createRig, pairBodies, forceScale, gridStep, homeConfiguration, niceStep, originOf, pathMarks, pointAtArcLength, poseArm, type Vec3 } from "@/components/view3d/scene";
import { cellObstacles } from "@/components/view3d/cell";
import { linkGeometry } from "@/lib/geometry/arm";

interface KdlCase {
  arm: ArmKinematics;
  configs: number[][];
  toolPose: number[][];
  jacobian: number[][][];
}
const fixture = JSON.parse(readFileSync(path.join(__dirname, "..", "reference", "fixtures", "kdl.json"), "utf8")) as { cases: KdlCase[] };

const maxDiff = (a: ArrayLike<number>, b: ArrayLike<number>) => Math.max(...Array.from(a, (x, i) => Math.abs(x - b[i])));
const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const len = (a: Vec3) => Math.hypot(...a);

describe("3-D view: the drawn arm against Orocos KDL", () => {
  // Each DH case as its table and as the equivalent general chain (origin + axis per joint): both
  // are drawn from the model's per-joint frames and must match KDL's answer for the table.
  const cases = fixture.cases.flatMap((c) => [
    { ...c, label: c.arm.name, arm: c.arm },
    { ...c, label: `${c.arm.name} as a chain`, arm: dhToChain(c.arm as DhArmKinematics) as ArmKinematics },
  ]);
  for (const c of cases) {
    it(`${c.label}: tool frame, joint axes and axis points`, () => {
      const rig = createRig(c.arm);
      const n = rig.model.n;
      c.configs.forEach((q, k) => {
        const fig = poseArm(rig, q);
        expect(maxDiff(fig.tool, c.toolPose[k])).toBeLessThan(1e-9);
        const J = c.jacobian[k]; // 6 × n, rows vx vy vz wx wy wz
        const tool = originOf(fig.tool);
        fig.joints.forEach((j, i) => {
          const lin: Vec3 = [J[0][i], J[1][i], J[2][i]];
          const ang: Vec3 = [J[3][i], J[4][i], J[5][i]];
          if (j.type === "revolute") {
            expect(maxDiff(j.axis, ang)).toBeLessThan(1e-9);
            expect(maxDiff(cross(j.axis, sub(tool, j.origin)), lin)).toBeLessThan(1e-9);
          } else {
            expect(maxDiff(j.axis, lin)).toBeLessThan(1e-9);
            expect(len(ang)).toBeLessThan(1e-12);
          }
          // A DH joint's frame has the joint axis as its z axis; a chain joint's axis passes through its link frame's origin.
          if (c.arm.convention === "chain") expect(maxDiff(originOf(j.frame), j.origin)).toBeLessThan(1e-15);
          else expect(maxDiff(axisOf(j.frame, 2), j.axis)).toBeLessThan(1e-15);
        });
        expect(fig.joints.map((j) => j.number)).toEqual(Array.from({ length: n }, (_, i) => i + 1));
      });
    });
  }
});

describe("3-D view: the stick figure follows the DH table", () => {
  it("runs |d| along z and |a| along x between consecutive frames (both conventions, prismatic q in d)", () => {
    for (const c of fixture.cases) {
      if (c.arm.convention === "chain") continue;
      const rig = createRig(c.arm);
      const m = rig.model;
      const q = c.configs[0];
      const fig = poseArm(rig, q);
      const f = rig.data.frames; // filled by the same forward kinematics call
      // Walk the segments from frame 0: the polyline visits every frame origin in order.
      const pts: Vec3[] = [fig.segments[0]?.[0] ?? originOf(f, 0)];
      for (const [, b] of fig.segments) pts.push(b);
      let at = 0;
      for (let i = 1; i <= m.n; i++) {
        const prev = originOf(f, 16 * (i - 1)), cur = originOf(f, 16 * i);
        const d = m.d[i - 1] + (m.prismatic[i - 1] ? q[i - 1] : 0), a = m.a[i - 1];
        // The figure's path from prev to cur: its length is |d| + |a| (the two DH translations).
        while (at < pts.length && len(sub(pts[at], prev)) > 1e-12) at++;
        const start = at;
        while (at < pts.length && len(sub(pts[at], cur)) > 1e-12) at++;
        expect(at).toBeLessThan(pts.length);
        let pathLen = 0;
        for (let k = start; k < at; k++) pathLen += len(sub(pts[k + 1], pts[k]));
        expect(pathLen).toBeCloseTo(Math.abs(d) + Math.abs(a), 12);
        // The d piece is parallel to the joint's z axis, the a piece to an x axis.
        const z = m.convention === "dh" ? axisOf(f, 2, 16 * (i - 1)) : axisOf(f, 2, 16 * i);
        const x = m.convention === "dh" ? axisOf(f, 0, 16 * i) : axisOf(f, 0, 16 * (i - 1));
        for (let k = start; k < at; k++) {
          const s = sub(pts[k + 1], pts[k]);
          const along = Math.abs(dot(s, z)) > Math.abs(dot(s, x)) ? z : x;
          expect(len(cross(s, along))).toBeLessThan(1e-12);
        }
      }
    }
  });

  it("draws capsules only where a collision radius is given", () => {
    const arm = kinematicsOf(loadSeedArms()[0]);
    const rig = createRig({ ...arm, joints: arm.joints.map((j, i) => ({ ...j, radius: i === 1 ? 0.05 : undefined })) } as ArmKinematics);
    const fig = poseArm(rig, homeConfiguration(rig));
    expect(fig.capsules.length).toBeGreaterThan(0);
    expect(fig.capsules.every((c) => c.link === 2 && c.radius === 0.05)).toBe(true);
  });
});

describe("3-D view: the shortlist view places the arm as the analysis does", () => {
  it("the placed model is the analysis model (base = cell placement · arm base, tool point = TCP)", () => {
    const sets = loadSeedRequirementSets();
    for (const arm of loadSeedArms()) {
      for (const req of sets) {
        const ctx = createArmContext(arm, req);
        const rig = createRig(placedArmKinematics(kinematicsOf(arm), req), req.base);
        expect(Array.from(rig.model.base)).toEqual(Array.from(ctx.model.base));
        expect(Array.from(rig.model.tool)).toEqual(Array.from(ctx.model.tool));
        const q = homeConfiguration(rig);
        expect(poseArm(rig, q).mount).toEqual(req.base);
      }
    }
  });

  it("draws the requirement set's obstacles with their names and sizes", () => {
    const req = loadSeedRequirementSets().find((r) => r.cell.obstacles.length > 0)!;
    const marks = cellObstacles(req);
    expect(marks.map((m) => m.name)).toEqual(req.cell.obstacles.map((o) => o.name));
    marks.forEach((m, i) => {
      const o = req.cell.obstacles[i];
      expect(m.shape).toBe(o.shape);
      if (m.shape === "box" && o.shape === "box") {
        expect(m.pose).toEqual(o.pose);
        expect(m.size).toEqual(o.size);
      }
    });
  });

  it("draws the geometry library's link capsules where the arm is posed (link frame coordinates × FK frame)", () => {
    for (const doc of loadSeedArms()) {
      const kin = kinematicsOf(doc);
      const withRadius = { ...doc, joints: doc.joints.map((j) => ({ ...j, radius: j.radius ?? 0.04 })) } as typeof doc;
      const links = linkGeometry(withRadius);
      const rig = createRig(kin, undefined, { links });
      const q = homeConfiguration(rig).map((x, i) => Math.min(rig.model.upper[i], Math.max(rig.model.lower[i], x + 0.3 * Math.sin(i + 1))));
      const fig = poseArm(rig, q);
      const f = rig.data.frames;
      const inLink = (k: number, p: readonly number[]): Vec3 => [0, 1, 2].map((r) => f[16 * k + 4 * r] * p[0] + f[16 * k + 4 * r + 1] * p[1] + f[16 * k + 4 * r + 2] * p[2] + f[16 * k + 4 * r + 3]) as Vec3;
      let k = 0;
      for (const g of links) {
        for (const c of g.capsules) {
          const drawn = fig.capsules[k++];
          expect(drawn.link).toBe(g.link);
          if (g.stretches) continue;
          // lib/geometry rounds link-frame coordinates to 1e-12 m.
          expect(maxDiff(drawn.from, inLink(g.link, c.from))).toBeLessThan(1e-9);
          expect(maxDiff(drawn.to, inLink(g.link, c.to))).toBeLessThan(1e-9);
          expect(drawn.radius).toBe(c.radius);
        }
      }
      expect(k).toBe(fig.capsules.length);
    }
  });
});

describe("3-D view: the closest pair's bodies", () => {
  it("finds the named link's rods and capsules, the tool's shapes and the obstacle by the clearance check's names", () => {
    const doc = loadSeedArms().find((a) => a.convention === "dh")!;
    const withRadius = { ...doc, joints: doc.joints.map((j) => ({ ...j, radius: 0.04 })) } as typeof doc;
    const rig = createRig(kinematicsOf(doc), undefined, { links: linkGeometry(withRadius) });
    const fig = poseArm(rig, homeConfiguration(rig));
    const n = rig.model.n;
    const fixture = boxAt("fixture table", [0.5, 0, 0.2], [0.4, 0.4, 0.4]);
    const tool = boxAt("tool: gripper", [0, 0, 1], [0.1, 0.1, 0.1]);
    const hit = pairBodies({ a: "link 3", b: "fixture table" }, fig, [fixture, boxAt("other", [0, 0, 0], [1, 1, 1])], [tool]);
    expect(hit.shapes).toEqual([fixture]);
    expect(hit.capsules.length).toBeGreaterThan(0);
    expect(hit.capsules.every((c) => c.link === 3)).toBe(true);
    expect(hit.segments).toEqual(fig.segments.filter((_, i) => fig.segmentLinks[i] === 3));
    // The last link runs to the tool point; the tool's shapes are found by the body name "tool".
    const end = pairBodies({ a: `link ${n}`, b: "tool" }, fig, [fixture], [tool]);
    expect(end.segments.at(-1)![1]).toEqual(originOf(fig.tool));
    expect(end.shapes).toEqual([tool]);
    expect(fig.segmentLinks.length).toBe(fig.segments.length);
  });
});

describe("3-D view: marks and scales", () => {
  it("direction marks point along each segment, in order", () => {
    const pts: Vec3[] = [[0, 0, 0], [0.3, 0, 0], [0.3, 0.4, 0]];
    const marks = pathMarks(pts, 0.1);
    expect(marks.length).toBe(3 + 4);
    expect(marks.slice(0, 3).every((m) => maxDiff(m.dir, [1, 0, 0]) < 1e-15)).toBe(true);
    expect(marks.slice(3).every((m) => maxDiff(m.dir, [0, 1, 0]) < 1e-15)).toBe(true);
    expect(marks.map((m) => m.at[0] + m.at[1])).toEqual([...marks.map((m) => m.at[0] + m.at[1])].sort((a, b) => a - b));
  });

  it("finds the point at an arc length, clamped at the ends", () => {
    const pts: Vec3[] = [[0, 0, 0], [0.3, 0, 0], [0.3, 0.4, 0]];
    expect(maxDiff(pointAtArcLength(pts, 0.5), [0.3, 0.2, 0])).toBeLessThan(1e-15);
    expect(pointAtArcLength(pts, -1)).toEqual([0, 0, 0]);
    expect(pointAtArcLength(pts, 9)).toEqual([0.3, 0.4, 0]);
  });

  it("draws forces to a round scale: the largest is between 0.4 and 1 times the length asked for", () => {
    for (const biggest of [0.37, 3, 41, 82, 150, 999, 12345]) {
      const { metresPerNewton, scaleText } = forceScale([biggest / 3, null, biggest], [0, 0, -biggest / 2], 0.25);
      const drawn = biggest * metresPerNewton;
      expect(drawn).toBeLessThanOrEqual(0.25 * (1 + 1e-12));
      expect(drawn).toBeGreaterThanOrEqual(0.25 / 2.5);
      const perMm = 1 / (metresPerNewton * 1000);
      const mantissa = perMm / 10 ** Math.floor(Math.log10(perMm) + 1e-12);
      expect([1, 2, 5].some((f) => Math.abs(mantissa - f) < 1e-9)).toBe(true);
      expect(scaleText).toMatch(/^1 mm stands for [\d.]+ N$/);
    }
    expect(forceScale([null, null, null], null, 0.25).metresPerNewton).toBe(0);
  });

  it("grid steps are 1, 2 or 5 × 10^k and give 5 to 12 squares across the scene", () => {
    for (const size of [0.05, 0.3, 0.85, 1.9, 4.2]) {
      const step = gridStep(size);
      expect(size / step).toBeGreaterThanOrEqual(12 / 2.5 - 1e-9);
      expect(size / step).toBeLessThanOrEqual(12 + 1e-9);
      expect(niceStep(step)).toBeCloseTo(step, 15);
    }
    expect(bounds([]).size).toBe(1);
  });
});
