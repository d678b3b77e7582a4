import { describe, expect, it } from "vitest";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { CELL_MARGIN, MOUNT_PRESETS, mountingAllowed, mountingClass, mountTilt, placementPose } from "@/shared/schemas/mounting";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const base = {
  name: "placement cell", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [{ name: "pick", position: [0.5, 0, 0.2], rpy: [0, 0, 0], mode: "point" }, { name: "place", position: [1.5, 0.5, 0.2], rpy: [0, 0, 0], mode: "point" }],
  paths: [], specs: [],
};
const region = { x: [-0.5, 0.5], y: [-0.5, 0.5], z: [0, 0.4], yaw: [-Math.PI / 2, Math.PI / 2] };
const issues = (mounting: unknown) => {
  const r = requirementSetSchema.safeParse({ ...base, mounting });
  return r.success ? [] : r.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
};

// Field contract: docs/formats.md#mounting.
describe("requirement-set mounting region", () => {
  it("accepts a region with a floor orientation, and a set without one is unchanged", () => {
    const rs = requirementSetSchema.parse({ ...base, mounting: { region, orientation: I4 } });
    expect(rs.mounting!.region.x).toEqual([-0.5, 0.5]);
    expect("mounting" in requirementSetSchema.parse(base)).toBe(false);
  });

  it("names the field when lo is above hi, and when the yaw range is over one turn", () => {
    expect(issues({ region: { ...region, y: [0.3, 0.1] }, orientation: I4 })).toEqual([{ path: "mounting.region.y", message: "lo (300.0 mm) is above hi (100.0 mm)" }]);
    expect(issues({ region: { ...region, yaw: [0, 2 * Math.PI + 0.01] }, orientation: I4 })).toEqual([{ path: "mounting.region.yaw", message: "spans 360.6°, more than one full turn (360°)" }]);
    // exactly one turn is allowed
    expect(issues({ region: { ...region, yaw: [-Math.PI, Math.PI] }, orientation: I4 })).toEqual([]);
  });

  it("refuses a region outside the cell: the extent of what the set holds, grown by the margin", () => {
    // targets reach x = 1.5 m, the base sits at 0: the cell spans x −5 … 6.5 m with the 5 m margin.
    expect(CELL_MARGIN).toBe(5);
    const got = issues({ region: { ...region, x: [6, 7] }, orientation: I4 });
    expect(got).toHaveLength(1);
    expect(got[0].path).toBe("mounting.region.x");
    expect(got[0].message).toContain("lies outside the cell, which spans x -5000 mm … 6500 mm");
    expect(issues({ region: { ...region, x: [6, 6.5] }, orientation: I4 })).toEqual([]);
  });

  it("takes pedestal heights instead of a z range, each within z when both are given", () => {
    const { z: _z, ...flat } = region;
    void _z;
    expect(issues({ region: flat, heights: [0.2, 0.6], orientation: I4 })).toEqual([]);
    expect(issues({ region: flat, orientation: I4 })).toEqual([{ path: "mounting.region.z", message: "give a z range or a list of pedestal heights" }]);
    expect(issues({ region, heights: [0.2, 0.6], orientation: I4 })[0]).toEqual({ path: "mounting.heights.1", message: "height 600.0 mm lies outside region.z (0.0 … 400.0 mm)" });
  });

  it("takes the orientation as a rotation only", () => {
    const moved = [...I4];
    moved[3] = 0.1;
    expect(issues({ region, orientation: moved })[0].path).toBe("mounting.orientation");
  });
});

describe("mount orientation classes and the datasheet's mountings", () => {
  it("classifies the presets by the tilt of the base z axis", () => {
    expect(mountingClass(MOUNT_PRESETS.floor)).toBe("floor");
    expect(mountingClass(MOUNT_PRESETS.ceiling)).toBe("ceiling");
    expect(mountingClass(MOUNT_PRESETS.wall)).toBe("wall");
    // 30° about x: Rx(θ) has R[2][2] = cos θ (closed form)
    const t = Math.PI / 6;
    const tilted = [1, 0, 0, 0, 0, Math.cos(t), -Math.sin(t), 0, 0, Math.sin(t), Math.cos(t), 0, 0, 0, 0, 1];
    expect(mountTilt(tilted)).toBeCloseTo(t, 12);
    expect(mountingClass(tilted)).toBe("angled");
  });

  it("allows a listed class, wall and angled under angled, and says unknown without a list", () => {
    expect(mountingAllowed(["floor"], "floor")).toBe(true);
    expect(mountingAllowed(["floor"], "ceiling")).toBe(false);
    expect(mountingAllowed(["floor", "angled"], "wall")).toBe(true);
    expect(mountingAllowed(["wall"], "angled")).toBe(false);
    expect(mountingAllowed(undefined, "ceiling")).toBeNull();
  });

  it("places the base: orientation first, then the yaw about the cell z, then the position", () => {
    // ceiling mount yawed 90°: base x → cell y, base z → cell −z (Rz(90°)·Rx(180°), closed form)
    const m = placementPose(MOUNT_PRESETS.ceiling, 1, 2, 3, Math.PI / 2);
    const expected = [0, 1, 0, 1, 1, 0, 0, 2, 0, 0, -1, 3, 0, 0, 0, 1];
    m.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 12));
  });
});
