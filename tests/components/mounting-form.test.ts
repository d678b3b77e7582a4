import { describe, expect, it } from "vitest";
import { reqFormFromDoc, validateReqForm } from "@/components/requirements/reqForm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const doc = requirementSetSchema.parse({
  name: "mount form", base: I, tool: { tcp: I, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [{ name: "t1", position: [0.5, 0, 0.2], rpy: [0, 0, 0], mode: "point", priority: "must" }], paths: [], specs: [],
  mounting: { region: { x: [-0.5, 0.2], y: [-0.4, 0.4], yaw: [-Math.PI, Math.PI] }, heights: [0.8, 0.9], orientation: [1, 0, 0, 0, 0, -1, 0, 0, 0, 0, -1, 0, 0, 0, 0, 1] },
});

// Field contract: docs/formats.md#mounting; the editor shows mm and degrees.
describe("requirement-set editor: the mounting region", () => {
  it("shows the region in mm and degrees with its preset, and saves it back unchanged (the target's priority too)", () => {
    const form = reqFormFromDoc(doc);
    expect(form.mounting).toMatchObject({ on: true, x: ["-500", "200"], y: ["-400", "400"], yaw: ["-180", "180"], heights: "800, 900", preset: "ceiling" });
    const back = validateReqForm(form);
    expect(back.errors).toEqual([]);
    expect(back.doc.mounting).toEqual(doc.mounting);
    expect(back.doc.targets[0].priority).toBe("must");
  });

  it("names the field of a range given the wrong way round, and drops the region when switched off", () => {
    const form = reqFormFromDoc(doc);
    const bad = validateReqForm({ ...form, mounting: { ...form.mounting, x: ["300", "100"] } });
    expect(bad.errors).toEqual([{ path: "mounting.region.x", message: "lo (300.0 mm) is above hi (100.0 mm)" }]);
    const typo = validateReqForm({ ...form, mounting: { ...form.mounting, heights: "800, abc" } });
    expect(typo.errors.map((e) => e.path)).toEqual(["mounting.heights.1"]);
    const off = validateReqForm({ ...form, mounting: { ...form.mounting, on: false } });
    expect(off.errors).toEqual([]);
    expect("mounting" in off.doc).toBe(false);
  });
});
