// URDF import: chain selection, fixed-joint merging, limits, mass properties and collision shapes.
// Sources beside each check: the URDF specification's joint, link and inertial semantics (as
// written in lib/urdf/import.ts), the parallel-axis theorem (any mechanics text, e.g. Craig,
// "Introduction to Robotics", §6.3), and plain geometry for the shape containment checks.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { createData, createModel, forwardKinematics, mulRigid, originMatrix, transformPointRigid } from "@/lib/kinematics";
import { CONTINUOUS_RANGE, importUrdf, UrdfError } from "@/lib/urdf";
import type { Capsule, ChainJointSpec } from "@/shared/schemas";
import { maxAbsDiff } from "../helpers/fd";

const file = (name: string) => readFileSync(path.join(__dirname, "../reference/urdf", name), "utf8");

function robot(body: string, name = "test_robot"): string {
  return `<?xml version="1.0"?>\n<robot name="${name}">\n${body}\n</robot>\n`;
}

const rev = (name: string, parent: string, child: string, extra = "") =>
  `<joint name="${name}" type="revolute"><parent link="${parent}"/><child link="${child}"/><axis xyz="0 0 1"/><limit lower="-1" upper="1" effort="10" velocity="2"/>${extra}</joint>`;

/** Distance from p to the segment a–b. */
function segmentDistance(p: number[], a: number[], b: number[]): number {
  const ab = [b[0] - a[0], b[1] - a[1], b[2] - a[2]];
  const ap = [p[0] - a[0], p[1] - a[1], p[2] - a[2]];
  const L = ab[0] ** 2 + ab[1] ** 2 + ab[2] ** 2;
  const t = L === 0 ? 0 : Math.max(0, Math.min(1, (ap[0] * ab[0] + ap[1] * ab[1] + ap[2] * ab[2]) / L));
  return Math.hypot(ap[0] - t * ab[0], ap[1] - t * ab[1], ap[2] - t * ab[2]);
}
const inside = (p: number[], c: Capsule) => segmentDistance(p, c.from, c.to) <= c.radius + 1e-12;

