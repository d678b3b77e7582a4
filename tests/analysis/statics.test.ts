import { describe, expect, it } from "vitest";
import {
  capacityAlong, ellipsoidEstimateAlong, forceEllipsoid, gravityTorque, payloadCapacity, transposeTimes, wristAxisLoad,
  STANDARD_GRAVITY,
} from "@/lib/analysis/statics";
import { computeJacobian, createData, createModel } from "@/lib/kinematics";
import type { ArmKinematics } from "@/shared/schemas/arm";
import { REF, nanOrNumber } from "./fixtures";

const DEG = Math.PI / 180;

/** Planar 2R arm; `vertical` turns its plane into the cell's x-z plane (gravity in the plane). */
function twoR(l1: number, l2: number, vertical: boolean, masses?: [number, number]): ArmKinematics {
  const joint = (a: number, m?: number) => ({
    type: "revolute" as const, a, alpha: 0, d: 0, theta: 0, min: -Math.PI, max: Math.PI,
    ...(m !== undefined ? { mass: m, com: [-a / 2, 0, 0] as [number, number, number] } : {}),
  });
  return {
    name: "planar 2R", convention: "dh",
    joints: [joint(l1, masses?.[0]), joint(l2, masses?.[1])],
    // Rx(+90°): the DH y axis becomes the cell's z axis (up), joint axes along −y.
    ...(vertical ? { base: [1, 0, 0, 0, 0, 0, -1, 0, 0, 1, 0, 0, 0, 0, 0, 1] } : {}),
  };
}

describe("τ = Jᵀ F", () => {
  it("2R example of docs/references.md#2r-joint-torque-check-value (Craig ch. 5; Spong ch. 4), recomputed with numpy", () => {
    const ex = REF.tauExample;
    const model = createModel(twoR(ex.l1, ex.l2, false));
    const data = createData(model);
    const jac = computeJacobian(model, data, ex.q, new Float64Array(12));
    expect(jac[0]).toBeCloseTo(ex.jacobian[0][0], 12);
    expect(jac[3]).toBeCloseTo(ex.jacobian[1][1], 12);
    const tau = transposeTimes(jac, 3, 2, [ex.force[0], ex.force[1], 0]);
    expect(tau[0]).toBeCloseTo(ex.tau[0], 10);
    expect(tau[1]).toBeCloseTo(ex.tau[1], 10);
    expect(tau[0]).toBeCloseTo(-34.189, 3); // docs/references.md#2r-joint-torque-check-value (computed here)
    expect(tau[1]).toBeCloseTo(-11.869, 3);
  });
});

describe("gravity torque and payload capacity of a 2R arm in a vertical plane", () => {
  // Source: Spong's planar elbow arm, g1 = (m1 lc1 + m2 l1) g c1 + m2 lc2 g c12, g2 = m2 lc2 g c12,
  // recomputed in analysis_reference.py for g = 9.80665 (the product's standard gravity).
  const ref = REF.gravity2r.find((r: { g: number }) => r.g === 9.80665);
  const model = createModel(twoR(1, 1, true, [1, 1]));
  const data = createData(model);
  const jac = new Float64Array(12);
  const tmax = Float64Array.from(ref.maxTorque);
  for (const row of ref.rows) {
    it(`q = (${(row.q[0] / DEG).toFixed(0)}°, ${(row.q[1] / DEG).toFixed(0)}°)`, () => {
      const tau = gravityTorque(model, data, row.q, [], jac);
      expect(tau[0]).toBeCloseTo(row.tau[0], 10);
      expect(tau[1]).toBeCloseTo(row.tau[1], 10);
      computeJacobian(model, data, row.q, jac);
      const cap = payloadCapacity(tau, jac, 2, tmax);
      if (row.capacity === null) {
        expect(cap.status).toBe("unbounded");
      } else {
        expect(cap.extraMass!).toBeCloseTo(row.capacity, 10);
        expect(cap.limitingJoint).toBe(row.limitingJoint);
      }
    });
  }
  it("the g = 9.81 recomputation reproduces docs/references.md#2r-gravity-and-payload-check-values", () => {
    const r981 = REF.gravity2r.find((r: { g: number }) => r.g === 9.81);
    expect(r981.rows[0].tau[0]).toBeCloseTo(19.62, 3);
    expect(r981.rows[0].capacity).toBeCloseTo(1.5387, 4);
    expect(r981.rows[0].perJoint[0]).toBeCloseTo(1.5484, 4);
    expect(r981.rows[3].capacity).toBeCloseTo(4.3853, 4);
    expect(r981.rows[3].limitingJoint).toBe(1);
  });
  it("holds with the load at the tip: τ_hold with the payload equals links + m·Jᵀ(0,0,g)", () => {
    const q = [0.3, -0.5];
    const withLoad = gravityTorque(model, data, q, [{ mass: 2, pointInTool: [0, 0, 0] }], jac);
    const links = gravityTorque(model, data, q, [], jac);
    computeJacobian(model, data, q, jac);
    for (let i = 0; i < 2; i++) expect(withLoad[i]).toBeCloseTo(links[i] + 2 * STANDARD_GRAVITY * jac[4 + i], 12);
  });
});

