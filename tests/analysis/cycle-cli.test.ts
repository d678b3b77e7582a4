import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

const root = path.resolve(__dirname, "../..");
function cli(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "cli/armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

// Planar 2R arm (z out of the plane), link lengths 1 m and 0.8 m; invented limits.
const L1 = 1, L2 = 0.8, V = [1.5, 2.5], A = [4, 10];
const dir = mkdtempSync(path.join(tmpdir(), "armsift-cycle-"));
const armFile = path.join(dir, "arm.json");
writeFileSync(armFile, JSON.stringify({
  name: "planar 2R", convention: "dh",
  joints: [L1, L2].map((a, j) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: V[j], maxAcceleration: A[j] })),
}));
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const PICK = [1.2, 0.5], PLACE = [-0.4, 1.3];
const reqFile = path.join(dir, "req.json");
writeFileSync(reqFile, JSON.stringify({
  name: "pick and place", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
  targets: [{ name: "pick", position: [...PICK, 0], rpy: [0, 0, 0], mode: "point" }, { name: "place", position: [...PLACE, 0], rpy: [0, 0, 0], mode: "point" }],
  paths: [], specs: [],
  sequences: [{ name: "loop", required: 2, steps: [{ kind: "move", target: "pick", dwell: 0.3 }, { kind: "move", target: "place", dwell: 0.2 }, { kind: "wait", seconds: 0.5 }] }],
}));

/** Closed-form 2R inverse kinematics, both elbows (Craig ch. 4, common practice). */
function ik([x, y]: number[], elbow: 1 | -1): number[] {
  const c2 = (x * x + y * y - L1 * L1 - L2 * L2) / (2 * L1 * L2);
  const q2 = elbow * Math.acos(c2);
  return [Math.atan2(y, x) - Math.atan2(L2 * Math.sin(q2), L1 + L2 * Math.cos(q2)), q2];
}
/** Trapezoidal or triangular rest-to-rest time (docs/references.md#biagiotti-and-melchiorri-trajectory-planning), synchronised. */
function move(qa: number[], qb: number[]): number {
  return Math.max(...qa.map((_, j) => {
    const d = Math.abs(qb[j] - qa[j]);
    return d >= (V[j] * V[j]) / A[j] ? d / V[j] + V[j] / A[j] : 2 * Math.sqrt(d / A[j]);
  }));
}

describe("command line: cycle (docs/cli.md#cycle)", { timeout: 60_000 }, () => {
  it("prints each sequence's time, its steps with q and the limiting joint, the least over the branches", () => {
    const r = cli("cycle", "--arm", armFile, "--requirements", reqFile);
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.sequences).toHaveLength(1);
    const s = out.sequences[0];
    expect(s.name).toBe("loop");
    expect(s.steps.map((x: { kind: string; name: string }) => [x.kind, x.name])).toEqual([["move", "pick"], ["move", "place"], ["wait", "wait"]]);
    const [pick, place, wait] = s.steps.map((x: { q: number[] }) => x.q);
    // The tool point is on the target (forward kinematics of the 2R arm).
    const fk = (q: number[]) => [L1 * Math.cos(q[0]) + L2 * Math.cos(q[0] + q[1]), L1 * Math.sin(q[0]) + L2 * Math.sin(q[0] + q[1])];
    expect(fk(pick)[0]).toBeCloseTo(PICK[0], 4); expect(fk(pick)[1]).toBeCloseTo(PICK[1], 4);
    expect(fk(place)[0]).toBeCloseTo(PLACE[0], 4); expect(fk(place)[1]).toBeCloseTo(PLACE[1], 4);
    expect(wait).toEqual(place);
    // Steps recomputed from the returned q (closed cycle: start at the last step's q), and summed.
    const times = [move(wait, pick) + 0.3, move(pick, place) + 0.2, 0.5];
    s.steps.forEach((x: { time: number }, i: number) => expect(x.time).toBeCloseTo(times[i], 6));
    expect(s.time).toBeCloseTo(times[0] + times[1] + times[2], 6);
    expect(s.steps[2].limitingJoint).toBeNull();
    expect([1, 2]).toContain(s.steps[0].limitingJoint);
    // Brute force over both elbows of both targets (closed-form IK).
    let best = Infinity;
    for (const e1 of [1, -1] as const) for (const e2 of [1, -1] as const) {
      const a = ik(PICK, e1), b = ik(PLACE, e2);
      best = Math.min(best, move(b, a) + 0.3 + move(a, b) + 0.2 + 0.5);
    }
    expect(s.time).toBeCloseTo(best, 4);
    expect(s.verdict).toBe(s.time <= 2 ? "meets" : "fails");
    expect(s.estimate).toBe(false);
  });

  it("errors exit 2 with one line naming the field", () => {
    const bad = path.join(dir, "bad.json");
    writeFileSync(bad, JSON.stringify({ name: "x", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, targets: [], paths: [], specs: [], sequences: [{ name: "s", steps: [{ kind: "move", target: "nowhere" }] }] }));
    const r = cli("cycle", "--arm", armFile, "--requirements", bad);
    expect(r.code).toBe(2);
    expect(r.err.trim()).toBe(`--requirements ${bad}: sequences.0.steps.0.target: sequence "s" step 1 moves to target "nowhere", but the set has no target of that name`);
  });
});