describe("importUrdf: the chain", () => {
  it("takes the root and the end of the longest usable chain by default and lists the candidates", () => {
    const r = importUrdf(file("twin-branch.urdf"));
    expect(r.report.baseLink).toBe("pedestal");
    // The right arm with its first finger is the longest chain (6 moving joints); the mimic finger is not usable.
    expect(r.report.tipLink).toBe("finger_a");
    expect(r.report.tipCandidates[0]).toMatchObject({ link: "finger_a", movingJoints: 6, blockedBy: null });
    expect(r.report.tipCandidates.find((t) => t.link === "finger_b")?.blockedBy).toBe('mimic joint "finger_b_joint"');
    expect(r.report.tipCandidates.map((t) => t.link)).toEqual(expect.arrayContaining(["right_tool", "left_tip", "torso"]));
    expect(r.report.baseCandidates[0]).toBe("pedestal");
    expect(r.report.baseCandidates).toContain("torso");
  });

  it("follows a chosen base and tip in a tree, and skips the other branches", () => {
    const r = importUrdf(file("twin-branch.urdf"), { base: "torso", tip: "left_tip" });
    expect(r.report.joints.map((j) => j.name)).toEqual(["left_shoulder", "left_elbow", "left_wrist"]);
    expect(r.report.skipped.join("\n")).toMatch(/link "right_upper" and 6 links below it \(behind revolute joint "right_shoulder", off the chain\)/);
    expect(r.report.skipped.join("\n")).toMatch(/1 link above the base link "torso"/);
    // The camera is fixed to the torso, which is the base here: its mass is not used, its box joins the base.
    expect(r.arm.baseCollision).toHaveLength(1);
    expect(r.report.notes.join("\n")).toMatch(/mass of the base .*12\.400 kg/);
    expect(r.arm.tool).toBeDefined();
  });

  it("refuses a tip that is not below the base, an unknown link, and too many moving joints", () => {
    expect(() => importUrdf(file("twin-branch.urdf"), { base: "left_upper", tip: "right_tool" })).toThrow(/tip link "right_tool": is not below base link "left_upper"/);
    expect(() => importUrdf(file("twin-branch.urdf"), { base: "nowhere" })).toThrow(/base link "nowhere": does not exist/);
    const links = Array.from({ length: 15 }, (_, i) => `<link name="l${i}"/>`).join("");
    const joints = Array.from({ length: 14 }, (_, i) => rev(`j${i}`, `l${i}`, `l${i + 1}`)).join("");
    expect(() => importUrdf(robot(links + joints), { tip: "l14" })).toThrow(/tip link "l14": the chain from "l0" has 14 moving joints; an arm has at most 12: choose a nearer tip/);
    // By default the longest chain that fits is taken.
    expect(importUrdf(robot(links + joints)).report.tipLink).toBe("l12");
  });

  it("merges fixed joints into the next origin and into the tool, keeping the FK of the file", () => {
    const r = importUrdf(file("slanted-six.urdf"));
    expect(r.report.merged).toContain('fixed joint "forearm_mount" merged into the origin of joint 4 ("roll_forearm")');
    expect(r.report.merged.filter((m) => m.includes("tool transform"))).toHaveLength(2);
    expect(r.report.joints[3].mergedFixed).toEqual(["forearm_mount"]);
    // Joint 4's origin = T(forearm_mount) · T(roll_forearm origin), written out from the file.
    const expected = mulRigid(originMatrix({ xyz: [0.11, 0, 0.02], rpy: [0.1, -0.2, 0.05] }), originMatrix({ xyz: [0.06, 0, 0], rpy: [0, Math.PI / 2, 0] }));
    expect(maxAbsDiff(originMatrix((r.arm.joints[3] as ChainJointSpec).origin), expected)).toBeLessThan(1e-15);
    // tool = T(flange) · T(tool0_joint)
    const tool = mulRigid(originMatrix({ xyz: [0, 0, 0.03], rpy: [0, 0, 0] }), originMatrix({ xyz: [0.01, 0, 0.05], rpy: [0, 0.2, 1.0] }));
    expect(maxAbsDiff(r.arm.tool!, tool)).toBeLessThan(1e-15);
  });

  it("maps limits: lower/upper → min/max, velocity → maxSpeed, effort → maxTorque; continuous → ±360°", () => {
    const r = importUrdf(file("rail-wrist.urdf"));
    const j = r.arm.joints as ChainJointSpec[];
    expect(j.map((x) => x.type)).toEqual(["prismatic", "revolute", "revolute", "prismatic", "revolute"]);
    expect([j[0].min, j[0].max, j[0].maxSpeed, j[0].maxTorque]).toEqual([0, 1.2, 1.0, 800]);
    expect([j[2].min, j[2].max, j[2].maxSpeed, j[2].maxTorque]).toEqual([CONTINUOUS_RANGE.min, CONTINUOUS_RANGE.max, 3.0, 60]);
    expect(CONTINUOUS_RANGE).toEqual({ min: -2 * Math.PI, max: 2 * Math.PI });
    expect(j[4].maxSpeed).toBeUndefined();
    expect(r.report.converted.filter((c) => c.startsWith("continuous joint"))).toHaveLength(2);
    expect(r.report.notes).toContain('joint "wrist_spin": no velocity limit (rad/s) in the file; max speed not set');
    expect(j[0].axis).toEqual([1, 0.2, 0.05]);
  });

  it("records the file name, hash, base and tip in the arm's source", () => {
    const r = importUrdf(file("slanted-six.urdf"), { fileName: "dir/slanted-six.urdf", sha256: "a".repeat(64) });
    expect(r.arm.source).toEqual({ format: "urdf", file: "slanted-six.urdf", sha256: "a".repeat(64), baseLink: "base_link", tipLink: "tool0" });
    expect(r.arm.name).toBe("slanted_six");
    expect(r.arm.description).toMatch(/^Imported from "dir\/slanted-six.urdf" \(robot "slanted_six"\): chain from link "base_link" to link "tool0", 6 moving joints/);
  });
});

