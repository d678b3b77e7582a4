import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet, type RequirementSetInput } from "@/shared/schemas/requirements";
import { compareGoals, evaluatePlacement, placeShortlist, radicalInverse, searchPlacement, type PlacementResult } from "@/lib/analysis/placement";
import { createArmContext } from "@/lib/analysis/context";
import { allPairDistances, contactMask, pairNames } from "@/lib/analysis/cell";
import { referenceAxisError, referencePositionError, referenceRotationError, referenceToolPose, referenceWithinLimits } from "../helpers/dh-reference";

const root = path.resolve(__dirname, "../..");
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

/** A planar 2R arm in the cell's x–y plane (joint axes along z), link lengths l1, l2; invented. */
function planar2R(l1: number, l2: number, radius?: number): ArmDocument {
  return armSchema.parse({
    name: "planar 2R", convention: "dh",
    joints: [l1, l2].map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -Math.PI, max: Math.PI, ...(radius ? { radius } : {}) })),
  });
}

function set(extra: Partial<RequirementSetInput> & Pick<RequirementSetInput, "targets" | "mounting">): RequirementSet {
  return requirementSetSchema.parse({ name: "placement case", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, paths: [], specs: [], ...extra });
}

const point = (name: string, x: number, y: number, extra: object = {}) => ({ name, position: [x, y, 0] as [number, number, number], rpy: [0, 0, 0] as [number, number, number], mode: "point" as const, ...extra });

/** 4×4 row-major product (written here, not the product's). */
function mul(a: readonly number[], b: readonly number[]): number[] {
  const c = new Array<number>(16).fill(0);
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) for (let k = 0; k < 4; k++) c[4 * i + j] += a[4 * i + k] * b[4 * k + j];
  return c;
}

