/**
 * Analysis benchmark (`npm run bench`, called by bench/run.ts): the demo requirement sets against
 * all demo arms, and a synthetic shortlist of 8 arms × 50 targets × 3 paths of 200 samples,
 * timed cold and per part (IK, dexterity, statics, paths, workspace, spec), with peak memory; then
 * the same shortlist in a cell of 20 obstacles with collision capsules on the arms and the tool
 * (the time against the run without the cell, and cold in a fresh process).
 * Timings are wall-clock on this machine and vary with load; they are reported, never asserted.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";
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

export function syntheticSet(): { arms: ShortlistArm[]; req: RequirementSet } {
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

/**
 * The synthetic shortlist in a cell: capsules derived from the arms' tables (radius 8 % of the arm
 * scale, joint by joint smaller), a tool capsule, and 20 seeded obstacles (boxes, spheres,
 * cylinders, capsules) around the workspace: some in the arms' way, most near it.
 */
export function withCell({ arms, req }: { arms: ShortlistArm[]; req: RequirementSet }): { arms: ShortlistArm[]; req: RequirementSet } {
  const rng = createRng(777);
  const kinds = ["box", "sphere", "cylinder", "capsule"] as const;
  const obstacles = Array.from({ length: 20 }, (_, k) => {
    const ang = rng() * 2 * Math.PI, rad = 0.9 + rng() * 1.1, z = rng() * 1.6;
    const c: [number, number, number] = [rad * Math.cos(ang), rad * Math.sin(ang), z];
    const size = 0.05 + rng() * 0.25;
    const pose = [Math.cos(ang), -Math.sin(ang), 0, c[0], Math.sin(ang), Math.cos(ang), 0, c[1], 0, 0, 1, c[2], 0, 0, 0, 1];
    const name = `obstacle ${k + 1}`;
    switch (kinds[k % 4]) {
      case "box": return { name, shape: "box" as const, pose, size: [size, size * 0.6, size * 1.4] as [number, number, number] };
      case "sphere": return { name, shape: "sphere" as const, center: c, radius: size / 2 };
      case "cylinder": return { name, shape: "cylinder" as const, pose, radius: size / 3, length: size * 2 };
      default: return { name, shape: "capsule" as const, from: c, to: [c[0], c[1], c[2] + size * 2] as [number, number, number], radius: size / 4 };
    }
  });
  const capsuleArms = arms.map((a) => {
    const scale = a.arm.specs?.reach ?? 1;
    return { ...a, arm: { ...a.arm, joints: a.arm.joints.map((j, i) => ({ ...j, radius: 0.06 * scale * (1 - 0.1 * i) })) } as ArmDocument };
  });
  return {
    arms: capsuleArms,
    req: requirementSetSchema.parse({
      ...req,
      tool: { ...req.tool, collision: [{ shape: "capsule", from: [0, 0, 0.03], to: [0, 0, 0.09], radius: 0.025 }] },
      cell: { clearance: 0.01, obstacles },
    }),
  };
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

  // the same shortlist in a cell of 20 obstacles
  const cell = withCell({ arms, req });
  const c = timed(cell.arms, cell.req);
  const cReached = c.result.arms.reduce((s, a) => s + a.targets.filter((t) => t.reached).length, 0);
  const cFollowed = c.result.arms.reduce((s, a) => s + a.paths.filter((p) => p.verdict !== "fails").length, 0);
  const colliding = c.result.arms.reduce((s, a) => s + a.targets.filter((t) => t.cell && !t.cell.collisionFree).length, 0);
  const evaluations = c.result.arms.reduce((s, a) => s + a.paths.reduce((t, p) => t + (p.cell?.evaluations ?? 0), 0), 0);
  const pairs = c.result.arms.reduce((s, a) => s + (a.cell?.checkedPairs ?? 0), 0) / c.result.arms.length;
  console.log(`\nsynthetic in a cell: 20 obstacles, capsules on every link and the tool (${pairs.toFixed(0)} pairs per arm checked)`);
  const cold = coldRun("cell"), coldPlain = coldRun("plain");
  table([
    ["run", "ms"],
    ["without the cell (above)", r.total.toFixed(0)],
    ["with the cell", `${c.total.toFixed(0)} (${(c.total / r.total).toFixed(2)}× the run without; target ≤ 1.5×)`],
    ["with the cell, cold (fresh process)", cold === null ? "–" : `${cold.toFixed(0)} (target ≤ 1500)`],
    ["without the cell, cold (fresh process)", coldPlain === null ? "–" : coldPlain.toFixed(0)],
    ["  of which IK (targets)", `${c.parts.ik.toFixed(0)} (without: ${p.ik.toFixed(0)})`],
    ["  of which dexterity and the cell (targets)", `${c.parts.dexterity.toFixed(0)} (without: ${p.dexterity.toFixed(0)})`],
    ["  of which paths", `${c.parts.paths.toFixed(0)} (without: ${p.paths.toFixed(0)})`],
  ]);
  console.log(`targets reached ${cReached}/${cell.arms.length * cell.req.targets.length} (${colliding} collide in every branch found), paths not failing ${cFollowed}/${cell.arms.length * cell.req.paths.length}; ${evaluations} configurations evaluated between path samples`);
}

/** The synthetic run alone in a fresh process (cold: nothing compiled yet), ms; null when it cannot run. */
function coldRun(which: "cell" | "plain"): number | null {
  if (process.env.ARMSIFT_BENCH_CELL_ONLY) return null;
  const root = path.resolve(__dirname, "..");
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "bench/analysis.ts")], {
    cwd: root, encoding: "utf8", timeout: 300_000, env: { ...process.env, ARMSIFT_BENCH_CELL_ONLY: which },
  });
  const m = /cell-only ms (\d+(\.\d+)?)/.exec(r.stdout ?? "");
  return m ? Number(m[1]) : null;
}

/** Entry of the fresh process: one synthetic run (in the cell, or without), first thing after loading. */
function cellOnly(): void {
  const cell = process.env.ARMSIFT_BENCH_CELL_ONLY === "plain" ? syntheticSet() : withCell(syntheticSet());
  const t0 = performance.now();
  analyzeShortlist(cell.arms, cell.req);
  console.log(`cell-only ms ${(performance.now() - t0).toFixed(1)}`);
}

if (process.argv[1] && /bench[\\/]analysis\.ts$/.test(process.argv[1])) {
  if (process.env.ARMSIFT_BENCH_CELL_ONLY) cellOnly();
  else void run();
}
