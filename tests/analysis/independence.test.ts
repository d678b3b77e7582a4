// An arm's result depends only on that arm and the requirement set: never on its position in the
// shortlist or on the other arms in it. Seeds come from the content (the arm's kinematic
// description and the target's or path's name), so permuting the arms, adding one or removing one
// leaves every per-arm result byte-identical, and copies of one arm get one result.
import { describe, expect, it } from "vitest";
import { analyzeShortlist, DEFAULT_BUDGET, type ArmAnalysis, type ShortlistArm } from "@/lib/analysis";
import { armSchema, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { SPHERICAL_WRIST_6R } from "../helpers/arms";

const DEG = Math.PI / 180;
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const speeds = (n: number) => Array.from({ length: n }, (_, i) => 2 + 0.25 * i);

// Invented arms (values made up for this test).
const sixR: ArmDocument = armSchema.parse({
  ...SPHERICAL_WRIST_6R, name: "Six", joints: SPHERICAL_WRIST_6R.joints.map((j, i) => ({ ...j, maxSpeed: speeds(6)[i], maxTorque: [300, 300, 150, 40, 40, 20][i] })),
  specs: { price: 20000, currency: "EUR" },
});
const sevenR: ArmDocument = armSchema.parse({
  name: "Seven", convention: "dh",
  joints: [
    { type: "revolute", a: 0, alpha: -90 * DEG, d: 0.34, theta: 0, min: -170 * DEG, max: 170 * DEG },
    { type: "revolute", a: 0, alpha: 90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG },
    { type: "revolute", a: 0, alpha: 90 * DEG, d: 0.4, theta: 0, min: -170 * DEG, max: 170 * DEG },
    { type: "revolute", a: 0, alpha: -90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG },
    { type: "revolute", a: 0, alpha: -90 * DEG, d: 0.4, theta: 0, min: -170 * DEG, max: 170 * DEG },
    { type: "revolute", a: 0, alpha: 90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG },
    { type: "revolute", a: 0, alpha: 0, d: 0.126, theta: 0, min: -350 * DEG, max: 350 * DEG },
  ].map((j, i) => ({ ...j, maxSpeed: speeds(7)[i] })),
  specs: { price: 35000, currency: "EUR" },
});
const fiveR: ArmDocument = armSchema.parse({
  name: "Five", convention: "dh",
  joints: [
    { type: "revolute", a: 0.1, alpha: -90 * DEG, d: 0.4, theta: 0, min: -170 * DEG, max: 170 * DEG },
    { type: "revolute", a: 0.5, alpha: 0, d: 0, theta: -90 * DEG, min: -100 * DEG, max: 130 * DEG },
    { type: "revolute", a: 0.45, alpha: 0, d: 0, theta: 0, min: -150 * DEG, max: 150 * DEG },
    { type: "revolute", a: 0, alpha: -90 * DEG, d: 0, theta: 0, min: -120 * DEG, max: 120 * DEG },
    { type: "revolute", a: 0, alpha: 0, d: 0.1, theta: 0, min: -360 * DEG, max: 360 * DEG },
  ].map((j, i) => ({ ...j, maxSpeed: speeds(5)[i] })),
  specs: { price: 41000, currency: "EUR" },
});
const pricier: ArmDocument = { ...sixR, name: "Six, dearer", specs: { price: 52000, currency: "EUR" } };

const req = requirementSetSchema.parse({
  name: "independence cell", base: I4,
  tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.08, 0, 0, 0, 1], mass: 0.6, cog: [0, 0, 0.04] },
  payload: { mass: 1.2, cog: [0, 0, 0.02] },
  targets: [
    { name: "front down", position: [0.55, 0.1, 0.25], rpy: [Math.PI, 0, 0], mode: "pose" },
    { name: "side axis", position: [0.2, -0.5, 0.35], rpy: [Math.PI, 0.3, 0.4], mode: "axis" },
    { name: "high point", position: [0.3, 0.35, 0.7], rpy: [0, 0, 0], mode: "point" },
    { name: "tilted", position: [0.45, -0.2, 0.15], rpy: [2.6, -0.4, 1.1], mode: "pose", force: [0, 0, -30] },
  ],
  paths: [{ name: "line", mode: "axis", step: 0.02, speed: 0.25, waypoints: [{ position: [0.5, -0.15, 0.25], rpy: [Math.PI, 0, 0] }, { position: [0.5, 0.2, 0.3], rpy: [Math.PI, 0, 0] }] }],
  specs: [],
});
const budget = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 300 } };