describe("force capability under box torque limits (closed form) against scipy's linprog", () => {
  // Source: scipy.optimize.linprog (HiGHS) on max s, −T ≤ τ_hold + (Jᵀu) s ≤ T, s ≥ 0 (analysis_reference.py).
  it("matches the LP on random instances (bounded, overloaded, unbounded, no limits)", () => {
    let differs = 0, bounded = 0;
    for (const c of REF.capacity) {
      const T = nanOrNumber(c.maxTorque);
      const b = transposeTimes(c.jacobian, c.rows, c.n, c.direction);
      const r = capacityAlong(c.tauHold, b, T);
      expect(r.status).toBe(c.lp.status);
      if (c.lp.capacity === null) expect(r.capacity).toBeNull();
      else expect(r.capacity!).toBeCloseTo(c.lp.capacity, 7);
      if (r.status === "bounded") {
        bounded++;
        // The limiting joint sits exactly at its limit at the capacity.
        const i = r.limitingJoint! - 1;
        expect(Math.abs(c.tauHold[i] + b[i] * r.capacity!)).toBeCloseTo(T[i], 7);
        const est = ellipsoidEstimateAlong(c.jacobian, c.rows, c.n, T, c.direction)!;
        expect(est).toBeCloseTo(c.ellipsoidEstimate, 9);
        if (Math.abs(est - r.capacity!) > 0.01 * r.capacity!) differs++;
      }
      if (r.status === "overloaded") expect(r.capacity).toBe(0);
    }
    // The ellipsoid's estimate is not the capability: it differs in most cases.
    expect(differs).toBeGreaterThan(bounded / 2);
  });
  it("a joint that does not feel the direction imposes nothing", () => {
    const r = capacityAlong([0, 0], [0, 2], [10, 10]);
    expect(r.capacity).toBe(5);
    expect(r.perJoint[0]).toBeNull();
  });
  it("an overload already at rest gives 0 with the most overloaded joint", () => {
    const r = capacityAlong([12, -30], [1, 1], [10, 20]);
    expect(r).toMatchObject({ capacity: 0, status: "overloaded", limitingJoint: 2 });
  });
});

describe("end to end through a six-axis arm model (numpy DH kinematics in analysis_reference.py)", () => {
  const e2e = REF.endToEnd;
  const model = createModel(e2e.arm);
  const data = createData(model);
  const jac = new Float64Array(36);
  for (const c of e2e.cases) {
    it(`q = ${c.q.join(", ")}`, () => {
      const links = gravityTorque(model, data, c.q, [], jac);
      const hold = gravityTorque(model, data, c.q, [{ mass: e2e.loadMass, pointInTool: e2e.loadPoint }], jac);
      for (let i = 0; i < 6; i++) {
        expect(links[i]).toBeCloseTo(c.tauLinks[i], 9);
        expect(hold[i]).toBeCloseTo(c.tauHold[i], 9);
      }
      computeJacobian(model, data, c.q, jac, e2e.loadPoint);
      for (let i = 0; i < 36; i++) expect(jac[i]).toBeCloseTo(c.jacobianAtLoad[i], 10);
      const f = capacityAlong(hold, transposeTimes(jac, 3, 6, c.direction), model.maxTorque);
      expect(f.capacity!).toBeCloseTo(c.forceCapacity.capacity, 7);
      const w = capacityAlong(hold, transposeTimes(jac, 6, 6, c.wrench), model.maxTorque);
      expect(w.capacity!).toBeCloseTo(c.wrenchCapacity.capacity, 7);
      const p = payloadCapacity(links, jac, 6, model.maxTorque);
      expect(p.extraMass!).toBeCloseTo(c.payloadCapacity.capacity, 7);
    });
  }
});

