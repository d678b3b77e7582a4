// Designed outcomes of the demo scenarios (which seed arms reach which targets and follow which
// paths), checked through the product's analysis (analyzeShortlist) on the seed data: first in free
// space (the cell's obstacles and every collision shape left out, the question the numpy screen
// below answers), then in the cell (obstacles, link capsules, tool and payload shapes).
//
// Independent source: tests/seed-data/check_scenarios.py, a numpy/scipy screen
// (scipy.optimize.least_squares bounded by the joint limits, 24 seeded random starts per target,
// continuation along each path every 20 mm; run with /usr/bin/python3, slow, not part of npm test).
// EXPECTED below is the same table as that script's EXPECTED; a target or path absent from an
// arm's entry is left free there and here. On the current seed data both screens agree on every
// (arm, target) and (arm, path) cell of both scenarios, not only on the designed ones.
import { describe, expect, it } from "vitest";
import { analyzeShortlist, DEFAULT_BUDGET, type ShortlistAnalysis } from "@/lib/analysis";
import { createArmContext } from "@/lib/analysis/context";
import { forwardKinematics } from "@/lib/kinematics";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet } from "@/shared/schemas/requirements";

/** Reached (true) or missed (false) per arm and target/path name; "*" stands for every one. */
const EXPECTED: Record<string, Record<string, Record<string, boolean>>> = {
  "Bench assembly: sensor housing press-fit": {
    "Helper Seven 7": { "close-in-nest": false, "feeder-pick": true, "press-fit": true, "tray-far-corner": true },
    "Reach Cobot 10": { "*": true },
    "Overhead Six 6": { "*": true },
    "Table SCARA 600": {
      "feeder-pick": true, "fixture-place": true, "press-fit": true, "tray-far-corner": false,
      "tilted-screw": false, "side-bore-insert": false, "label-camera": false,
    },
    "Compact Six 3": { "tray-far-corner": false },
    // URDF-authored arms (seed-data/urdf): screened here only; check_scenarios.py reads the DH arm files.
    "Offset Wrist 8": { "*": true },
    "Bench Six 5": { "feeder-pick": true, "press-fit": true, "tray-far-corner": false, "close-in-nest": false },
  },
  "Deburring cell: cast pump-cover seam": {
    "Foundry Six 12": { "*": true },
    "Table SCARA 600": { "gate-stub": false, "bore-chamfer": false, "back-edge": false, "top-seam": false, "front-edge-chamfer": false },
    "Overhead Six 6": { "top-seam": false },
    "Helper Seven 7": { "top-seam": false },
    "Offset Wrist 8": { "front-edge-chamfer": true, "back-edge": false },
    "Bench Six 5": { "top-seam": false, "gate-stub": false },
  },
};

/** R = Rz(yaw)·Ry(pitch)·Rx(roll), row-major (docs/design.md#orientation-input), written out here. */
function rpyMatrix([r, p, y]: readonly number[]): number[] {
  const [cr, sr, cp, sp, cy, sy] = [Math.cos(r), Math.sin(r), Math.cos(p), Math.sin(p), Math.cos(y), Math.sin(y)];
  return [cy * cp, cy * sp * sr - sy * cr, cy * sp * cr + sy * sr, sy * cp, sy * sp * sr + cy * cr, sy * sp * cr - cy * sr, -sp, cp * sr, cp * cr];
}

/**
 * Orientation error (rad) of a 4×4 pose against a target rotation: the angle between the tool z
 * axes in "axis" mode, the angle of R_goal·Rᵀ in "pose" mode (atan2 of the axis-vector norm and the
 * trace, accurate at small angles).
 */
