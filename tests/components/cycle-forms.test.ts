// The cycle-time fields in the editors: sequences in the requirement-set form (exact round trip,
// a required rate saved as 3600 / rate s and shown both ways, field-level errors at the step that
// is wrong) and the joint acceleration limit in the arm form (°/s² and mm/s² shown, SI saved).
import { describe, expect, it } from "vitest";
import { requirementSetSchema, type RequirementSetInput } from "@/shared/schemas";
import { newSequence, newStep, reqFormFromDoc, switchRequiredMode, validateReqForm, type ReqForm } from "@/components/requirements/reqForm";
import { armFormFromDoc, armFormToDoc, validateArmForm } from "@/components/arm/armForm";
import { loadSeedArms } from "@/seed-data";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const withSequences: RequirementSetInput = {
  name: "cycle form test", base: I, tool: { tcp: I, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [
    { name: "pick", position: [0.4, 0, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
    { name: "place", position: [0.4, 0.2, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
  ],
  paths: [{ name: "seam", mode: "axis", step: 0.005, speed: 0.1, waypoints: [{ position: [0.5, 0, 0.3], rpy: [Math.PI, 0, 0] }, { position: [0.5, 0.2, 0.3], rpy: [Math.PI, 0, 0] }] }],
  specs: [],
  sequences: [
    { name: "loop", steps: [{ kind: "move", target: "pick", dwell: 0.35 }, { kind: "path", path: "seam" }, { kind: "wait", seconds: 1.25 }, { kind: "move", target: "place" }], required: 7.2 },
    { name: "no requirement", steps: [{ kind: "move", target: "place" }] },
  ],
};

const build = (f: ReqForm) => validateReqForm(f);
const errAt = (f: ReqForm, path: string) => build(f).errors.filter((e) => e.path === path).map((e) => e.message);

describe("sequences in the requirement-set form", () => {
  it("loads and saves the sequences unchanged (kinds, dwell, wait seconds, required time)", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    const { doc, errors } = build(form);
    expect(errors).toEqual([]);
    expect(doc.sequences).toEqual(withSequences.sequences);
    expect(form.sequences[0].requiredMode).toBe("time");
    expect(form.sequences[0].required).toBe("7.2");
    // 3600 / 7.2 s = 500 parts per hour, shown the other way round
    expect(form.sequences[0].rate).toBe("500");
    expect(form.sequences[1].requiredMode).toBe("none");
  });

  it("a set without sequences saves without the field (not an empty list)", () => {
    const { sequences: _, ...plain } = withSequences;
    const { doc } = build(reqFormFromDoc(requirementSetSchema.parse(plain)));
    expect("sequences" in doc).toBe(false);
  });

  it("a required rate is saved as 3600 / rate seconds, and switching back shows that time", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    let q = switchRequiredMode(form.sequences[0], "rate");
    expect(q.rate).toBe("500");
    q = { ...q, rate: "240" };
    const { doc, errors } = build({ ...form, sequences: [q, form.sequences[1]] });
    expect(errors).toEqual([]);
    expect(doc.sequences![0].required).toBe(15); // 3600 / 240 parts per hour
    expect(switchRequiredMode(q, "time").required).toBe("15");
    // 3600 / 7 = 514.285714…: the converted text is cut to 6 significant digits
    expect(switchRequiredMode({ ...q, requiredMode: "time", required: "7" }, "rate").rate).toBe("514.286");
  });

  it("no requirement saves no required field", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    const q = switchRequiredMode(form.sequences[0], "none");
    expect(build({ ...form, sequences: [q] }).doc.sequences![0]).not.toHaveProperty("required");
  });

  it("adds, reorders and removes steps as rows; new steps name the first target or path", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    const s = newSequence(3, form);
    expect(s.steps).toHaveLength(1);
    expect(s.steps[0]).toMatchObject({ kind: "move", target: "pick" });
    expect(newStep("path", form).path).toBe("seam");
    expect(newStep("wait", form).seconds).toBe("1");
    const steps = [...s.steps, { ...newStep("wait", form), seconds: "2" }].reverse();
    const { doc, errors } = build({ ...form, sequences: [...form.sequences, { ...s, steps }] });
    expect(errors).toEqual([]);
    expect(doc.sequences![2]).toEqual({ name: "Sequence 3", steps: [{ kind: "wait", seconds: 2 }, { kind: "move", target: "pick" }] });
  });

  it("field-level errors: the step's target, a negative wait, an empty sequence, a duplicate name (from the schema)", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    const [a, b] = form.sequences;
    const bad: ReqForm = {
      ...form,
      sequences: [
        { ...a, steps: [{ ...a.steps[0], target: "drop" }, { ...a.steps[1] }, { ...a.steps[2], seconds: "-1" }, { ...a.steps[3] }] },
        { ...b, name: "loop", steps: [] },
      ],
    };
    expect(errAt(bad, "sequences.0.steps.0.target")[0]).toMatch(/moves to target "drop", but the set has no target of that name/);
    expect(errAt(bad, "sequences.0.steps.2.seconds")).toHaveLength(1);
    expect(errAt(bad, "sequences.1.steps")[0]).toMatch(/at least 1 step/);
    expect(errAt(bad, "sequences.1.name")[0]).toMatch(/used twice/);
    // a rate below 1 part per day gives the schema's bound on the time, at the same field
    const slow: ReqForm = { ...form, sequences: [{ ...a, requiredMode: "rate", rate: "0.01" }] };
    expect(errAt(slow, "sequences.0.required")[0]).toMatch(/86 400 s/);
  });

  it("field-level errors of the form itself: a dwell that is not a number, a zero rate, an empty required time", () => {
    const form = reqFormFromDoc(requirementSetSchema.parse(withSequences));
    const [a] = form.sequences;
    const bad: ReqForm = {
      ...form,
      sequences: [
        { ...a, steps: [{ ...a.steps[0], dwell: "abc" }, ...a.steps.slice(1)] },
        { ...newSequence(2, form), requiredMode: "rate", rate: "0" },
        { ...newSequence(3, form), requiredMode: "time", required: "" },
      ],
    };
    expect(errAt(bad, "sequences.0.steps.0.dwell")).toEqual(["sequence 1 (loop) step 1 dwell 'abc' is not a number"]);
    expect(errAt(bad, "sequences.1.required")).toEqual(["sequence 2 (Sequence 2) required rate 0 parts per hour must be > 0"]);
    expect(errAt(bad, "sequences.2.required")).toEqual(["sequence 3 (Sequence 3) required cycle time is required"]);
  });
});

