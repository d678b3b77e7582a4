/**
 * Analysis benchmark (`npm run bench`, called by bench/run.ts): the demo requirement sets against
 * all demo arms, and a synthetic shortlist of 8 arms × 50 targets × 3 paths of 200 samples,
 * timed cold and per part (IK, dexterity, statics, paths, workspace, spec), with peak memory.
 * Timings are wall-clock on this machine and vary with load; they are reported, never asserted.
 */
import { performance } from "node:perf_hooks";
import { analyzeShortlist, type ShortlistArm } from "@/lib/analysis";
import { createData, createModel, createRng, forwardKinematics, randomConfiguration, type Rng } from "@/lib/kinematics";
import type { ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet } from "@/shared/schemas/requirements";

const TARGET_MS = 2000;

/** An invented six-axis arm with a spherical wrist, scaled by `s` (lengths in m). */
function syntheticArm(rng: Rng, index: number): ArmDocument {
  const s = 0.6 + rng() * 0.9;
  const r = (lo: number, hi: number) => lo + rng() * (hi - lo);
  const j = (a: number, alpha: number, d: number, theta: number, lim: number, speed: number, torque: number, mass: number, com: [number, number, number]) =>
    ({ type: "revolute" as const, a, alpha, d, theta, min: -lim, max: lim, maxSpeed: speed, maxTorque: torque, mass, com });
  const m = 10 * s ** 3;
  return {
    name: `Synthetic six ${index + 1}`, maker: "Bench", convention: "dh",
    joints: [
      j(0.15 * s, -Math.PI / 2, 0.45 * s, 0, r(2.6, 3.1), 3, 900 * s ** 4, m * 1.8, [0, 0.05 * s, 0]),
      j(0.6 * s * r(0.8, 1.2), 0, 0, -Math.PI / 2, r(1.8, 2.4), 3, 800 * s ** 4, m * 1.2, [-0.3 * s, 0, 0.08 * s]),
      j(0.12 * s, -Math.PI / 2, 0, 0, r(2.2, 2.8), 3.5, 300 * s ** 4, m * 0.7, [0, 0, 0.05 * s]),
      j(0, Math.PI / 2, 0.55 * s * r(0.8, 1.2), 0, 3.1, 5, 60 * s ** 3, m * 0.3, [0, -0.1 * s, 0]),
      j(0, -Math.PI / 2, 0, 0, 2.1, 5, 50 * s ** 3, m * 0.15, [0, 0, 0]),
      j(0, 0, 0.1 * s, 0, 6, 7, 30 * s ** 3, m * 0.04, [0, 0, -0.02 * s]),
    ],
    specs: { ratedPayload: Math.round(10 * s ** 3), reach: 1.35 * s, ipCode: index % 2 ? "IP54" : "IP67", mounting: ["floor", "ceiling"], price: Math.round(20000 + 30000 * s), currency: "EUR",
      wristAllowables: [{ joint: 4, moment: 30 * s ** 3, inertia: 1.0 * s ** 4 }, { joint: 5, moment: 30 * s ** 3, inertia: 1.0 * s ** 4 }, { joint: 6, moment: 15 * s ** 3, inertia: 0.5 * s ** 4 }] },
  };
}

/** Poses (position + rpy) of the TCP at random in-limit configurations of `arm`. */
function reachablePoses(arm: ArmDocument, rng: Rng, count: number, near?: number): { position: [number, number, number]; rpy: [number, number, number] }[] {
  const model = createModel(arm);
  const data = createData(model);
  const q = new Float64Array(model.n);
  randomConfiguration(model, rng, q);
  const out = [];
  for (let k = 0; k < count; k++) {
    if (near === undefined) randomConfiguration(model, rng, q);
    else for (let i = 0; i < model.n; i++) q[i] = Math.min(model.upper[i], Math.max(model.lower[i], q[i] + near * (rng() - 0.5)));
    forwardKinematics(model, data, q);
    const t = data.toolPose;
    const pitch = Math.asin(Math.max(-1, Math.min(1, -t[8])));
    out.push({ position: [t[3], t[7], t[11]] as [number, number, number], rpy: [Math.atan2(t[9], t[10]), pitch, Math.atan2(t[4], t[0])] as [number, number, number] });
  }
  return out;
}

