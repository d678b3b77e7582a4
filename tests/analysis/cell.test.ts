// The cell in the analysis: bodies, pairs, clearance, contact lists, derived capsules, the motion
// bound and the conservative check between samples. Expected values are elementary geometry of
// planar arms, worked beside each check.
import { describe, expect, it } from "vitest";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";
import { createArmContext, type ArmContext } from "@/lib/analysis/context";
import { checkCell, checkMotion, contactMask, createCellCheck, pairNames, placeCell } from "@/lib/analysis/cell";
import { createRng, randomConfiguration } from "@/lib/kinematics";
import { linkGeometry } from "@/lib/geometry/arm";
import { CAPSULE_6R_JOINTS } from "../helpers/arms";

const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const DEG = Math.PI / 180;

/** A planar arm (all joints about z, links along x) with capsules of radius r on each link. */
function planar(lengths: number[], r = 0.05, extra: Partial<ArmDocument> = {}): ArmDocument {
  return armSchema.parse({
    name: "Planar test arm", convention: "dh",
    joints: lengths.map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -Math.PI, max: Math.PI, collision: [{ from: [-a, 0, 0], to: [0, 0, 0], radius: r }] })),
    ...extra,
  });
}

function cellReq(obstacles: unknown[], extra: Record<string, unknown> = {}): RequirementSet {
  return requirementSetSchema.parse({
    name: "Cell test", base: I, tool: { tcp: I, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
    targets: [], paths: [], specs: [], cell: { obstacles, clearance: 0.01 }, ...extra,
  });
}

const check = (ctx: ArmContext, q: number[], exempt: Uint8Array | null = null) => checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, exempt, createCellCheck());

describe("bodies, pairs and the clearance", () => {
  it("a two-link arm beside a sphere: the clearance is the capsule–sphere gap, from the nearest link", () => {
    // q = 0: link 1 from (0,0,0) to (0.5,0,0), link 2 from (0.5,0,0) to (0.9,0,0), radius 0.05.
    // Sphere at (0.7, 0.3, 0), radius 0.1: link 2 is 0.3 − 0.05 − 0.1 = 0.15 away;
    // link 1's end (0.5, 0, 0) is hypot(0.2, 0.3) − 0.15 = 0.2106 away.
    const ctx = createArmContext(planar([0.5, 0.4]), cellReq([{ name: "ball", shape: "sphere", center: [0.7, 0.3, 0], radius: 0.1 }]));
    const c = check(ctx, [0, 0]);
    expect(c.collisionFree).toBe(true);
    expect(c.clearance).toBeCloseTo(0.15, 12);
    expect(pairNames(ctx.cell, c.clearancePair)).toEqual(["link 2", "ball"]);
    const link1 = ctx.cell.pairs.findIndex((p) => p.a === 1 && p.b === -1);
    expect(ctx.cellData.pairExact[link1] === 0 || Math.abs(ctx.cellData.pairDistance[link1] - (Math.hypot(0.2, 0.3) - 0.15)) < 1e-12).toBe(true);
    // turning joint 2 by +90° points link 2 along +y: from (0.5,0,0) to (0.5,0.4,0); the sphere centre
    // is 0.2 from that segment: 0.2 − 0.15 = 0.05
    expect(check(ctx, [0, 90 * DEG]).clearance).toBeCloseTo(0.05, 12);
    // and into the sphere at 60°: overlapping
    const hit = check(ctx, [0, 37 * DEG]);
    expect(hit.collisionFree).toBe(false);
    expect(pairNames(ctx.cell, hit.collisionPair)).toEqual(["link 2", "ball"]);
    expect(hit.collisionDepth).toBeGreaterThan(0);
  });

  it("self-collision: links two apart are checked, neighbours are not, ignored pairs are left out", () => {
    const arm = planar([0.5, 0.4, 0.45]);
    const ctx = createArmContext(arm, cellReq([]));
    const names = ctx.cell.pairs.map((p, i) => pairNames(ctx.cell, i).join("–"));
    expect(names).toEqual(["link 1–link 3"]);
    // folded back: joint 2 at 180° lays link 2 over link 1, joint 3 at 180° lays link 3 back over link 2,
    // i.e. along link 1: link 3 runs from (0.1,0,0) to (0.55,0,0), crossing link 1
    const c = check(ctx, [0, 179.9 * DEG, -179.9 * DEG]);
    expect(c.collisionFree).toBe(false);
    expect(pairNames(ctx.cell, c.collisionPair)).toEqual(["link 1", "link 3"]);
    const ignored = createArmContext({ ...arm, ignoredPairs: [[1, 3]] }, cellReq([]));
    expect(ignored.cell.pairs).toHaveLength(0);
    expect(ignored.cell.skipped).toEqual([{ a: "link 1", b: "link 3", why: "ignored" }]);
  });

  it("contact lists lift the tool's and the payload's pairs with the named obstacle, never the links'", () => {
    // tool capsule along the tool point's x, 0.1 long; a box right at the tool tip
    const req = cellReq([{ name: "fixture", shape: "box", pose: [1, 0, 0, 0.95, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], size: [0.1, 0.1, 0.1] }], {
      tool: { tcp: I, mass: 0, cog: [0, 0, 0], collision: [{ from: [0, 0, 0], to: [0.05, 0, 0], radius: 0.02 }] },
    });
    const ctx = createArmContext(planar([0.5, 0.4]), req);
    const c = check(ctx, [0, 0]);
    // tool tip at x = 0.95 + 0.02 = 0.97 > 0.9: the tool overlaps the box
    expect(c.collisionFree).toBe(false);
    expect(pairNames(ctx.cell, c.collisionPair)).toEqual(["tool", "fixture"]);
    const lifted = check(ctx, [0, 0], contactMask(ctx.cell, ["fixture"]));
    const tool = ctx.cell.pairs.findIndex((p) => p.a === ctx.cell.n + 1 && p.b === -1);
    expect(ctx.cellData.pairDistance[tool]).toBe(Infinity); // not checked
    // link 2's capsule ends at 0.9 + 0.05 = 0.95, into the box face at x = 0.9: the link still collides
    expect(lifted.collisionFree).toBe(false);
    expect(pairNames(ctx.cell, lifted.collisionPair)).toEqual(["link 2", "fixture"]);
    expect(lifted.collisionDepth).toBeCloseTo(0.05, 9);
    // turned away (joint 1 at 90°) everything is clear of the box
    expect(check(ctx, [90 * DEG, 0], contactMask(ctx.cell, ["fixture"])).collisionFree).toBe(true);
  });

  it("the base against an obstacle counts for collisions but not for the clearance", () => {
    const arm = planar([0.5, 0.4], 0.05, { baseCollision: [{ from: [0, 0, -0.2], to: [0, 0, -0.06], radius: 0.08 }] });
    // a bench top 2 mm below the base capsule's bottom (z = −0.34 … −0.28 vs capsule bottom −0.28)
    const req = cellReq([{ name: "bench", shape: "box", pose: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, -0.312, 0, 0, 0, 1], size: [1, 1, 0.06] }]);
    const ctx = createArmContext(arm, req);
    const c = check(ctx, [0, 0]);
    expect(c.collisionFree).toBe(true);
    expect(c.clearancePair === -1 || ctx.cell.pairs[c.clearancePair].a !== 0).toBe(true);
  });
});