describe("joint acceleration limit in the arm form", () => {
  const arm = loadSeedArms().find((a) => a.convention === "dh")!;

  it("shows °/s² and mm/s² and saves rad/s² and m/s²; an untouched value goes back exactly", () => {
    const doc = { ...arm, joints: arm.joints.map((j, i) => (i === 0 ? { ...j, maxAcceleration: 3.3 } : j)) };
    const form = armFormFromDoc(doc as never);
    // 3.3 rad/s² = 189.0760… °/s²
    expect(Number(form.joints[0].maxAcceleration)).toBeCloseTo((3.3 * 180) / Math.PI, 3);
    expect(form.joints[1].maxAcceleration).toBe("");
    expect(armFormToDoc(form).doc.joints[0].maxAcceleration).toBe(3.3);
    const typed = { ...form, joints: form.joints.map((r, i) => (i === 1 ? { ...r, maxAcceleration: "180" } : r)) };
    const out = validateArmForm(typed);
    expect(out.errors).toEqual([]);
    expect(out.doc.joints[1].maxAcceleration).toBeCloseTo(Math.PI, 12);
    expect(out.doc.joints[2]).not.toHaveProperty("maxAcceleration");
  });

  it("a prismatic joint's acceleration is entered in mm/s² (2500 mm/s² = 2.5 m/s²)", () => {
    const form = armFormFromDoc(arm as never);
    const rows = form.joints.map((r, i) => (i === 0 ? { ...r, type: "prismatic" as const, min: "0", max: "400", maxAcceleration: "2500" } : r));
    expect(armFormToDoc({ ...form, joints: rows }).doc.joints[0].maxAcceleration).toBeCloseTo(2.5, 12);
  });

  it("refuses zero and too large values at the joint's field", () => {
    const form = armFormFromDoc(arm as never);
    const rows = form.joints.map((r, i) => (i === 0 ? { ...r, maxAcceleration: "0" } : i === 1 ? { ...r, maxAcceleration: "1e9" } : r));
    const errs = validateArmForm({ ...form, joints: rows }).errors;
    expect(errs.find((e) => e.path === "joints.0.maxAcceleration")?.message).toMatch(/> 0|greater than 0|positive/);
    expect(errs.find((e) => e.path === "joints.1.maxAcceleration")?.message).toMatch(/10 000/);
  });
});
