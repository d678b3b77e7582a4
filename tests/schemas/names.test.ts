// Names shown to others are cleaned of control and format characters (NUL, the bidirectional
// override U+202E, zero-width joiners) like guests' display names, and path names are unique.
import { describe, expect, it } from "vitest";
import { armSchema, requirementSetSchema } from "@/shared/schemas";
import { cleanName } from "@/shared/text";
import { sampleArm, sampleRequirementSet } from "../db/helpers";

const RLO = "\u202E";
const path = (name: string) => ({ name, waypoints: [{ position: [0.4, 0, 0.2], rpy: [0, 0, 0] }, { position: [0.4, 0.1, 0.2], rpy: [0, 0, 0] }], mode: "point", step: 0.01, speed: 0.1 });

describe("names", () => {
  it("cleanName drops NUL, bidirectional overrides and zero-width characters and collapses blanks", () => {
    expect(cleanName(`Arm${RLO}gnp.exe`)).toBe("Armgnp.exe");
    expect(cleanName("a\u0000b\u200Dc\u2066d\u2069")).toBe("abcd");
    expect(cleanName("  two\t\n words  ")).toBe("two words");
    expect(cleanName("\u0000".repeat(10))).toBe("");
  });

  it("arm, maker and model names are cleaned; a name of control characters only is empty and refused", () => {
    const r = armSchema.parse(sampleArm({ name: `Test${RLO} arm\u0000`, maker: `Ex\u200Bample`, modelCode: `TA\u202D-3` }));
    expect([r.name, r.maker, r.modelCode]).toEqual(["Test arm", "Example", "TA-3"]);
    const bad = armSchema.safeParse(sampleArm({ name: `${RLO}\u0000\u200B` }));
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]).toMatchObject({ path: ["name"], message: "must not be empty" });
  });

  it("requirement-set, target and path names are cleaned", () => {
    const r = requirementSetSchema.parse(sampleRequirementSet({
      name: `Cell${RLO} 7`,
      targets: [{ name: `pick${RLO}kcab`, position: [0.4, 0.1, 0.2], rpy: [0, 0, 0], mode: "point" }],
      paths: [path("seam\u0000 one")],
    }));
    expect([r.name, r.targets[0].name, r.paths[0].name]).toEqual(["Cell 7", "pickkcab", "seam one"]);
  });

  it("two paths may not share a name (after cleaning), as targets may not", () => {
    const r = requirementSetSchema.safeParse(sampleRequirementSet({ paths: [path("seam"), path("glue"), path(`se${RLO}am`)] }));
    expect(r.success).toBe(false);
    expect(r.error!.issues).toEqual([expect.objectContaining({ path: ["paths", 2, "name"], message: 'path name "seam" is used twice (paths 1 and 3)' })]);
  });
});
