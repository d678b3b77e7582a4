// Figures labelled as what they are. Sources: the statics definitions (τ_hold = Σ J_cᵢᵀ(0, 0, mᵢg),
// Craig ch. 5) evaluated here with the product's own gravityTorque and ellipsoidEstimateAlong on
// Jacobians at the named points (both checked against numpy/scipy in statics.test.ts).
import { describe, expect, it } from "vitest";
import { analyzeShortlist, createArmContext, DEFAULT_BUDGET, ellipsoidEstimateAlong, gravityTorque, type ShortlistArm } from "@/lib/analysis";
import { computeJacobian, createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { REF } from "./fixtures";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const arm: ArmDocument = armSchema.parse({ ...REF.endToEnd.arm, tool: I4 });
const TCP = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1];

function poseAt(q: number[]) {
  const model = createModel({ ...arm, tool: TCP });
  const data = createData(model);
  forwardKinematics(model, data, q);
  const t = data.toolPose;
  return { position: [t[3], t[7], t[11]] as [number, number, number], rpy: [Math.atan2(t[9], t[10]), Math.asin(-t[8]), Math.atan2(t[4], t[0])] as [number, number, number] };
}

function cell(payloadMass: number) {
  return requirementSetSchema.parse({
    name: "labels", base: I4,
    // A heavy tool with its CoG well off the TCP, so "tool + payload at the payload CoG" would be wrong by a lot.
    tool: { tcp: TCP, mass: 6, cog: [0.15, 0, 0.02] },
    payload: { mass: payloadMass, cog: [0, 0, 0.03] },
    targets: [{ name: "push", ...poseAt([0.1, -0.4, 0.5, 0.3, 0.8, -0.2]), mode: "pose", force: [10, 0, -40], moment: [0, 1, 0] }],
    paths: [{
      name: "turn", mode: "pose", step: 0.02, speed: 0.2,
      waypoints: [poseAt([0.2, -0.3, 0.5, 0, 0.8, 0]), poseAt([0.3, -0.3, 0.5, 0, 0.8, 0]), { ...poseAt([0.3, -0.3, 0.5, 0, 0.8, 0]), rpy: poseAt([0.3, -0.3, 0.5, 0, 0.8, 0.6]).rpy }],
    }],
    specs: [],
  });
}
const budget = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 100 } };
const arms: ShortlistArm[] = [{ id: "a", revision: 1, arm }];

/** Largest utilisation |τᵢ|/Tᵢ with the tool at its CoG and `payload` kg at the payload CoG. */
function utilisation(req: ReturnType<typeof cell>, q: number[], payload: number): number {
  const ctx = createArmContext(arm, req);
  const loads = [{ mass: req.tool.mass, pointInTool: ctx.toolCogInTcp }, { mass: payload, pointInTool: req.payload.cog }];
  const tau = gravityTorque(ctx.model, ctx.data, q, loads, new Float64Array(6 * ctx.model.n));
  return Math.max(...Array.from(tau, (t, i) => Math.abs(t) / ctx.model.maxTorque[i]));
}

describe("payload capacity: the payload at the payload CoG, the tool at its own CoG", () => {
  it("holdable payload saturates a joint exactly when placed at the payload CoG with the tool as given", () => {
    const req = cell(2);
    const t = analyzeShortlist(arms, req, { budget }).arms[0].targets[0];
    const h = t.holding!;
    const q = t.solutions[t.chosen!].q;
    expect(h.basis).toBe("torque-limits");
    expect(h.holdablePayload!).toBeCloseTo(2 + h.extraPayloadCapacity!, 9);
    expect(h.payloadCapacity!).toBeCloseTo(6 + h.holdablePayload!, 9);
    expect(utilisation(req, q, h.holdablePayload!)).toBeCloseTo(1, 9);
    // The old reading (the whole total at the payload CoG) is not what the pose holds.
    expect(Math.abs(utilisation(req, q, h.payloadCapacity!) - 1)).toBeGreaterThan(1e-3);
    expect(h.reason).toMatch(/^holds up to \d+\.\d kg of payload at the payload CoG with the 6\.0 kg tool/);
  });

  it("a payload too heavy for the pose still gets its holdable payload", () => {
    const probe = analyzeShortlist(arms, cell(2), { budget }).arms[0].targets[0].holding!;
    const req = cell(probe.holdablePayload! * 1.5);
    const t = analyzeShortlist(arms, req, { budget }).arms[0].targets[0];
    expect(t.holding!.verdict).toBe("fails");
    expect(t.holding!.holdablePayload!).toBeLessThan(req.payload.mass);
    expect(utilisation(req, t.solutions[t.chosen!].q, t.holding!.holdablePayload!)).toBeCloseTo(1, 9);
  });
});

describe("the ellipsoid estimate beside the exact force capability is the 6-D one at the TCP", () => {
  it("equals 1/‖W⁻¹Jᵀw‖ with the 6×n Jacobian at the TCP, and says so", () => {
    const req = cell(2);
    const t = analyzeShortlist(arms, req, { budget }).arms[0].targets[0];
    const ctx = createArmContext(arm, req);
    const jac = new Float64Array(6 * ctx.model.n);
    computeJacobian(ctx.model, ctx.data, t.solutions[t.chosen!].q, jac);
    const w = [10, 0, -40, 0, 1, 0];
    expect(t.force!.ellipsoidEstimateRatio!).toBeCloseTo(ellipsoidEstimateAlong(jac, 6, ctx.model.n, ctx.model.maxTorque, w)!, 12);
    expect(t.force!.reason).toMatch(/6-D torque-ellipsoid estimate at the TCP/);
    // The drawn ellipsoid is the 3-D force ellipsoid at the payload CoG: a different figure.
    expect(t.forceEllipsoid!.directions).toHaveLength(3);
  });
});

describe("rotation-only path segments", () => {
  it("carry no speed requirement, and the path says so", () => {
    const p = analyzeShortlist(arms, cell(2), { budget }).arms[0].paths[0];
    expect(p.speed.rotationOnlySegments).toBe(true);
    expect(p.reason).toMatch(/rotation-only segments have no speed requirement/);
    // Their samples have no speed figures.
    const last = p.samples - 1;
    expect(p.profile.speedRatio[last]).toBeNull();
  });
});