/** Target pose from position and roll-pitch-yaw, R = Rz(yaw)·Ry(pitch)·Rx(roll) (Craig ch. 2, docs/references.md#craig-introduction-to-robotics). */
function rpyPoseRef(p: readonly number[], [r, pt, y]: readonly number[]): number[] {
  const Rz = [Math.cos(y), -Math.sin(y), 0, 0, Math.sin(y), Math.cos(y), 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  const Ry = [Math.cos(pt), 0, Math.sin(pt), 0, 0, 1, 0, 0, -Math.sin(pt), 0, Math.cos(pt), 0, 0, 0, 0, 1];
  const Rx = [1, 0, 0, 0, 0, Math.cos(r), -Math.sin(r), 0, 0, Math.sin(r), Math.cos(r), 0, 0, 0, 0, 1];
  const m = mul(mul(Rz, Ry), Rx);
  m[3] = p[0]; m[7] = p[1]; m[11] = p[2];
  return m;
}

/**
 * Every target the result marks reached, recomputed: the tool pose by the test's own forward
 * kinematics (tests/helpers/dh-reference.ts) at the returned base and q against the target
 * (1e-5 m; 1e-4 rad in pose mode, and for the axis in axis mode), the joint limits, and every
 * checked pair's exact distance by the distance engine (lib/geometry through the cell's pair list,
 * as the `clearance` command reports them) above 0.
 */
function verifyReached(arm: ArmDocument, req: RequirementSet, r: PlacementResult): number {
  if (arm.convention === "chain") throw new Error("reference forward kinematics covers DH tables only");
  const ref = { convention: arm.convention, joints: arm.joints, base: mul(r.base, arm.base ?? I4), tool: mul(arm.tool ?? I4, req.tool.tcp) };
  const ctx = createArmContext(arm, { ...req, base: r.base });
  let checked = 0;
  r.targets.forEach((t, k) => {
    if (!t.reached) return;
    const target = req.targets[k];
    const goal = rpyPoseRef(target.position, target.rpy);
    const pose = referenceToolPose(ref, t.q);
    expect(referencePositionError(pose, goal), `${t.name} position`).toBeLessThanOrEqual(1e-5);
    if (target.mode === "pose") expect(referenceRotationError(pose, goal), `${t.name} rotation`).toBeLessThanOrEqual(1e-4);
    if (target.mode === "axis") expect(referenceAxisError(pose, goal), `${t.name} axis`).toBeLessThanOrEqual(1e-4);
    expect(referenceWithinLimits(arm.joints, t.q), `${t.name} limits`).toBe(true);
    for (const d of allPairDistances(ctx.cell, ctx.cellData, ctx.model, ctx.data, t.q, contactMask(ctx.cell, target.contact))) {
      expect(d.distance, `${t.name}: ${pairNames(ctx.cell, d.pair).join(" – ")}`).toBeGreaterThan(0);
    }
    checked++;
  });
  return checked;
}

describe("Halton points (docs/references.md#halton-sequence)", () => {
  it("are the radical inverses: 1/2, 1/4, 3/4, 1/8 in base 2 and 1/3, 2/3, 1/9 in base 3", () => {
    expect([1, 2, 3, 4].map((i) => radicalInverse(i, 2))).toEqual([0.5, 0.25, 0.75, 0.125]);
    [1 / 3, 2 / 3, 1 / 9].forEach((v, i) => expect(radicalInverse(i + 1, 3)).toBeCloseTo(v, 15));
  });
});

describe("placement search (docs/design.md#mount-placement)", { timeout: 120_000 }, () => {
  // Constructed: 12 targets on a circle of radius 0.88 m about C; the 2R arm reaches at most
  // l1 + l2 = 0.9 m from its base (Craig ch. 4, the 2R workspace annulus,
  // docs/references.md#craig-introduction-to-robotics), so all 12 are reached only from bases
  // within (0.9 − 0.88)/cos(15°) < 0.021 m of C (the 12 reach discs meet in a 12-gon about C).
  const C = [0.3, -0.2];
  const circle = Array.from({ length: 12 }, (_, k) => point(`c${k + 1}`, C[0] + 0.88 * Math.cos((k * Math.PI) / 6), C[1] + 0.88 * Math.sin((k * Math.PI) / 6)));
  const circleSet = set({ targets: circle, mounting: { region: { x: [0, 0.6], y: [-0.5, 0.1], z: [0, 0], yaw: [0, 0] }, orientation: I4 } });
  const arm2R = planar2R(0.5, 0.4);

  it("finds the centre of a circle of targets, the only place that reaches them all, within 21 mm", () => {
    const r = searchPlacement(arm2R, circleSet);
    expect(r.goal.reached).toBe(12);
    expect(Math.hypot(r.placement.x - C[0], r.placement.y - C[1])).toBeLessThan(0.021);
    expect(r.base[3]).toBe(r.placement.x);
    expect(r.evaluated).toBeGreaterThan(20);
    expect(verifyReached(arm2R, circleSet, r)).toBe(12);
  });

  it("reaches the must targets before any number of others", () => {
    // From x ≤ −0.2 the arm reaches M at (−1.1, 0); from x ≥ 0.2 both W1 and W2 (docs: 0.9 m reach).
    const targets = [point("M", -1.1, 0), point("W1", 1.1, 0), point("W2", 1.1, 0.05)];
    const mounting = { region: { x: [-0.5, 0.5] as [number, number], y: [0, 0] as [number, number], z: [0, 0] as [number, number], yaw: [0, 0] as [number, number] }, orientation: I4 };
    const plain = searchPlacement(arm2R, set({ targets, mounting }));
    expect(plain.targets.map((t) => t.reached)).toEqual([false, true, true]);
    expect(plain.placement.x).toBeGreaterThanOrEqual(0.2);
    const must = searchPlacement(arm2R, set({ targets: [{ ...targets[0], priority: "must" }, targets[1], targets[2]], mounting }));
    expect(must.targets.map((t) => t.reached)).toEqual([true, false, false]);
    expect(must.goal.must).toBe(1);
    expect(must.placement.x).toBeLessThanOrEqual(-0.2);
  });

  it("is at least as good under the lexicographic goal as a dense grid searched by brute force", () => {
    // Small case with a cell: derived link capsules (radius 30 mm), a post in the middle of the
    // region's reach and five scattered targets, a 2-D region.
    const arm = planar2R(0.5, 0.4, 0.03);
    const req = set({
      targets: [point("a", 0.9, 0.3), point("b", 0.4, 0.9), point("c", -0.3, 0.6), point("d", 1.2, -0.2), point("e", 0.2, 1.3)],
      cell: { obstacles: [{ name: "post", shape: "cylinder", pose: [1, 0, 0, 0.45, 0, 1, 0, 0.5, 0, 0, 1, 0, 0, 0, 0, 1], radius: 0.08, length: 0.5 }] },
      mounting: { region: { x: [-0.2, 0.6], y: [-0.2, 0.6], z: [0, 0], yaw: [0, 0] }, orientation: I4 },
    });
    const r = searchPlacement(arm, req);
    let best = null as ReturnType<typeof evaluatePlacement> | null;
    const N = 14;
    for (let i = 0; i <= N; i++) {
      for (let j = 0; j <= N; j++) {
        const e = evaluatePlacement(arm, req, { x: -0.2 + (0.8 * i) / N, y: -0.2 + (0.8 * j) / N, z: 0, yaw: 0 });
        if (!best || compareGoals(e.goal, best.goal) > 0) best = e;
      }
    }
    expect(compareGoals(r.goal, best!.goal)).toBeGreaterThanOrEqual(0);
    expect(r.evaluated).toBeLessThan((N + 1) * (N + 1));
    verifyReached(arm, req, r);
  });

  it("gives an arm the same placement alone and among seven others, in any position", () => {
    const req = seedSetWithRegion();
    const seedArms = ["compact-six-3", "foundry-six-12", "helper-seven-7", "overhead-six-6", "reach-cobot-10", "stacker-five-120", "table-scara-600"]
      .map((f) => ({ id: f, arm: armSchema.parse(JSON.parse(readFileSync(path.join(root, "seed-data/arms", `${f}.json`), "utf8"))) }));
    const subject = { id: "subject", arm: planar2R(0.5, 0.4, 0.03) };
    const alone = placeShortlist([seedArms[0]], req)[0];
    const among = placeShortlist([...seedArms.slice(1, 4), seedArms[0], ...seedArms.slice(4), subject], req);
    expect(JSON.stringify(among[3])).toBe(JSON.stringify(alone));
    const subjectAlone = placeShortlist([subject], req)[0];
    expect(JSON.stringify(among[7])).toBe(JSON.stringify(subjectAlone));
  });

  it("marks reached only what forward kinematics and the distance engine confirm, in a cell of obstacles", () => {
    const req = seedSetWithRegion();
    const arm = armSchema.parse(JSON.parse(readFileSync(path.join(root, "seed-data/arms/compact-six-3.json"), "utf8")));
    const r = searchPlacement(arm, req);
    expect(r.goal.reached).toBeGreaterThan(0);
    expect(verifyReached(arm, req, r)).toBe(r.goal.reached);
  });

  it("does not search an arm whose datasheet does not list the mounting", () => {
    const req = seedSetWithRegion([1, 0, 0, 0, 0, -1, 0, 0, 0, 0, -1, 0, 0, 0, 0, 1]);
    const scara = armSchema.parse(JSON.parse(readFileSync(path.join(root, "seed-data/arms/table-scara-600.json"), "utf8")));
    const [p] = placeShortlist([{ id: "s", arm: scara }], req);
    expect(p.result).toBeNull();
    expect(p.skipped).toBe("a ceiling mount is not among the datasheet's mountings (floor)");
  });
});

/** The demo bench-assembly cell (10 obstacles) with a mounting region around its nominal base. */
function seedSetWithRegion(orientation = I4): RequirementSet {
  const raw = JSON.parse(readFileSync(path.join(root, "seed-data/requirements/bench-assembly.json"), "utf8"));
  const z = orientation[10] < 0 ? [1.6, 1.7] : [0.7, 0.85];
  return requirementSetSchema.parse({ ...raw, mounting: { region: { x: [-0.3, 0.1], y: [-0.2, 0.2], z, yaw: [-Math.PI / 2, Math.PI / 2] }, orientation } });
}

describe("the shortlist analysis with a mounting region (docs/design.md#mount-placement)", { timeout: 120_000 }, () => {
  it("analyses each arm again at its own placement, ranks them there, and keeps the nominal result as it was", async () => {
    const { analyzeShortlist } = await import("@/lib/analysis");
    const { placementTable } = await import("@/lib/export/tables");
    const targets = [point("left", 0, 0.1), point("right", 1.6, 0.1)];
    const mounting = { region: { x: [0, 1] as [number, number], y: [-0.2, 0.2] as [number, number], z: [0, 0] as [number, number], yaw: [0, 0] as [number, number] }, orientation: I4 };
    const withRegion = set({ targets, mounting });
    const withoutRegion = set({ targets, mounting: undefined });
    const arms = [{ id: "short", revision: 1, arm: planar2R(0.5, 0.4) }, { id: "long", revision: 1, arm: planar2R(0.9, 0.8) }];
    const r = analyzeShortlist(arms, withRegion);
    const plain = analyzeShortlist(arms, withoutRegion);
    expect(JSON.stringify(r.arms)).toBe(JSON.stringify(plain.arms));
    expect(plain.placement).toBeUndefined();
    const p = r.placement!;
    // at the nominal base (the origin) the short arm reaches only "left" (0.9 m reach, Craig ch. 4);
    // at its placement, about x = 0.8 m, both; the long arm reaches both from anywhere in between.
    expect(r.arms[0].targets.map((t) => t.reached)).toEqual([true, false]);
    const short = p.arms.find((a) => a.id === "short")!;
    expect(short.analysis!.targets.map((t) => t.reached)).toEqual([true, true]);
    expect(Math.abs(short.placement!.x - 0.8)).toBeLessThan(0.1 + 1e-9);
    // the analysis at the placement is the analysis of the set with that base
    const again = analyzeShortlist([arms[0]], { ...withRegion, base: short.base!, mounting: undefined });
    expect(JSON.stringify(short.analysis)).toBe(JSON.stringify(again.arms[0]));
    expect(p.ranking.map((x) => x.armId).sort()).toEqual(["long", "short"]);
    expect(short.coverage!.reached).toHaveLength(short.coverage!.xs.length * short.coverage!.ys.length);
    expect(Math.max(...short.coverage!.reached)).toBe(2);
    // the export table: one row per arm, the placement in mm
    const t = placementTable(r);
    expect(t.rows).toHaveLength(2);
    const row = t.rows.find((x) => x[0] === "planar 2R" && x[2] === p.ranking.find((k) => k.armId === "short")!.rank)!;
    expect(row[t.columns.indexOf("x (mm)")]).toBeCloseTo(short.placement!.x * 1000, 1);
    expect(row[t.columns.indexOf("Targets reached at its placement")]).toBe(2);
    expect(row[t.columns.indexOf("Targets reached at the nominal base")]).toBe(1);
  });
});