describe("capsules derived from the kinematic table", () => {
  // An invented spherical-wrist six-axis arm in standard DH with a collision radius on every joint.
  const six = armSchema.parse({
    name: "Derived six", convention: "dh",
    joints: CAPSULE_6R_JOINTS,
  });
  it("link k runs along joint k's axis by d, then along x_k by a (standard DH): the table's own geometry", () => {
    const g = linkGeometry(six);
    // link 1 in its frame: O₀ = (−a, −d·sin α, −d·cos α) = (−0.1, 0.4, 0) → (−0.1, 0, 0) → (0, 0, 0)
    expect(g[0].capsules).toEqual([{ from: [-0.1, 0.4, 0], to: [-0.1, 0, 0], radius: 0.07 }, { from: [-0.1, 0, 0], to: [0, 0, 0], radius: 0.07 }]);
    // link 5 has a = d = 0: a sphere of its radius at the wrist centre
    expect(g[4].capsules).toEqual([{ from: [0, 0, 0], to: [0, 0, 0], radius: 0.04 }]);
    expect(g.every((l) => l.source === "derived")).toBe(true);
  });
  it("pairs joined through links shorter than their radii are set aside: the wrist links share the wrist centre", () => {
    const ctx = createArmContext(six, cellReq([]));
    // link 4 ends at the wrist centre where link 6 starts (link 5 between has length 0 < 0.045 + 0.035);
    // links 2 and 4 are joined by link 3 (0.05 long) < 0.06 + 0.045; links 3 and 5 by link 4 (0.42 long): checked
    expect(ctx.cell.skipped.map((s) => `${s.a}–${s.b}`).sort()).toEqual(["link 2–link 4", "link 4–link 6"]);
    // the derived capsules are checked: the arm folded onto itself collides
    const q = [0, 0, 0, 0, 0, 0];
    expect(check(ctx, q).collisionFree).toBe(true);
  });
});

