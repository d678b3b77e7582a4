import { describe, expect, it } from "vitest";
import { matrixPose, parseNum, parsePose, poseMatrix, show } from "@/components/pose";
import { parseDhPaste } from "@/components/arm/dhPaste";
import { armFormFromDoc, armFormToDoc } from "@/components/arm/armForm";
import { loadSeedArms } from "@/seed-data";

const deg = Math.PI / 180;

describe("pose entry (roll-pitch-yaw about fixed X, Y, Z)", () => {
  it("matches the elementary rotations Rx, Ry, Rz (Craig, Introduction to Robotics, ch. 2)", () => {
    const rot = (m: number[]) => [m[0], m[1], m[2], m[4], m[5], m[6], m[8], m[9], m[10]].map((v) => Math.round(v * 1e12) / 1e12 + 0);
    expect(rot(poseMatrix([0, 0, 0], [90 * deg, 0, 0]))).toEqual([1, 0, 0, 0, 0, -1, 0, 1, 0]);
    expect(rot(poseMatrix([0, 0, 0], [0, 90 * deg, 0]))).toEqual([0, 0, 1, 0, 1, 0, -1, 0, 0]);
    expect(rot(poseMatrix([0, 0, 0], [0, 0, 90 * deg]))).toEqual([0, -1, 0, 1, 0, 0, 0, 0, 1]);
  });

  it("matches scipy's extrinsic 'xyz' Euler angles on a general rotation", () => {
    // scipy.spatial.transform.Rotation.from_euler('xyz', [30, -50, 120], degrees=True).as_matrix()
    const ref = [
      [-0.321393804843, -0.55848888922, 0.764719675977],
      [0.556670399226, -0.764719675977, -0.324533332339],
      [0.766044443119, 0.321393804843, 0.556670399226],
    ];
    const m = poseMatrix([0.1, 0.2, 0.3], [30 * deg, -50 * deg, 120 * deg]);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(m[i * 4 + j]).toBeCloseTo(ref[i][j], 11);
    expect([m[3], m[7], m[11]]).toEqual([0.1, 0.2, 0.3]);
  });

  it("recovers position and angles from the matrix, including the pitch ±90° case", () => {
    const back = matrixPose(poseMatrix([1, -2, 3], [10 * deg, 20 * deg, -30 * deg]));
    expect(back.p).toEqual([1, -2, 3]);
    back.rpy.forEach((v, i) => expect(v).toBeCloseTo([10 * deg, 20 * deg, -30 * deg][i], 12));
    const gimbal = poseMatrix([0, 0, 0], [0, 90 * deg, 40 * deg]);
    const g = poseMatrix([0, 0, 0], matrixPose(gimbal).rpy);
    gimbal.forEach((v, i) => expect(g[i]).toBeCloseTo(v, 12));
  });

  it("parses typed numbers (Unicode minus accepted) and names the bad field and value", () => {
    expect(parseNum(" \u22125.5 ")).toBe(-5.5);
    expect(parseNum("")).toBeUndefined();
    expect(parseNum("1e999")).toBe("bad");
    expect(parseNum("12abc")).toBe("bad");
    const bad = parsePose({ x: "10", y: "abc", z: "0", roll: "0", pitch: "0", yaw: "0" }, "tool");
    expect(bad).toEqual({ ok: false, errors: { y: "tool y 'abc' is not a number" } });
    const ok = parsePose({ x: "100", y: "0", z: "-50", roll: "180", pitch: "0", yaw: "0" }, "tool");
    expect(ok.ok && ok.p).toEqual([0.1, 0, -0.05]);
    expect(show(90.0000000017)).toBe("90");
  });
});

describe("DH table paste", () => {
  it("reads a tab-separated table with a header row and reports the bad row by number", () => {
    const text = [
      "type\ta (mm)\talpha (°)\td (mm)\ttheta (°)\tmin\tmax",
      "revolute\t0\t90\t300\t0\t-170\t170",
      "revolute\t250\tabc\t0\t0\t-120\t120",
      "prismatic\t0\t0\t0\t0\t0\t200",
    ].join("\n");
    const r = parseDhPaste(text);
    expect(r.header).toBe(true);
    expect(r.delimiter).toBe("tab");
    expect(r.rows.map((x) => x.errors.length === 0)).toEqual([true, false, true]);
    expect(r.rows[1].errors).toContain("row 2: α 'abc' is not a number");
    expect(r.rows[2].joint?.type).toBe("prismatic");
  });

  it("reads the documented column order without a header and checks min against max", () => {
    const r = parseDhPaste("r,0,90,300,0,170,-170\nr,250,0,0,0,-120,120");
    expect(r.header).toBe(false);
    expect(r.rows[0].errors[0]).toMatch(/^row 1: max \(-170°\) is below min \(170°\)$/);
    expect(r.rows[1].errors).toEqual([]);
  });
});

describe("arm form round trip", () => {
  it("turns every demo arm into the form and back without changing a value", () => {
    for (const arm of loadSeedArms()) {
      const { doc, errors } = armFormToDoc(armFormFromDoc(arm));
      expect(errors, arm.name).toEqual([]);
      expect(doc.joints.length).toBe(arm.joints.length);
      doc.joints.forEach((j, i) => {
        // Unedited values go back exactly as loaded, whatever the convention.
        for (const [k, v] of Object.entries(arm.joints[i])) expect((j as Record<string, unknown>)[k], `${arm.name} joint ${i + 1} ${k}`).toEqual(v);
      });
      expect(doc.specs?.reach).toBeCloseTo(arm.specs?.reach ?? NaN, 9);
    }
  });
});