function orientationError(pose: ArrayLike<number>, goal: number[], mode: "axis" | "pose"): number {
  const R = [pose[0], pose[1], pose[2], pose[4], pose[5], pose[6], pose[8], pose[9], pose[10]];
  if (mode === "axis") {
    const a = [R[2], R[5], R[8]], b = [goal[2], goal[5], goal[8]];
    const cross = Math.hypot(a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]);
    return Math.atan2(cross, a[0] * b[0] + a[1] * b[1] + a[2] * b[2]);
  }
  // E = goal · Rᵀ
  const E = (i: number, j: number) => goal[3 * i] * R[3 * j] + goal[3 * i + 1] * R[3 * j + 1] + goal[3 * i + 2] * R[3 * j + 2];
  const v = Math.hypot(E(2, 1) - E(1, 2), E(0, 2) - E(2, 0), E(1, 0) - E(0, 1));
  return Math.atan2(v / 2, (E(0, 0) + E(1, 1) + E(2, 2) - 1) / 2);
}

const arms = loadSeedArms();
const reqs = loadSeedRequirementSets();
// The workspace envelope plays no part in reachability: a small sample keeps the test fast.
const budget = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 200 } };
/** The same arms and requirement sets with no collision geometry at all (free space). */
const freeArms = arms.map((a): ArmDocument => ({ ...a, baseCollision: undefined, ignoredPairs: undefined, joints: a.joints.map((j) => ({ ...j, collision: undefined, radius: undefined })) } as ArmDocument));
const freeReq = (r: RequirementSet): RequirementSet => ({ ...r, cell: { obstacles: [], clearance: r.cell.clearance }, tool: { ...r.tool, collision: undefined }, payload: { ...r.payload, collision: undefined } });
const results = new Map<string, ShortlistAnalysis>(
  reqs.map((req) => [req.name, analyzeShortlist(freeArms.map((arm, i) => ({ id: `seed-${i}`, revision: 1, arm })), freeReq(req), { budget })]),
);
const inCell = new Map<string, ShortlistAnalysis>(
  reqs.map((req) => [req.name, analyzeShortlist(arms.map((arm, i) => ({ id: `seed-${i}`, revision: 1, arm })), req, { budget })]),
);

describe("demo scenarios: designed reachability", () => {
  it("the scenarios and arms named in EXPECTED exist in the seed data", () => {
    for (const [scenario, byArm] of Object.entries(EXPECTED)) {
      const req = reqs.find((r) => r.name === scenario);
      expect(req, scenario).toBeDefined();
      const tasks = [...req!.targets.map((t) => t.name), ...req!.paths.map((p) => p.name)];
      for (const [armName, want] of Object.entries(byArm)) {
        expect(arms.map((a) => a.name), scenario).toContain(armName);
        for (const name of Object.keys(want)) if (name !== "*") expect(tasks, `${scenario} / ${armName}`).toContain(name);
      }
    }
  });

  for (const [scenario, byArm] of Object.entries(EXPECTED)) {
    it(`${scenario}: every designed outcome holds`, () => {
      const result = results.get(scenario)!;
      const req = reqs.find((r) => r.name === scenario)!;
      const mismatches: string[] = [];
      let checked = 0;
      for (const [armName, want] of Object.entries(byArm)) {
        const a = result.arms.find((x) => x.name === armName)!;
        expect(a.error, armName).toBeNull();
        // A target counts as reached when the analysis found an IK solution within the target's own
        // tolerances; a path as followed when every sample was reached (as in check_scenarios.py).
        const got: [string, boolean, string][] = [
          ...a.targets.map((t): [string, boolean, string] => [t.name, t.reached, t.reason]),
          ...a.paths.map((p): [string, boolean, string] => [p.name, p.reached === p.samples, `${p.reached}/${p.samples} samples; ${p.reason}`]),
        ];
        expect(got).toHaveLength(req.targets.length + req.paths.length);
        for (const [name, reached, why] of got) {
          const expected = want[name] ?? want["*"];
          if (expected === undefined) continue;
          checked++;
          if (expected !== reached) mismatches.push(`${armName} / ${name}: expected ${expected ? "reached" : "missed"}, got ${why}`);
        }
      }
      expect(mismatches).toEqual([]);
      expect(checked).toBeGreaterThanOrEqual(10);
    });
  }

  it("every reached target's chosen solution is within the joint limits and puts the TCP on the target (forward kinematics)", () => {
    let verified = 0;
    for (const req of reqs) {
      const result = results.get(req.name)!;
      result.arms.forEach((a, ai) => {
        const ctx = createArmContext(arms[ai], req);
        a.targets.forEach((t, ti) => {
          if (!t.reached) return;
          const spec = req.targets[ti];
          const q = t.solutions[t.chosen!].q;
          arms[ai].joints.forEach((j, k) => {
            expect(q[k]).toBeGreaterThanOrEqual(j.min - 1e-9);
            expect(q[k]).toBeLessThanOrEqual(j.max + 1e-9);
          });
          forwardKinematics(ctx.model, ctx.data, q);
          const pose = ctx.data.toolPose;
          const dp = Math.hypot(pose[3] - spec.position[0], pose[7] - spec.position[1], pose[11] - spec.position[2]);
          expect(dp, `${a.name} / ${t.name} position`).toBeLessThanOrEqual(spec.positionTolerance);
          if (spec.mode !== "point") {
            const angle = orientationError(pose, rpyMatrix(spec.rpy), spec.mode);
            expect(angle, `${a.name} / ${t.name} orientation`).toBeLessThanOrEqual(spec.rotationTolerance);
          }
          verified++;
        });
      });
    }
    expect(verified).toBeGreaterThan(30);
  });
});