describe("motion between configurations", () => {
  it("no point of any body moves farther than the per-joint bound Σ R_{j,b}·|Δq_j| (random motions of an arm with a tool)", () => {
    const req = cellReq([], { tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 0, cog: [0, 0, 0], collision: [{ shape: "box", pose: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.05, 0, 0, 0, 1], size: [0.08, 0.04, 0.1] }] } });
    const ctx = createArmContext(armSchema.parse({ ...(planar([0.3, 0.25, 0.2]) as object), joints: planar([0.3, 0.25, 0.2]).joints.map((j, i) => ({ ...j, alpha: [0.7, -1.1, 0.4][i], d: [0.2, 0.05, 0.1][i] })) }), req);
    const { cell, cellData: cd, model, data } = ctx;
    const rng = createRng(3);
    const q0 = new Float64Array(3), q1 = new Float64Array(3), q = new Float64Array(3);
    const count = cell.shapeBody.length;
    for (let trial = 0; trial < 200; trial++) {
      randomConfiguration(model, rng, q0);
      randomConfiguration(model, rng, q1);
      placeCell(cell, cd, model, data, q0);
      const start = Float64Array.from(cd.world);
      for (let step = 1; step <= 8; step++) {
        const t = step / 8;
        for (let j = 0; j < 3; j++) q[j] = q0[j] + t * (q1[j] - q0[j]);
        placeCell(cell, cd, model, data, q);
        for (let i = 0; i < count; i++) {
          const b = cell.shapeBody[i];
          let bound = 0;
          for (let j = 0; j < 3; j++) bound += cell.motion[b * 3 + j] * Math.abs(q[j] - q0[j]);
          // the ends of capsules and the centres of boxes are points of the body
          for (const off of [2, 5]) {
            const d = Math.hypot(cd.world[24 * i + off] - start[24 * i + off], cd.world[24 * i + off + 1] - start[24 * i + off + 1], cd.world[24 * i + off + 2] - start[24 * i + off + 2]);
            expect(d).toBeLessThanOrEqual(bound + 1e-12);
          }
        }
      }
    }
  });

  it("a thin plate between two samples: the samples are both clear, the check between them finds the collision", () => {
    // Link 2 (0.4 long, radius 0.01) sweeps from −20° to +20° about joint 2 at (0.5, 0, 0); a plate 2 mm
    // thick stands across its way at y = 0, from x = 0.7 to 0.8 (its edge 0.2 m out along the link).
    const ctx = createArmContext(planar([0.5, 0.4], 0.01), cellReq([{ name: "plate", shape: "box", pose: [1, 0, 0, 0.75, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], size: [0.1, 0.002, 0.2] }]));
    const { cell, cellData: cd, model, data } = ctx;
    const qa = [0, -20 * DEG], qb = [0, 20 * DEG];
    const a = check(ctx, qa);
    const dA = Float64Array.from(cd.pairDistance), exA = Uint8Array.from(cd.pairExact);
    const b = check(ctx, qb);
    const dB = Float64Array.from(cd.pairDistance), exB = Uint8Array.from(cd.pairExact);
    // a check at the samples alone says free: sin 20° · 0.2 = 68 mm of clearance on either side
    expect(a.collisionFree && b.collisionFree).toBe(true);
    expect(a.clearance).toBeGreaterThan(0.05);
    const m = checkMotion(cell, cd, model, data, qa, qb, dA, exA, dB, exB, null, 0.01);
    expect(m.collision).not.toBeNull();
    expect(pairNames(cell, m.collision!.pair)).toEqual(["link 2", "plate"]);
    expect(m.collision!.fraction).toBeGreaterThan(0.3);
    expect(m.collision!.fraction).toBeLessThan(0.7);
    expect(m.clear).toBe(false);
  });

  it("a motion that stays clear is proven clear without evaluating configurations when the bound allows", () => {
    const ctx = createArmContext(planar([0.5, 0.4], 0.01), cellReq([{ name: "far", shape: "sphere", center: [0, 2, 0], radius: 0.1 }]));
    const { cell, cellData: cd, model, data } = ctx;
    const qa = [0, 0], qb = [5 * DEG, 5 * DEG];
    check(ctx, qa);
    const dA = Float64Array.from(cd.pairDistance), exA = Uint8Array.from(cd.pairExact);
    check(ctx, qb);
    const m = checkMotion(cell, cd, model, data, qa, qb, dA, exA, Float64Array.from(cd.pairDistance), Uint8Array.from(cd.pairExact), null, 0.01);
    expect(m.clear).toBe(true);
    expect(m.evaluations).toBe(0);
  });
});