describe("importUrdf: mass properties in the link frame", () => {
  it("expresses the centre of mass in the link frame and rotates the inertia tensor into its axes", () => {
    // upper_arm: inertial origin xyz (0.17, 0, 0.02), rpy (0, 90°, 0), principal (0.01, 0.07, 0.07):
    // Ry(90°) maps x→−z, z→x, so in link axes ixx = 0.07, iyy = 0.07, izz = 0.01.
    const j = importUrdf(file("slanted-six.urdf")).arm.joints[1] as ChainJointSpec;
    expect(j.mass).toBe(5.5);
    expect(j.com).toEqual([0.17, 0, 0.02]);
    expect(j.inertia![0]).toBeCloseTo(0.07, 15);
    expect(j.inertia![1]).toBeCloseTo(0.07, 15);
    expect(j.inertia![2]).toBeCloseTo(0.01, 15);
    for (const k of [3, 4, 5]) expect(Math.abs(j.inertia![k])).toBeLessThan(1e-15);
  });

  it("combines links joined by a fixed joint: total mass, weighted centre, parallel-axis inertia", () => {
    const text = robot(`
      <link name="base"/>
      <link name="a"><inertial><origin xyz="0.1 0 0"/><mass value="2"/><inertia ixx="0.01" iyy="0.02" izz="0.03"/></inertial></link>
      <link name="b"><inertial><origin xyz="0 0 0.2"/><mass value="1"/><inertia ixx="0.001" iyy="0.001" izz="0.001"/></inertial></link>
      ${rev("j1", "base", "a")}
      <joint name="weld" type="fixed"><origin xyz="0.3 0 0"/><parent link="a"/><child link="b"/></joint>`);
    const j = importUrdf(text).arm.joints[0] as ChainJointSpec;
    // Parts at (0.1, 0, 0) [2 kg] and (0.3, 0, 0.2) [1 kg]: centre (0.5/3, 0, 0.2/3).
    expect(j.mass).toBe(3);
    expect(j.com![0]).toBeCloseTo(0.5 / 3, 15);
    expect(j.com![2]).toBeCloseTo(0.2 / 3, 15);
    // Parallel axis: I = Σ Iᵢ + mᵢ(|dᵢ|²E − dᵢdᵢᵀ), dᵢ from the combined centre, written out by hand.
    const c = [0.5 / 3, 0, 0.2 / 3];
    const d1 = [0.1 - c[0], 0, 0 - c[2]], d2 = [0.3 - c[0], 0, 0.2 - c[2]];
    const ixx = 0.01 + 2 * (d1[1] ** 2 + d1[2] ** 2) + 0.001 + 1 * (d2[1] ** 2 + d2[2] ** 2);
    const iyy = 0.02 + 2 * (d1[0] ** 2 + d1[2] ** 2) + 0.001 + 1 * (d2[0] ** 2 + d2[2] ** 2);
    const izz = 0.03 + 2 * (d1[0] ** 2 + d1[1] ** 2) + 0.001 + 1 * (d2[0] ** 2 + d2[1] ** 2);
    const ixz = -(2 * d1[0] * d1[2] + 1 * d2[0] * d2[2]);
    expect(j.inertia![0]).toBeCloseTo(ixx, 14);
    expect(j.inertia![1]).toBeCloseTo(iyy, 14);
    expect(j.inertia![2]).toBeCloseTo(izz, 14);
    expect(j.inertia![4]).toBeCloseTo(ixz, 14);
  });

  it("a link mass centre given in the file sits at the same world point after the import", () => {
    // slanted-six link 3 combines elbow_housing and forearm_adapter; the world centre must be the
    // mass-weighted mean of the two parts' centres computed from the file's transforms.
    const r = importUrdf(file("slanted-six.urdf"));
    const model = createModel(r.arm);
    const data = createData(model);
    const q = [0.3, -0.5, 0.8, 0.2, -0.4, 1.1];
    forwardKinematics(model, data, q);
    const frame3 = data.frames.slice(16 * 3, 16 * 4);
    const j3 = r.arm.joints[2] as ChainJointSpec;
    const world = transformPointRigid(frame3, j3.com!);
    const housing = transformPointRigid(frame3, [0.05, 0, 0]);
    const adapter = transformPointRigid(mulRigid(frame3, originMatrix({ xyz: [0.11, 0, 0.02], rpy: [0.1, -0.2, 0.05] })), [0.02, 0, 0]);
    const expected = [0, 1, 2].map((k) => (2.1 * housing[k] + 0.6 * adapter[k]) / 2.7);
    expect(maxAbsDiff(world, expected)).toBeLessThan(1e-15);
  });
});