function syntheticSet(): { arms: ShortlistArm[]; req: RequirementSet } {
  const rng = createRng(4242);
  const docs = Array.from({ length: 8 }, (_, i) => syntheticArm(rng, i));
  const ref = docs[0];
  const modes = ["pose", "axis", "point"] as const;
  const targets = reachablePoses(ref, rng, 45).map((p, i) => ({
    name: `t${i + 1}`, ...p, mode: modes[i % 3], positionTolerance: 1e-5, rotationTolerance: 1e-4,
    ...(i % 7 === 3 ? { force: [0, 0, -80] as [number, number, number] } : {}),
  }));
  for (let i = 0; i < 5; i++) targets.push({ name: `far${i + 1}`, position: [3 + i, 0.5, 1], rpy: [Math.PI, 0, 0], mode: "axis", positionTolerance: 1e-5, rotationTolerance: 1e-4 });
  const paths = [0, 1, 2].map((k) => {
    const wps = reachablePoses(ref, rng, 3, 0.35);
    let len = 0;
    for (let i = 1; i < wps.length; i++) len += Math.hypot(...wps[i].position.map((v, c) => v - wps[i - 1].position[c]));
    return { name: `path${k + 1}`, waypoints: wps, mode: modes[k], step: len / 199 + 1e-9, speed: 0.25 };
  });
  const req = requirementSetSchema.parse({
    name: "Synthetic benchmark set",
    base: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1],
    tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 1, cog: [0, 0, 0.05], inertia: [0.002, 0.002, 0.001] },
    payload: { mass: 2, cog: [0.02, 0, 0.03], inertia: [0.003, 0.003, 0.002] },
    targets, paths,
    specs: [
      { field: "ipCode", comparator: "atLeast", value: "IP65", priority: "must" },
      { field: "reach", comparator: "atLeast", value: 0.9, priority: "want" },
      { field: "collaborative", comparator: "equals", value: false, priority: "want" },
      { field: "price", comparator: "atMost", value: 45000, priority: "want" },
    ],
  });
  return { arms: docs.map((arm, i) => ({ id: `syn-${i + 1}`, revision: 1, arm })), req };
}

function table(rows: (string | number)[][]): void {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => String(r[c]).length)));
  for (const r of rows) console.log(r.map((v, c) => String(v).padStart(widths[c])).join("  "));
}

function timed(arms: ShortlistArm[], req: RequirementSet) {
  const parts: Record<string, number> = {};
  let peakRss = process.memoryUsage().rss, peakHeap = process.memoryUsage().heapUsed;
  const t0 = performance.now();
  const result = analyzeShortlist(arms, req, {
    now: () => performance.now(),
    timer: (stage, ms) => { parts[stage] = (parts[stage] ?? 0) + ms; },
    onProgress: () => {
      const m = process.memoryUsage();
      peakRss = Math.max(peakRss, m.rss);
      peakHeap = Math.max(peakHeap, m.heapUsed);
    },
  });
  const total = performance.now() - t0;
  const m = process.memoryUsage();
  return { result, total, parts, peakRss: Math.max(peakRss, m.rss), peakHeap: Math.max(peakHeap, m.heapUsed) };
}

export async function run(): Promise<void> {
  console.log("\n== Analysis benchmark ==");
  try {
    const { loadSeedArms, loadSeedRequirementSets } = await import("@/seed-data");
    const arms = loadSeedArms().map((arm, i) => ({ id: `demo-${i + 1}`, revision: 1, arm }));
    const rows: (string | number)[][] = [["demo requirement set", "arms", "targets", "paths", "ms", "reached", "best arm"]];
    for (const req of loadSeedRequirementSets()) {
      const r = timed(arms, req);
      const reached = r.result.arms.reduce((s, a) => s + a.targets.filter((t) => t.reached).length, 0);
      const best = r.result.arms.find((a) => a.id === r.result.ranking[0].armId)!;
      rows.push([req.name.slice(0, 40), arms.length, req.targets.length, req.paths.length, r.total.toFixed(0), `${reached}/${arms.length * req.targets.length}`, best.name]);
    }
    table(rows);
  } catch (e) {
    console.log(`demo sets skipped: ${(e as Error).message}`);
  }
  const { arms, req } = syntheticSet();
  const r = timed(arms, req);
  const samples = r.result.arms.reduce((s, a) => s + a.paths.reduce((t, p) => t + p.samples, 0), 0);
  const reached = r.result.arms.reduce((s, a) => s + a.targets.filter((t) => t.reached).length, 0);
  const followed = r.result.arms.reduce((s, a) => s + a.paths.filter((p) => p.reached === p.samples).length, 0);
  console.log(`\nsynthetic: ${arms.length} arms × ${req.targets.length} targets × ${req.paths.length} paths (${samples} path samples in all), cold, single process`);
  const p = r.parts;
  table([
    ["part", "ms"],
    ["IK (targets)", p.ik.toFixed(0)],
    ["dexterity (targets)", p.dexterity.toFixed(0)],
    ["statics (targets)", p.statics.toFixed(0)],
    ["paths", p.paths.toFixed(0)],
    ["workspace", p.workspace.toFixed(0)],
    ["spec", p.spec.toFixed(1)],
    ["total", `${r.total.toFixed(0)} (target ≤ ${TARGET_MS})`],
  ]);
  console.log(`targets reached ${reached}/${arms.length * req.targets.length}, paths followed ${followed}/${arms.length * req.paths.length}; JSON ${(JSON.stringify(r.result).length / 1e6).toFixed(2)} MB`);
  console.log(`peak memory: rss ${(r.peakRss / 2 ** 20).toFixed(0)} MiB, heapUsed ${(r.peakHeap / 2 ** 20).toFixed(0)} MiB`);
}

if (process.argv[1] && /bench[\\/]analysis\.ts$/.test(process.argv[1])) void run();
