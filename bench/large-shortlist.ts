/**
 * An invented large shortlist for the size benchmarks and the tests that need one: `arms` arms of
 * `joints` joints (a serial chain of revolute joints with alternating twists, every length, limit,
 * speed, torque and mass made up from a seeded random stream) against a requirement set of
 * `targets` targets and `paths` paths of `waypoints` waypoints sampled at `step` (m). Nothing here
 * describes a real arm. Deterministic: the same options give the same documents.
 */
import { createData, createModel, createRng, forwardKinematics, randomConfiguration, type Rng } from "@/lib/kinematics";
import type { ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";

export interface LargeShortlistOptions {
  arms: number;
  /** Joints per arm (1…12); default 6. */
  joints?: number;
  targets: number;
  paths: number;
  /** Waypoints per path (2…200); default 20. */
  waypoints?: number;
  /** Sampling step of every path (m, ≥ 1e-4); default: the path's length / 99 (about 100 samples). */
  step?: number;
  /** Seed of the random stream; default 1717. */
  seed?: number;
}

const MODES = ["pose", "axis", "point"] as const;

/** One invented arm: `n` revolute joints, alternating twists, a spherical-looking wrist at the end. */
function inventedArm(rng: Rng, index: number, n: number): ArmDocument {
  const s = 0.7 + rng() * 0.6;
  const r = (lo: number, hi: number) => lo + rng() * (hi - lo);
  const m = 8 * s ** 3;
  const joints = Array.from({ length: n }, (_, i) => {
    const wrist = i >= n - 3;
    const shoulder = i === 0;
    const lim = wrist ? r(2.6, 3.1) : r(2.0, 2.8);
    return {
      type: "revolute" as const,
      a: wrist ? 0 : shoulder ? 0.12 * s : (r(0.25, 0.5) * s * 6) / Math.max(6, n),
      alpha: i % 2 === 0 ? -Math.PI / 2 : Math.PI / 2,
      d: shoulder ? 0.4 * s : wrist && i === n - 1 ? 0.09 * s : i === n - 2 ? 0 : (r(0.05, 0.3) * s * 6) / Math.max(6, n),
      theta: 0,
      min: -lim,
      max: lim,
      maxSpeed: wrist ? r(4, 7) : r(2.2, 3.5),
      maxTorque: wrist ? r(30, 80) * s ** 3 : r(300, 900) * s ** 4,
      mass: wrist ? m * 0.1 : m * r(0.5, 1.5),
      com: [0, 0, 0.02 * s] as [number, number, number],
    };
  });
  return {
    name: `Invented chain ${n}-${index + 1}`,
    maker: "Bench",
    convention: "dh",
    joints,
    specs: {
      ratedPayload: Math.round(8 * s ** 3),
      reach: 1.2 * s,
      ipCode: index % 3 === 0 ? "IP54" : "IP67",
      mounting: ["floor"],
      price: Math.round(18000 + 25000 * s),
      currency: "EUR",
    },
  };
}

type PoseIn = { position: [number, number, number]; rpy: [number, number, number] };

/** TCP poses of a walk through the reference arm's configurations (a random restart each `every` poses). */
function walkPoses(arm: ArmDocument, rng: Rng, count: number, stepRad: number, every = 1): PoseIn[] {
  const model = createModel(arm);
  const data = createData(model);
  const q = new Float64Array(model.n);
  randomConfiguration(model, rng, q);
  const out: PoseIn[] = [];
  for (let k = 0; k < count; k++) {
    if (k % every === 0) randomConfiguration(model, rng, q);
    else for (let i = 0; i < model.n; i++) q[i] = Math.min(model.upper[i] - 0.05, Math.max(model.lower[i] + 0.05, q[i] + stepRad * (rng() - 0.5)));
    forwardKinematics(model, data, q);
    const t = data.toolPose;
    const pitch = Math.asin(Math.max(-1, Math.min(1, -t[8])));
    // rounded to 1 µm and 1 µrad (well inside the default tolerances) to keep request bodies small
    const r6 = (v: number) => Math.round(v * 1e6) / 1e6;
    out.push({ position: [r6(t[3]), r6(t[7]), r6(t[11])], rpy: [r6(Math.atan2(t[9], t[10])), r6(pitch), r6(Math.atan2(t[4], t[0]))] });
  }
  return out;
}

/** The invented arms and requirement set (parsed by the schema, defaults applied). */
export function largeShortlist(o: LargeShortlistOptions): { arms: ArmDocument[]; requirementSet: RequirementSet } {
  const rng = createRng(o.seed ?? 1717);
  const n = o.joints ?? 6;
  const arms = Array.from({ length: o.arms }, (_, i) => inventedArm(rng, i, n));
  const ref = arms[0];
  const targets = walkPoses(ref, rng, o.targets, 0, 1).map((p, i) => ({
    name: `target ${String(i + 1).padStart(3, "0")}`,
    ...p,
    mode: MODES[i % 3],
    ...(i % 11 === 5 ? { force: [0, 0, -60] as [number, number, number] } : {}),
  }));
  const wp = o.waypoints ?? 20;
  const paths = Array.from({ length: o.paths }, (_, k) => {
    const waypoints = walkPoses(ref, rng, wp, 0.6 / Math.sqrt(wp), wp);
    let len = 0;
    for (let i = 1; i < waypoints.length; i++) len += Math.hypot(...waypoints[i].position.map((v, c) => v - waypoints[i - 1].position[c]));
    const step = o.step ?? Math.max(1e-4, len / 99 + 1e-9);
    return { name: `path ${String(k + 1).padStart(2, "0")}`, waypoints, mode: MODES[k % 3], step: Math.min(1, step), speed: 0.25 };
  });
  const requirementSet = requirementSetSchema.parse({
    name: `Invented large cell ${o.targets} targets × ${o.paths} paths`,
    base: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
    tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.08, 0, 0, 0, 1], mass: 0.8, cog: [0, 0, 0.04], inertia: [0.002, 0.002, 0.001] },
    payload: { mass: 1.5, cog: [0.01, 0, 0.03], inertia: [0.003, 0.003, 0.002] },
    targets,
    paths,
    specs: [
      { field: "ipCode", comparator: "atLeast", value: "IP65", priority: "want" },
      { field: "reach", comparator: "atLeast", value: 0.9, priority: "want" },
      { field: "price", comparator: "atMost", value: 40000, priority: "want" },
    ],
  });
  return { arms, requirementSet };
}
