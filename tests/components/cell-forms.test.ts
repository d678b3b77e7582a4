// The cell and collision fields in the files and the editors: schema checks with field-level
// messages, the earlier obstacle form converted, and exact round trips through the forms.
import { describe, expect, it } from "vitest";
import { armSchema, requirementNotices, requirementSetSchema, toFieldErrors, type RequirementSetInput } from "@/shared/schemas";
import { armFormFromDoc, armFormToDoc, validateArmForm } from "@/components/arm/armForm";
import { reqFormFromDoc, reqFormToDoc, validateReqForm } from "@/components/requirements/reqForm";
import { shapeRowFromDoc, shapeRowToDoc } from "@/components/requirements/shapes";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const base: RequirementSetInput = {
  name: "cell test", base: I, tool: { tcp: I, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [{ name: "t1", position: [0.4, 0, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" }], paths: [], specs: [],
};
const errorsOf = (input: unknown) => {
  const r = requirementSetSchema.safeParse(input);
  return r.success ? [] : toFieldErrors(r.error);
};

describe("requirement-set cell fields", () => {
  it("accepts every obstacle shape, tool and payload shapes and contact lists; the clearance defaults to 10 mm", () => {
    const doc = requirementSetSchema.parse({
      ...base,
      tool: { ...base.tool, collision: [{ from: [0, 0, 0], to: [0, 0, 0.1], radius: 0.03 }, { shape: "box", name: "jaw", pose: I, size: [0.05, 0.02, 0.04] }] },
      payload: { ...base.payload, collision: [{ shape: "capsule", from: [0, 0, 0], to: [0, 0, 0.05], radius: 0.02 }] },
      cell: {
        obstacles: [
          { name: "bench top", shape: "box", pose: [1, 0, 0, 0.5, 0, 1, 0, 0, 0, 0, 1, -0.02, 0, 0, 0, 1], size: [1.2, 0.8, 0.04] },
          { name: "ball", shape: "sphere", center: [0, 0.5, 0.3], radius: 0.05 },
          { name: "post", shape: "cylinder", pose: I, radius: 0.04, length: 0.8 },
          { name: "rail", shape: "capsule", from: [0, 0, 0], to: [1, 0, 0], radius: 0.02 },
        ],
      },
      targets: [{ ...base.targets[0], contact: ["bench top"] }],
    });
    expect(doc.cell.clearance).toBe(0.01);
    expect(doc.cell.obstacles.map((o) => o.shape)).toEqual(["box", "sphere", "cylinder", "capsule"]);
    expect(doc.tool.collision![0].shape).toBe("capsule");
    expect(doc.targets[0].contact).toEqual(["bench top"]);
  });

  it("gives a field-level error for each bad value", () => {
    const errs = errorsOf({
      ...base,
      cell: {
        clearance: -0.001,
        obstacles: [
          { name: "a", shape: "sphere", center: [0, 0, 0], radius: -0.1 },
          { name: "b", shape: "box", pose: I, size: [0.1, 0, 0.1] },
          { name: "a", shape: "capsule", from: [0, Number.NaN, 0], to: [0, 0, 1], radius: 0.1 },
          { name: "c", shape: "cone", pose: I },
        ],
      },
      targets: [{ ...base.targets[0], contact: ["a", "nowhere", "a"] }],
    });
    const at = (path: string) => errs.filter((e) => e.path === path).map((e) => e.message);
    expect(at("cell.clearance")[0]).toMatch(/≥ 0/);
    expect(at("cell.obstacles.0.radius")[0]).toMatch(/> 0/);
    expect(at("cell.obstacles.1.size.1")[0]).toMatch(/> 0/);
    expect(at("cell.obstacles.2.from.1")[0]).toMatch(/number/);
    expect(at("cell.obstacles.3.shape")[0] ?? at("cell.obstacles.3")[0]).toMatch(/box, sphere, cylinder or capsule/);
    // the duplicate name and the unknown and repeated contact names are refined after the shapes parse
    const named = errorsOf({ ...base, cell: { obstacles: [{ name: "a", shape: "sphere", center: [0, 0, 0], radius: 0.1 }, { name: "a", shape: "sphere", center: [1, 0, 0], radius: 0.1 }] }, targets: [{ ...base.targets[0], contact: ["a", "nowhere", "a"] }] });
    const nat = (path: string) => named.filter((e) => e.path === path).map((e) => e.message);
    expect(nat("cell.obstacles.1.name")[0]).toBe('obstacle name "a" is used twice (rows 1 and 2)');
    expect(nat("targets.0.contact.1")[0]).toBe('target "t1" contact names obstacle "nowhere", but the cell has no obstacle of that name');
    expect(nat("targets.0.contact.2")[0]).toBe('target "t1" contact names obstacle "a" twice');
  });

  it("reads the earlier top-level obstacles (axis-aligned boxes, spheres) into cell.obstacles, with a notice", () => {
    const raw = { ...base, obstacles: [{ shape: "box", name: "feeder", center: [0.3, -0.35, 0.82], size: [0.12, 0.12, 0.04] }, { shape: "sphere", center: [0, 0, 1], radius: 0.1 }] };
    const doc = requirementSetSchema.parse(raw);
    expect("obstacles" in doc).toBe(false);
    expect(doc.cell.obstacles).toEqual([
      { name: "feeder", shape: "box", pose: [1, 0, 0, 0.3, 0, 1, 0, -0.35, 0, 0, 1, 0.82, 0, 0, 0, 1], size: [0.12, 0.12, 0.04] },
      { name: "obstacle 2", shape: "sphere", center: [0, 0, 1], radius: 0.1 },
    ]);
    expect(requirementNotices(raw)[0]).toMatch(/2 obstacles in the earlier form .* converted/);
    expect(requirementNotices(doc)).toEqual([]);
    // a target may name a converted obstacle
    expect(errorsOf({ ...raw, targets: [{ ...base.targets[0], contact: ["feeder"] }] })).toEqual([]);
  });
});

describe("arm collision fields", () => {
  const arm = loadSeedArms()[0];
  it("accepts capsules per link and on the base and ignored pairs; checks link numbers", () => {
    const ok = armSchema.safeParse({ ...arm, baseCollision: [{ from: [0, 0, 0], to: [0, 0, 0.1], radius: 0.08 }], ignoredPairs: [[0, 2]], joints: arm.joints.map((j, i) => (i === 1 ? { ...j, collision: [{ from: [-0.2, 0, 0], to: [0, 0, 0], radius: 0.05 }] } : j)) });
    expect(ok.success).toBe(true);
    const bad = armSchema.safeParse({ ...arm, ignoredPairs: [[1, 9], [3, 3]], joints: arm.joints.map((j, i) => (i === 0 ? { ...j, collision: [{ from: [0, 0, 0], to: [0, 0, 0.1], radius: 0 }] } : j)) });
    expect(bad.success).toBe(false);
    const errs = toFieldErrors(bad.error!);
    const at = (p: string) => errs.find((e) => e.path === p)?.message;
    expect(at("joints.0.collision.0.radius")).toMatch(/> 0/);
    expect(at("ignoredPairs.0.1")).toBe(`ignored pair 1 names link 9, but the arm has links 0 (base) to ${arm.joints.length}`);
    expect(at("ignoredPairs.1.1")).toBe("ignored pair 2 names link 3 twice");
  });
});

describe("editor round trips keep every value exactly", () => {
  it("every demo arm and requirement set goes through its form and back unchanged", () => {
    for (const arm of loadSeedArms()) {
      const { doc, errors } = armFormToDoc(armFormFromDoc(arm));
      expect(errors).toEqual([]);
      expect(doc).toEqual(arm);
    }
    for (const req of loadSeedRequirementSets()) {
      const { doc, errors } = validateReqForm(reqFormFromDoc(req));
      expect(errors).toEqual([]);
      expect(requirementSetSchema.parse(doc)).toEqual(req);
    }
  });

  it("shape rows: a loaded capsule comes back as loaded; an edited one is rebuilt from centre, angles and length", () => {
    const capsule = { name: "rail", shape: "capsule" as const, from: [0.1, 0.2, 0.3] as [number, number, number], to: [0.4, -0.2, 0.7] as [number, number, number], radius: 0.025 };
    const row = shapeRowFromDoc(capsule);
    expect(shapeRowToDoc(row, "cell.obstacles.0", "obstacle 1", [], { named: true })).toBe(capsule);
    // centre (250, 0, 500) mm, length |(0.3, −0.4, 0.4)| = 640.3 mm: editing the radius rebuilds the ends
    const rebuilt = shapeRowToDoc({ ...row, s1: "30" }, "cell.obstacles.0", "obstacle 1", [], { named: true }) as typeof capsule;
    rebuilt.from.forEach((v, i) => expect(v).toBeCloseTo(capsule.from[i], 8));
    rebuilt.to.forEach((v, i) => expect(v).toBeCloseTo(capsule.to[i], 8));
    expect(rebuilt.radius).toBeCloseTo(0.03, 12);
  });

  it("the forms report bad shape and capsule entries at the cells they belong to", () => {
    const req = requirementSetSchema.parse({ ...base, cell: { obstacles: [{ name: "box", shape: "box", pose: I, size: [0.1, 0.1, 0.1] }] } });
    const form = reqFormFromDoc(req);
    form.obstacles[0] = { ...form.obstacles[0], s2: "abc", x: "" };
    form.targets[0] = { ...form.targets[0], contact: "box, ghost" };
    const r = reqFormToDoc(form);
    expect(r.errors.map((e) => e.path).sort()).toEqual(["cell.obstacles.0.size.1", "cell.obstacles.0.x"]);
    form.obstacles[0] = { ...form.obstacles[0], s2: "0", x: "10" };
    expect(validateReqForm(form).errors.map((e) => e.path).sort()).toEqual(["cell.obstacles.0.size.1", "targets.0.contact.1"]);

    const arm = armFormFromDoc(loadSeedArms()[0]);
    arm.capsules = [{ key: "k1", link: "2", fx: "0", fy: "x", fz: "0", tx: "0", ty: "0", tz: "100", r: "-5" }];
    arm.ignoredPairs = "1-3, two";
    const a = validateArmForm(arm);
    expect(a.errors.map((e) => e.path)).toEqual(["collision.0.fy", "ignoredPairs"]);
    arm.capsules[0].fy = "0";
    arm.ignoredPairs = "1-3";
    expect(validateArmForm(arm).errors.map((e) => e.path)).toEqual(["joints.1.collision.0.radius"]);
  });
});
