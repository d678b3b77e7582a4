import { describe, expect, it } from "vitest";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const base = {
  name: "cycle cell", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [{ name: "pick", position: [0.5, 0, 0.2], rpy: [0, 0, 0], mode: "point" }, { name: "place", position: [0, 0.5, 0.2], rpy: [0, 0, 0], mode: "point" }],
  paths: [{ name: "seam", mode: "point", step: 0.01, speed: 0.1, waypoints: [{ position: [0.4, 0, 0.2], rpy: [0, 0, 0] }, { position: [0.4, 0.2, 0.2], rpy: [0, 0, 0] }] }],
  specs: [],
};
const issues = (rs: unknown) => {
  const r = requirementSetSchema.safeParse(rs);
  return r.success ? [] : r.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
};

// Field contract: docs/formats.md#sequence.
describe("requirement-set sequences", () => {
  it("accepts move, path and wait steps with a required cycle time", () => {
    const rs = requirementSetSchema.parse({
      ...base,
      sequences: [{ name: "loop", required: 12, steps: [{ kind: "move", target: "pick", dwell: 0.5 }, { kind: "path", path: "seam" }, { kind: "wait", seconds: 1 }, { kind: "move", target: "place" }] }],
    });
    expect(rs.sequences![0].steps.map((s) => s.kind)).toEqual(["move", "path", "wait", "move"]);
    expect(rs.sequences![0].required).toBe(12);
  });

  it("leaves a set without sequences unchanged", () => {
    expect("sequences" in requirementSetSchema.parse(base)).toBe(false);
  });

  it("names the step and the missing target or path", () => {
    const got = issues({ ...base, sequences: [{ name: "loop", steps: [{ kind: "move", target: "pik" }, { kind: "path", path: "weld" }] }] });
    expect(got).toEqual([
      { path: "sequences.0.steps.0.target", message: 'sequence "loop" step 1 moves to target "pik", but the set has no target of that name' },
      { path: "sequences.0.steps.1.path", message: 'sequence "loop" step 2 follows path "weld", but the set has no path of that name' },
    ]);
  });

  it("rejects repeated names, unknown kinds, negative times and empty sequences at their field", () => {
    expect(issues({ ...base, sequences: [{ name: "a", steps: [{ kind: "wait", seconds: 1 }] }, { name: "a", steps: [{ kind: "wait", seconds: 1 }] }] })[0]).toEqual({ path: "sequences.1.name", message: 'sequence name "a" is used twice (sequences 1 and 2)' });
    expect(issues({ ...base, sequences: [{ name: "a", steps: [{ kind: "jump" }] }] })[0].path).toBe("sequences.0.steps.0.kind");
    expect(issues({ ...base, sequences: [{ name: "a", steps: [{ kind: "wait", seconds: -1 }] }] })[0]).toEqual({ path: "sequences.0.steps.0.seconds", message: "must be ≥ 0" });
    expect(issues({ ...base, sequences: [{ name: "a", steps: [{ kind: "move", target: "pick", dwell: -0.1 }] }] })[0].path).toBe("sequences.0.steps.0.dwell");
    expect(issues({ ...base, sequences: [{ name: "a", steps: [] }] })[0]).toEqual({ path: "sequences.0.steps", message: "a sequence needs at least 1 step" });
    expect(issues({ ...base, sequences: [{ name: "a", required: 0, steps: [{ kind: "wait", seconds: 1 }] }] })[0]).toEqual({ path: "sequences.0.required", message: "must be > 0" });
  });
});

describe("arm joint maxAcceleration", () => {
  const arm = (maxAcceleration: unknown) => ({ name: "one joint", convention: "dh", joints: [{ type: "revolute", a: 0.5, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: 2, maxAcceleration }] });
  it("is read in rad/s² and optional", () => {
    expect(armSchema.parse(arm(8)).joints[0].maxAcceleration).toBe(8);
    expect(armSchema.parse(arm(undefined)).joints[0].maxAcceleration).toBeUndefined();
  });
  it("rejects zero, negative and non-numbers at the field", () => {
    for (const bad of [0, -1, "5", Infinity]) {
      const r = armSchema.safeParse(arm(bad));
      expect(r.success).toBe(false);
      expect(r.error!.issues[0].path.join(".")).toBe("joints.0.maxAcceleration");
    }
  });
});