describe("importUrdf: collision shapes", () => {
  const r = importUrdf(file("slanted-six.urdf"));
  const joints = r.arm.joints as ChainJointSpec[];

  it("a sphere is the capsule with from = to (exact)", () => {
    expect(joints[0].collision).toEqual([{ from: [0, 0, 0.08], to: [0, 0, 0.08], radius: 0.08 }]);
  });

  it("a cylinder becomes the capsule around its axis segment, which contains it", () => {
    const [c] = joints[1].collision!;
    expect(c.radius).toBe(0.06);
    // Cylinder along the link's x (origin rpy (0, 90°, 0)), centre (0.17, 0, 0), length 0.34.
    expect(maxAbsDiff(c.from, [0, 0, 0])).toBeLessThan(1e-15);
    expect(maxAbsDiff(c.to, [0.34, 0, 0])).toBeLessThan(1e-15);
    for (const t of [0, 0.34]) for (const a of [0, 1, 2, 3, 4, 5]) expect(inside([t, 0.06 * Math.cos(a), 0.06 * Math.sin(a)], c)).toBe(true);
    // The capsule's caps stick out of the end faces by the radius, and the report says so.
    expect(inside([-0.059, 0, 0], c)).toBe(true);
    expect(r.report.converted.find((m) => m.includes(": cylinder (radius 60 mm"))).toMatch(/capsule around its axis, reaching 60(\.0)? mm beyond each end face/);
  });

  it("a box becomes the capsule along its longest edge that contains all 8 corners", () => {
    const [c] = joints[2].collision!;
    const T = originMatrix({ xyz: [0.05, 0, 0], rpy: [0.3, 0, 0] });
    for (const sx of [-1, 1]) for (const sy of [-1, 1]) for (const sz of [-1, 1]) {
      expect(inside(transformPointRigid(T, [0.08 * sx, 0.045 * sy, 0.035 * sz]), c)).toBe(true);
    }
    expect(c.radius).toBeCloseTo(Math.hypot(0.09, 0.07) / 2, 15);
  });

  it("base shapes go to baseCollision; a mesh is skipped with a suggested capsule to the next joint", () => {
    expect(r.arm.baseCollision).toEqual([{ from: [0, 0, 0], to: [0, 0, 0.12], radius: 0.09 }]);
    expect(joints[3].collision).toBeUndefined();
    expect(r.report.skipped).toContain('link "forearm": 1 mesh collision shape (mesh "meshes/forearm.stl"): meshes are not read');
    expect(r.report.suggestions).toEqual([{ body: 4, link: "forearm", capsule: { from: [0, 0, 0], to: [0, 0.02, 0.27], radius: 0.05416 } }].map((s) => ({ ...s, capsule: { ...s.capsule, radius: 0.2 * Math.hypot(0.02, 0.27) } })));
  });
});

describe("importUrdf: refusals name the joint", () => {
  const two = `<link name="a"/><link name="b"/>`;
  it.each([
    ["floating", `${two}<joint name="free" type="floating"><parent link="a"/><child link="b"/></joint>`, /joint "free": is a floating joint/],
    ["planar", `${two}<joint name="flat" type="planar"><parent link="a"/><child link="b"/></joint>`, /joint "flat": is a planar joint/],
    ["mimic", `${two}<link name="c"/>${rev("lead", "a", "b")}${rev("follow", "b", "c", '<mimic joint="lead"/>')}`, /joint "follow" <mimic>: the joint follows joint "lead"/],
    ["unknown type", `${two}<joint name="odd" type="ball"><parent link="a"/><child link="b"/></joint>`, /joint "odd" type: "ball" is not a URDF joint type/],
    ["revolute without limit", `${two}<joint name="free_spin" type="revolute"><parent link="a"/><child link="b"/></joint>`, /joint "free_spin" <limit>: is required for a revolute joint/],
    ["lower above upper", `${two}<joint name="j" type="prismatic"><parent link="a"/><child link="b"/><limit lower="0.5" upper="0.1" effort="1" velocity="1"/></joint>`, /joint "j" <limit>: lower \(0\.5\) is above upper \(0\.1\)/],
    ["zero axis", `${two}<joint name="j" type="revolute"><parent link="a"/><child link="b"/><axis xyz="0 0 0"/><limit lower="-1" upper="1" effort="1" velocity="1"/></joint>`, /joint "j" <axis> xyz: must not be zero/],
  ])("%s", (_label, body, message) => {
    const tip = body.includes('"c"') ? { tip: "c" } : {};
    expect(() => importUrdf(robot(body), tip)).toThrow(UrdfError);
    expect(() => importUrdf(robot(body), tip)).toThrow(message);
  });

  it("a mimic joint off the chosen chain is skipped, not refused", () => {
    const r = importUrdf(robot(`<link name="a"/><link name="b"/><link name="c"/>${rev("lead", "a", "b")}${rev("follow", "b", "c", '<mimic joint="lead"/>')}`));
    expect(r.report.tipLink).toBe("b");
    expect(r.report.skipped[0]).toMatch(/link "c" \(behind revolute joint "follow", off the chain\)/);
  });
});
