// The arm editor's joint-chain form: chain rows to and from the document (mm and degrees shown),
// error paths named in words, and "convert this DH table to a chain" with its forward-kinematics
// check. Reference: the product's forward kinematics of the DH table (checked against KDL in
// tests/reference/kdl.test.ts).
import { describe, expect, it } from "vitest";
import { armFormFromDoc, armPathLabel, validateArmForm } from "@/components/arm/armForm";
import { convertFormToChain, fkDifference } from "@/components/arm/chainConvert";
import { formatArmValue } from "@/components/arm/format";
import type { ChainJointSpec } from "@/shared/schemas";
import { loadSeedArms } from "@/seed-data";

const arms = loadSeedArms();

describe("chain rows in the arm editor", () => {
  it("show origins in mm and degrees and write edited values back in SI", () => {
    const arm = arms.find((a) => a.convention === "chain")!;
    const form = armFormFromDoc(arm);
    expect(form.convention).toBe("chain");
    const j0 = arm.joints[0] as ChainJointSpec;
    expect(form.joints[0].oz).toBe(String(j0.origin.xyz[2] * 1000));
    form.joints[0] = { ...form.joints[0], roll: "90", axisX: "0", axisY: "0", axisZ: "2" };
    const { doc, errors } = validateArmForm(form);
    expect(errors).toEqual([]);
    const j = doc.joints[0] as ChainJointSpec;
    expect(j.origin.rpy[0]).toBeCloseTo(Math.PI / 2, 15);
    expect(j.axis).toEqual([0, 0, 2]);
  });

  it("a zero axis or a bad origin number is an error on that joint, named in words", () => {
    const form = armFormFromDoc(arms.find((a) => a.convention === "chain")!);
    form.joints[1] = { ...form.joints[1], axisX: "0", axisY: "0", axisZ: "0", pitch: "abc" };
    const { errors } = validateArmForm(form);
    expect(errors.map((e) => e.path)).toEqual(expect.arrayContaining(["joints.1.origin.rpy.1"]));
    expect(errors.find((e) => e.path === "joints.1.origin.rpy.1")!.message).toBe("joint 2 origin pitch 'abc' is not a number");
    form.joints[1].pitch = "0";
    const again = validateArmForm(form).errors;
    expect(again).toEqual([{ path: "joints.1.axis", message: "must not be zero: the axis needs a direction" }]);
    expect(armPathLabel("joints.1.axis")).toBe("joint 2 axis");
    expect(armPathLabel("joints.1.origin.rpy.2")).toBe("joint 2 origin yaw");
    expect(armPathLabel("joints.0.origin.xyz.1")).toBe("joint 1 origin y");
    expect(formatArmValue("joints.0.origin.rpy.0", Math.PI / 2, undefined)).toBe("90°");
    expect(formatArmValue("joints.0.origin.xyz.2", 0.12, undefined)).toBe("120 mm");
  });
});

describe("convert this DH table to a chain", () => {
  it.each(arms.filter((a) => a.convention !== "chain").map((a) => [a.name, a] as const))("%s: same forward kinematics, saved as a valid chain arm", (_name, arm) => {
    const form = armFormFromDoc(arm);
    const r = convertFormToChain(form);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.maxDifference).toBeLessThanOrEqual(1e-12);
    const { doc, errors } = validateArmForm({ ...form, ...r.patch });
    expect(errors).toEqual([]);
    expect(doc.convention).toBe("chain");
    expect(fkDifference(arm, doc)).toBeLessThanOrEqual(1e-12);
    // Capsules travel with their links (same count per body); specs and identity stay.
    expect(doc.joints.map((j) => j.collision?.length ?? 0)).toEqual(arm.joints.map((j) => j.collision?.length ?? 0));
    expect(doc.specs).toEqual(arm.specs);
  });

  it("refuses a table with errors, saying why", () => {
    const form = armFormFromDoc(arms[0]);
    form.joints[0] = { ...form.joints[0], a: "x" };
    const r = convertFormToChain(form);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.errors[0].message).toBe("joint 1 a 'x' is not a number");
  });
});