describe("demo scenarios: designed outcomes in the cell", () => {
  const arm = (scenario: string, name: string) => inCell.get(reqs.find((r) => r.name.startsWith(scenario))!.name)!.arms.find((a) => a.name === name)!;
  const free = (scenario: string, name: string) => results.get(reqs.find((r) => r.name.startsWith(scenario))!.name)!.arms.find((a) => a.name === name)!;

  it("the cell only takes away: whatever is reached or followed in the cell is so in free space too", () => {
    for (const [name, result] of inCell) {
      result.arms.forEach((a, i) => {
        const f = results.get(name)!.arms[i];
        a.targets.forEach((t, k) => { if (t.reached) expect(f.targets[k].reached, `${a.name} / ${t.name}`).toBe(true); });
        a.paths.forEach((p, k) => { if (p.reached === p.samples && p.cell?.collisionFree) expect(f.paths[k].reached, `${a.name} / ${p.name}`).toBe(f.paths[k].samples); });
      });
    }
  });

  it("the URDF-authored arms keep their designed reach in the bench cell: their housings and the bench are modelled without a false overlap", () => {
    const bench = arm("Bench", "Bench Six 5");
    for (const name of ["feeder-pick", "press-fit"]) expect(bench.targets.find((x) => x.name === name)!.reached, `Bench Six 5 / ${name}`).toBe(true);
    const offset = arm("Bench", "Offset Wrist 8");
    for (const t of offset.targets) expect(t.reached, `Offset Wrist 8 / ${t.name}: ${t.reason}`).toBe(true);
    // the spherical wrist's forearm and hand housings share its centre: set aside, never reported as a collision
    for (const t of [...bench.targets, ...offset.targets]) expect(t.reason).not.toMatch(/link \d hits link \d/);
  });

  it("an arm that reaches a target in free space but not in the cell: the industrial arm's forearm hits the feeder hopper", () => {
    const t = arm("Bench", "Foundry Six 12").targets.find((x) => x.name === "feeder-pick")!;
    expect(free("Bench", "Foundry Six 12").targets.find((x) => x.name === "feeder-pick")!.reached).toBe(true);
    expect(t.reached).toBe(false);
    expect(t.verdict).toBe("fails");
    expect(t.cell!.collisionFree).toBe(false);
    expect(t.cell!.collision).toMatchObject({ a: "link 4", b: "feeder hopper" });
    expect(t.reason).toMatch(/every branch found collides .*link 4 hits 'feeder hopper', overlap \d/);
  });

  it("an arm whose best-dexterity branch collides and whose next branch is free: the offset-wrist cobot at the feeder", () => {
    const t = arm("Bench", "Reach Cobot 10").targets.find((x) => x.name === "feeder-pick")!;
    expect(t.reached).toBe(true);
    const best = t.solutions.reduce((b, s, i) => (s.margin > t.solutions[b].margin ? i : b), 0);
    expect(t.solutions[best].collisionFree).toBe(false);
    expect(t.solutions[t.chosen!].collisionFree).toBe(true);
    expect(t.chosen).not.toBe(best);
    expect(t.reason).toMatch(/branches collide \(link \d hits 'feeder hopper'.*chose a collision-free one over the best-dexterity one/);
  });

  it("a path that collides midway: the cobot's forearm meets the coolant nozzle on the top seam", () => {
    const p = arm("Deburring", "Reach Cobot 10").paths.find((x) => x.name === "top-seam")!;
    expect(p.reached).toBe(p.samples); // every sample reached by the kinematics
    expect(p.verdict).toBe("fails");
    const c = p.cell!.firstCollision!;
    expect(c).toMatchObject({ b: "coolant nozzle" });
    expect(c.s / p.length).toBeGreaterThan(0.25);
    expect(c.s / p.length).toBeLessThan(0.85);
    expect(p.reason).toMatch(/collides (at sample|between samples) .*along the path: link \d hits 'coolant nozzle'/);
    // the industrial arm follows the same seam clear of everything, with the motion between samples checked
    const f = arm("Deburring", "Foundry Six 12").paths.find((x) => x.name === "top-seam")!;
    expect(f.cell!.collisionFree).toBe(true);
    expect(f.verdict).not.toBe("fails");
  });
});

describe("demo scenarios: designed cycle times (docs/design.md#cycle-time)", () => {
  const arm = (scenario: string, name: string) => inCell.get(reqs.find((r) => r.name.startsWith(scenario))!.name)!.arms.find((a) => a.name === name)!;
  const cycle = (scenario: string, name: string) => arm(scenario, name).cycles[0];

  it("both cells carry a looped sequence with a required cycle time", () => {
    const bench = reqs.find((r) => r.name.startsWith("Bench"))!.sequences!;
    const deburr = reqs.find((r) => r.name.startsWith("Deburring"))!.sequences!;
    expect(bench.map((q) => [q.name, q.required])).toEqual([["pick-place-press", 3.6]]);
    expect(bench[0].steps.map((s) => (s.kind === "move" ? s.target : s.kind))).toEqual(["feeder-pick", "fixture-place", "press-fit"]);
    expect(deburr.map((q) => [q.name, q.required])).toEqual([["load-deburr-unload", 14.5]]);
    expect(deburr[0].steps.map((s) => (s.kind === "move" ? s.target : s.kind === "path" ? s.path : s.kind))).toEqual(["spindle-home", "wait", "front-edge-chamfer", "gate-stub", "spindle-home", "wait"]);
  });

  it("an arm that reaches everything but misses the cycle: the offset-wrist URDF cobot in the bench cell (an estimate)", () => {
    const a = arm("Bench", "Offset Wrist 8");
    expect(a.targets.every((t) => t.reached)).toBe(true);
    const c = cycle("Bench", "Offset Wrist 8");
    expect(c.verdict).toBe("fails");
    expect(c.time!).toBeGreaterThan(3.6);
    expect(c.estimate).toBe(true); // its file states no acceleration limits
    expect(a.subScores.cycleTime.value).toBeLessThan(0.5);
  });

  it("the overhead arm reaches everything and meets the cycle, from its own acceleration limits (not an estimate)", () => {
    const c = cycle("Bench", "Overhead Six 6");
    expect(arm("Bench", "Overhead Six 6").targets.every((t) => t.reached)).toBe(true);
    expect(c.verdict).toBe("meets");
    expect(c.estimate).toBe(false);
    expect(c.time!).toBeLessThan(3.6);
    expect(arm("Bench", "Overhead Six 6").subScores.cycleTime.value).toBeGreaterThan(0.5);
  });

  it("an arm that reaches every target but whose sequence has no collision-free combination: the offset-wrist cobot's hand meets the feeder hopper leaving the pick", () => {
    expect(arm("Bench", "Reach Cobot 10").targets.every((t) => t.reached)).toBe(true);
    const c = cycle("Bench", "Reach Cobot 10");
    expect(c).toMatchObject({ time: null, verdict: "fails" });
    expect(c.blocked).toMatchObject({ step: 2, kind: "move", name: "fixture-place", b: "feeder hopper" });
    expect(arm("Bench", "Reach Cobot 10").subScores.cycleTime.value).toBe(0);
  });

  it("deburring: the industrial arm meets the cycle; the offset-wrist cobot follows the chamfer but misses it", () => {
    expect(cycle("Deburring", "Foundry Six 12")).toMatchObject({ verdict: "meets", estimate: false });
    const cobot = cycle("Deburring", "Reach Cobot 10");
    expect(cobot.verdict).toBe("fails");
    expect(cobot.time!).toBeGreaterThan(14.5);
  });

  it("every cycle is the sum of its steps, each recomputed from the returned configurations, and its moves are free in the cell", async () => {
    const { effectiveLimits, moveTime } = await import("@/lib/analysis/cycle");
    const { checkCell, contactMask, createCellCheck } = await import("@/lib/analysis/cell");
    let checked = 0;
    for (const req of reqs) {
      for (const a of inCell.get(req.name)!.arms) {
        const doc = arms.find((x) => x.name === a.name)!;
        const lim = effectiveLimits({ n: doc.joints.length, maxSpeed: doc.joints.map((j) => j.maxSpeed ?? NaN), maxAcceleration: doc.joints.map((j) => j.maxAcceleration ?? NaN) });
        const ctx = createArmContext(doc, req);
        a.cycles.forEach((c, i) => {
          if (c.time === null) return;
          const seq = req.sequences![i];
          let sum = 0;
          c.steps.forEach((s, k) => {
            const before = c.steps[(k + c.steps.length - 1) % c.steps.length].q;
            const st = seq.steps[k];
            if (st.kind === "wait") { expect(s.q).toEqual(before); sum += st.seconds; return; }
            const p = st.kind === "path" ? a.paths[req.paths.findIndex((x) => x.name === st.path)] : null;
            const entry = p ? p.q[0]! : s.q;
            const follow = p ? p.length / (p.speed.required * Math.min(1, p.speed.achievableFraction!)) : 0;
            const t = moveTime(lim, before, entry) + (st.kind === "move" ? st.dwell ?? 0 : follow);
            expect(s.time, `${a.name} / ${c.name} step ${k + 1}`).toBeCloseTo(t, 9);
            sum += t;
            // the move, sampled every 1/400 of the way, touches nothing (the contact lists of both ends lifted)
            const contactOf = (x: (typeof seq.steps)[number]) => (x.kind === "move" ? req.targets.find((t) => t.name === x.target)!.contact ?? [] : x.kind === "path" ? req.paths.find((t) => t.name === x.path)!.contact ?? [] : []);
            let j0 = (k + seq.steps.length - 1) % seq.steps.length;
            while (seq.steps[j0].kind === "wait") j0 = (j0 + seq.steps.length - 1) % seq.steps.length;
            const exempt = contactMask(ctx.cell, [...contactOf(st), ...contactOf(seq.steps[j0])]);
            for (let f = 0; f <= 400; f++) {
              const q = before.map((x, j) => x + (f / 400) * (entry[j] - x));
              expect(checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, exempt, createCellCheck()).collisionFree, `${a.name} / ${c.name} step ${k + 1} at ${f}/400`).toBe(true);
            }
            checked++;
          });
          expect(c.time).toBeCloseTo(sum, 9);
        });
      }
    }
    expect(checked).toBeGreaterThan(10);
  });
});
