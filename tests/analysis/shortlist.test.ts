import { describe, expect, it } from "vitest";
import { analyzeShortlist, rankArms, ANALYSIS_VERSION, CAUTION, type ShortlistArm, DEFAULT_BUDGET } from "@/lib/analysis";
import { analysisKey, analysisKeyFor, canonicalJson } from "@/lib/analysis/key";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { armSchema, type ArmDocument, type DhArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";
import { REF } from "./fixtures";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const base = armSchema.parse({
  ...REF.endToEnd.arm, tool: I4,
  specs: { ratedPayload: 8, reach: 1.25, ipCode: "IP54", price: 30000, currency: "EUR", wristAllowables: [{ joint: 5, moment: 40, inertia: 0.5 }, { joint: 6, moment: 20 }] },
}) as DhArmDocument;
const cheaper: ArmDocument = { ...base, name: "Cheaper variant", specs: { ...base.specs, ipCode: "IP67", price: 20000 } };

/** The TCP pose at q (with the requirement set's identity base and a 0.1 m TCP offset). */
function poseAt(q: number[]) {
  const model = createModel({ ...base, tool: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1] });
  const data = createData(model);
  forwardKinematics(model, data, q);
  const t = data.toolPose;
  return { position: [t[3], t[7], t[11]] as [number, number, number], rpy: [Math.atan2(t[9], t[10]), Math.asin(-t[8]), Math.atan2(t[4], t[0])] as [number, number, number] };
}

const req = requirementSetSchema.parse({
  name: "check cell", base: I4,
  tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 1, cog: [0, 0, 0.05], inertia: [0.002, 0.002, 0.001] },
  payload: { mass: 2, cog: [0, 0, 0.02], inertia: [0.003, 0.003, 0.002] },
  targets: [
    { name: "reachable", ...poseAt([0.3, -0.2, 0.4, 0.5, 0.9, 0.2]), mode: "pose" },
    { name: "far away", position: [4, 0, 1], rpy: [Math.PI, 0, 0], mode: "point" },
    { name: "light push", ...poseAt([0.1, -0.4, 0.5, 0.3, 0.8, -0.2]), mode: "axis", force: [0, 0, -20] },
    { name: "heavy push", ...poseAt([0.1, -0.4, 0.5, 0.3, 0.8, -0.2]), mode: "axis", force: [0, 0, -20000] },
  ],
  paths: [{ name: "short line", mode: "point", step: 0.02, speed: 0.2, waypoints: [poseAt([0.2, -0.3, 0.5, 0, 0.8, 0]), poseAt([0.35, -0.25, 0.45, 0, 0.8, 0])] }],
  specs: [
    { field: "ipCode", comparator: "atLeast", value: "IP65", priority: "must" },
    { field: "armMass", comparator: "atMost", value: 80, priority: "must" },
    { field: "reach", comparator: "atLeast", value: 1.0, priority: "want" },
  ],
});
const arms: ShortlistArm[] = [{ id: "b-arm", revision: 3, arm: base }, { id: "a-arm", revision: 1, arm: cheaper }];
const small = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 400 } };