const A: ShortlistArm = { id: "a", revision: 1, arm: sixR };
const B: ShortlistArm = { id: "b", revision: 1, arm: sevenR };
const C: ShortlistArm = { id: "c", revision: 1, arm: fiveR };
const D: ShortlistArm = { id: "d", revision: 1, arm: pricier };

const byId = (arms: ArmAnalysis[]) => new Map(arms.map((a) => [a.id, JSON.stringify(a)]));

/** Path of the first member where two JSON texts differ (null when byte-identical), for short failure messages. */
function firstDifference(a: string | undefined, b: string | undefined): string | null {
  if (a === b) return null;
  if (a === undefined || b === undefined) return "(missing)";
  const walk = (x: unknown, y: unknown, at: string): string | null => {
    if (typeof x !== "object" || x === null || typeof y !== "object" || y === null) return JSON.stringify(x) === JSON.stringify(y) ? null : `${at}: ${JSON.stringify(x)?.slice(0, 80)} vs ${JSON.stringify(y)?.slice(0, 80)}`;
    const keys = new Set([...Object.keys(x), ...Object.keys(y)]);
    for (const k of keys) {
      const d = walk((x as Record<string, unknown>)[k], (y as Record<string, unknown>)[k], `${at}.${k}`);
      if (d) return d;
    }
    return null;
  };
  return walk(JSON.parse(a), JSON.parse(b), "arm") ?? "(same members, different text)";
}

describe("results do not depend on the arm's place in the shortlist or on the other arms", () => {
  const ref = byId(analyzeShortlist([A, B, C], req, { budget }).arms);

  it("permuting the arms leaves every per-arm result byte-identical", () => {
    for (const order of [[C, A, B], [B, C, A]]) {
      const got = byId(analyzeShortlist(order, req, { budget }).arms);
      for (const id of ["a", "b", "c"]) expect(firstDifference(got.get(id), ref.get(id)), `arm ${id} in order ${order.map((x) => x.id).join("")}`).toBeNull();
    }
  });

  it("adding an arm or removing one leaves the others byte-identical (the cheapest arm stays, so price scores do too)", () => {
    const added = byId(analyzeShortlist([D, B, A, C], req, { budget }).arms);
    for (const id of ["a", "b", "c"]) expect(firstDifference(added.get(id), ref.get(id)), `arm ${id} with d added`).toBeNull();
    const removed = byId(analyzeShortlist([C, A], req, { budget }).arms);
    for (const id of ["a", "c"]) expect(firstDifference(removed.get(id), ref.get(id)), `arm ${id} with b removed`).toBeNull();
  });

  it("three copies of one arm get one result and one score", () => {
    const copies = [1, 2, 3].map((k): ShortlistArm => ({ id: `copy-${k}`, revision: k, arm: { ...sevenR, name: `Seven copy ${k}` } }));
    const r = analyzeShortlist(copies, req, { budget });
    const strip = (a: ArmAnalysis) => JSON.stringify({ ...a, id: "", revision: 0, name: "", summary: "" });
    expect(firstDifference(strip(r.arms[1]), strip(r.arms[0]))).toBeNull();
    expect(firstDifference(strip(r.arms[2]), strip(r.arms[0]))).toBeNull();
    expect(new Set(r.ranking.map((x) => x.score)).size).toBe(1);
  });
});