describe("force ellipsoid and wrist loads", () => {
  it("radii are 1/σ of J W⁻¹ along the principal directions (docs/references.md#yoshikawa-manipulability)", () => {
    // 2R at q = (0, 90°) with unit limits: semi-axes 1/σ = 0.618, 1.618 (docs/references.md#2r-dexterity-check-values).
    const jac = [-1, -1, 1, 0, 0, 0, 0, 0, 0, 0, 1, 1];
    const e = forceEllipsoid(jac, 2, [1, 1]);
    expect(e.weighted).toBe(true);
    expect(e.radii[0]!).toBeCloseTo(0.618034, 6);
    expect(e.radii[1]!).toBeCloseTo(1.618034, 6);
    expect(e.radii[2]).toBeNull();
    // Halving both limits halves the radii.
    expect(forceEllipsoid(jac, 2, [0.5, 0.5]).radii[1]!).toBeCloseTo(0.809017, 6);
  });
  it("wrist moment and inertia about an axis (parallel-axis theorem; statics of a point mass)", () => {
    const body = { mass: 2, cog: [0.1, 0, 0.5], rotation: [1, 0, 0, 0, 1, 0, 0, 0, 1], inertia: [0.01, 0.02, 0.03] as [number, number, number] };
    // Horizontal axis along y through the origin: the weight 2g at 0.1 m gives 0.1·2g.
    const l = wristAxisLoad([0, 1, 0], [0, 0, 0], [body]);
    expect(l.momentAtPose).toBeCloseTo(0.1 * 2 * STANDARD_GRAVITY, 12);
    expect(l.momentWorstCase).toBeCloseTo(2 * STANDARD_GRAVITY * Math.hypot(0.1, 0.5), 12);
    expect(l.inertia).toBeCloseTo(0.02 + 2 * (0.1 ** 2 + 0.5 ** 2), 12);
    // Vertical axis: gravity makes no moment about it.
    expect(wristAxisLoad([0, 0, 1], [0, 0, 0], [body]).momentAtPose).toBeCloseTo(0, 12);
    expect(wristAxisLoad([0, 0, 1], [0, 0, 0], [{ ...body, inertia: null }]).inertiaComplete).toBe(false);
  });
});

describe("gravity is −z of the cell, whatever the base pose", () => {
  it("a ceiling-mounted arm feels the opposite gravity torque of the same arm on the floor (τ_hold is linear in g)", async () => {
    const { createArmContext } = await import("@/lib/analysis/context");
    const { requirementSetSchema } = await import("@/shared/schemas/requirements");
    const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
    const cell = (base: number[]) => requirementSetSchema.parse({ name: "c", base, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, targets: [], paths: [], specs: [] });
    const floor = createArmContext(REF.endToEnd.arm, cell(I4));
    // Rx(180°) at 2.5 m: hanging from the ceiling.
    const ceiling = createArmContext(REF.endToEnd.arm, cell([1, 0, 0, 0.4, 0, -1, 0, 0, 0, 0, -1, 2.5, 0, 0, 0, 1]));
    const q = [0.3, -0.6, 0.8, 0.2, 0.5, 0.1];
    const a = gravityTorque(floor.model, floor.data, q, [], floor.jac);
    const b = gravityTorque(ceiling.model, ceiling.data, q, [], ceiling.jac);
    for (let i = 0; i < 6; i++) expect(b[i]).toBeCloseTo(-a[i], 9);
    expect(Math.abs(a[1])).toBeGreaterThan(1);
  });
});