describe("analyzeShortlist", () => {
  const progress: number[] = [];
  const stages: string[] = [];
  const result = analyzeShortlist(arms, req, { budget: small, onProgress: (f, s) => { progress.push(f); stages.push(s); } });

  it("is deterministic: the same inputs give byte-identical JSON", () => {
    const again = analyzeShortlist(arms, req, { budget: small });
    expect(JSON.stringify(again)).toBe(JSON.stringify(result));
    expect(JSON.parse(JSON.stringify(result))).toEqual(JSON.parse(JSON.stringify(again)));
  });

  it("reports progress up to 1 and carries the caution and version", () => {
    expect(progress.at(-1)).toBe(1);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    expect(result.caution).toBe(CAUTION);
    expect(result.caution).toMatch(/ISO 12100/);
    expect(result.caution).toMatch(/ISO\/TS 15066/);
    expect(result.version).toBe(ANALYSIS_VERSION);
  });

  it("reports each target, each path and the workspace of each arm in equal steps", () => {
    // 2 arms × (4 targets + 1 path + workspace) = 12 steps of 1/12.
    expect(progress).toHaveLength(12);
    progress.forEach((f, i) => expect(f).toBeCloseTo((i + 1) / 12, 12));
    expect(stages.slice(0, 6)).toEqual([
      "arm 1/2 Reference six-axis arm: target reachable (1/4)",
      "arm 1/2 Reference six-axis arm: target far away (2/4)",
      "arm 1/2 Reference six-axis arm: target light push (3/4)",
      "arm 1/2 Reference six-axis arm: target heavy push (4/4)",
      "arm 1/2 Reference six-axis arm: path short line (1/1)",
      "arm 1/2 Reference six-axis arm: workspace and specs",
    ]);
    expect(stages[6]).toBe("arm 2/2 Cheaper variant: target reachable (1/4)");
  });

  it("an arm whose model is invalid still advances the progress by its share", () => {
    const broken: ArmDocument = { ...base, name: "Broken", joints: base.joints.map((j, i) => (i === 1 ? { ...j, type: "bogus" as never } : j)) };
    const seen: [number, string][] = [];
    analyzeShortlist([{ id: "x", revision: 1, arm: broken }], { ...req, targets: [req.targets[0]], paths: [] }, { budget: small, onProgress: (f, s) => seen.push([f, s]) });
    expect(seen).toEqual([[1, "arm 1/1 Broken: not analysed (invalid model)"]]);
  });

  it("target verdicts carry readable reasons", () => {
    const [reachable, far, light, heavy] = result.arms[0].targets;
    expect(reachable.reached).toBe(true);
    expect(reachable.reason).toMatch(/^reached with dexterity margin \d\.\d\d/);
    expect(reachable.solutions.length).toBeGreaterThanOrEqual(1);
    // The chosen branch has the best margin of those found.
    expect(reachable.dexterity!.margin).toBe(Math.max(...reachable.solutions.map((s) => s.margin)));
    expect(far.verdict).toBe("fails");
    expect(far.reason).toMatch(/^not reached after 0 restarts: best position error/);
    // Decided from the IK result's structured cause: no larger search for a target beyond reach.
    expect(far.reason).toMatch(/beyond the arm's largest possible reach/);
    expect(light.force!.verdict).toBe("meets");
    expect(light.force!.capacityRatio!).toBeGreaterThan(1.2);
    // Capability = s·|F|; the ellipsoid estimate is reported beside it, never as it.
    expect(light.force!.forceCapacity).toBeCloseTo(light.force!.capacityRatio! * 20, 9);
    expect(light.force!.ellipsoidEstimateRatio).not.toBe(light.force!.capacityRatio);
    expect(heavy.verdict).toBe("fails");
    expect(heavy.force!.reason).toMatch(/cannot apply/);
    expect(reachable.holding!.basis).toBe("torque-limits");
    expect(reachable.holding!.payloadCapacity!).toBeGreaterThan(3);
    expect(reachable.wrist!.axes.map((a) => a.joint)).toEqual([5, 6]);
  });

  it("must requirements gate the ranking; weights re-rank without recomputing", () => {
    const b = result.arms.find((a) => a.id === "b-arm")!;
    expect(b.failedMusts).toEqual(["IP code (IEC 60529) ≥ IP65"]);
    expect(b.unknownMusts).toEqual(["Arm mass ≤ 80 kg"]);
    expect(result.ranking[0].armId).toBe("a-arm");
    expect(result.ranking[1].disqualified).toBe(true);
    const a = result.arms.find((x) => x.id === "a-arm")!;
    expect(a.subScores.price.value).toBe(1);
    expect(b.subScores.price.value).toBeCloseTo(2 / 3, 12);
    expect(a.subScores.coverage.value).toBeCloseTo(3 / 4, 12); // the far target is out of reach
    const again = rankArms(result.arms.map((x) => ({ armId: x.id, subScores: x.subScores, failedMusts: x.failedMusts, unknownMusts: x.unknownMusts })), req.weights);
    expect(again).toEqual(result.ranking);
  });

  it("workspace envelope and reach comparison", () => {
    const w = result.arms[0].workspace!;
    expect(w.side.length).toBeGreaterThan(10);
    expect(w.top.length).toBeGreaterThan(10);
    expect(w.targets.map((t) => t.name)).toEqual(req.targets.map((t) => t.name));
    expect(w.sampledReach).toBeGreaterThan(0.8);
    expect(w.reachRatio).toBeCloseTo(w.sampledReach / 1.25, 12);
  });
});

describe("analysisKey", () => {
  // A fixed input written out literally (not through the schemas, so new defaults cannot change
  // it) and its key computed outside the product: Python's hashlib.sha256 over
  // json.dumps(input, sort_keys=True, separators=(",", ":"), ensure_ascii=False).
  const keyArm = {
    name: "Key Two", convention: "dh",
    joints: [
      { type: "revolute", a: 0.4, alpha: 0, d: 0, theta: 0, min: -3, max: 3 },
      { type: "prismatic", a: 0, alpha: 1.5, d: 0.25, theta: 0, min: 0, max: 0.5 },
    ],
  } as unknown as ArmDocument;
  const keyReq = {
    name: "Key cell", base: I4,
    tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 1, cog: [0, 0, 0.05] },
    payload: { mass: 2, cog: [0, 0, 0.02] },
    targets: [], paths: [], specs: [],
    weights: { coverage: 4, dexterity: 2, payload: 1, force: 1, pathSpeed: 1, price: 1 },
  } as unknown as RequirementSet;
  const keyArms: ShortlistArm[] = [{ id: "arm-a", revision: 3, arm: keyArm }];

  it("matches the sha-256 computed outside the product for a fixed input and version", () => {
    expect(analysisKeyFor("analysis-key-test", keyArms, keyReq)).toBe("1e2f9a8b30ca065419845c61804363719c28cc36a3466971656ff66e866d5345");
    expect(analysisKeyFor("analysis-key-test", [{ ...keyArms[0], revision: 4 }], keyReq)).toBe("53d33aba106b7cde7f12e1205e47e3d6e13e02c2d3e94843ca249dedb8349d1c");
  });

  it("does not depend on key order, and changes with the version, a revision or the requirement set", () => {
    const k = analysisKey(arms, req);
    expect(k).toMatch(/^[0-9a-f]{64}$/);
    expect(k).toBe(analysisKeyFor(ANALYSIS_VERSION, arms, req));
    expect(analysisKeyFor(`${ANALYSIS_VERSION}-next`, arms, req)).not.toBe(k);
    const reordered = JSON.parse(JSON.stringify(req, Object.keys(req).sort().reverse()));
    expect(analysisKey(arms, { ...reordered, ...req })).toBe(k);
    expect(canonicalJson({ b: 1, a: [2, { d: 1, c: undefined }] })).toBe('{"a":[2,{"d":1}],"b":1}');
    expect(analysisKey([{ ...arms[0], revision: 4 }, arms[1]], req)).not.toBe(k);
    expect(analysisKey(arms, { ...req, name: "other" })).not.toBe(k);
  });
});
