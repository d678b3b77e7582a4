/**
 * Cycle-time benchmark (`npm run bench`, called by bench/run.ts): the synthetic shortlist of the
 * analysis benchmark (8 arms) in its cell of 20 obstacles, and again with the obstacles taken out
 * (the arms' own capsules only), each analysed once; then per arm 3 sequences
 * of 20 move steps over targets it reaches (seeded picks, the analysis' branches, at most 4 per
 * target), and the time the cycle stage adds on top of the analysis:
 * - as the analysis runs it: the branch choice with the moves of the best choice checked in the
 *   cell (a blocked one left out and the choice made again), a fresh move checker each run;
 * - the model alone at exactly 4 branches per target (seeded in-limit configurations, no cell);
 * - every move between branches checked in the cell (the worst case, as when no combination is free).
 * Timings are wall-clock on this machine and vary with load; they are reported, never asserted.
 */
import { performance } from "node:perf_hooks";
import { analyzeShortlist, type ArmAnalysis } from "@/lib/analysis";
import { createArmContext } from "@/lib/analysis/context";
import { analyzeCycle, analyzeCycles, type CycleInputs, type CycleResult } from "@/lib/analysis/cycle";
import { createMoveChecker } from "@/lib/analysis/cycle-cell";
import { createModel, createRng, randomConfiguration } from "@/lib/kinematics";
import { kinematicsOf, type ArmDocument } from "@/shared/schemas/arm";
import { requirementSetSchema, type RequirementSet, type Sequence } from "@/shared/schemas/requirements";
import type { ShortlistArm } from "@/lib/analysis/shortlist";
import { syntheticSet, withCell } from "./analysis";

const TARGET_MS = 50;
const SEQUENCES = 3, STEPS = 20, BRANCHES = 4, RUNS = 5;

/** 3 sequences of 20 move steps over the targets the arm reaches free of collisions, most branches first. */
function sequencesFor(a: ArmAnalysis, req: RequirementSet, seed: number): Sequence[] {
  const usable = req.targets
    .map((t, i) => ({ name: t.name, branches: a.targets[i].reached ? a.targets[i].solutions.filter((s) => s.collisionFree !== false).length : 0 }))
    .filter((t) => t.branches > 0)
    .sort((x, y) => y.branches - x.branches || (x.name < y.name ? -1 : 1))
    .slice(0, 24);
  const rng = createRng(seed);
  return Array.from({ length: SEQUENCES }, (_, k) => ({
    name: `seq${k + 1}`,
    steps: Array.from({ length: STEPS }, () => ({ kind: "move" as const, target: usable[Math.floor(rng() * usable.length)].name, dwell: 0.1 })),
  }));
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

export async function run(): Promise<void> {
  console.log("\n== Cycle-time benchmark ==");
  const cell = withCell(syntheticSet());
  await runCell("in the cell of 20 obstacles", cell.arms, cell.req);
  // the same capsules with no obstacles: only the arm against itself is checked, most moves are free
  await runCell("with the arm's own capsules only (no obstacles)", cell.arms, requirementSetSchema.parse({ ...cell.req, cell: { ...cell.req.cell, obstacles: [] } }));
}

async function runCell(title: string, arms: ShortlistArm[], req: RequirementSet): Promise<void> {
  console.log(`\n-- ${title} --`);
  const t0 = performance.now();
  const analysis = analyzeShortlist(arms, req);
  const analysisMs = performance.now() - t0;
  const perArm = arms.map((entry, i) => {
    const a = analysis.arms[i];
    const seqs = a.error ? [] : sequencesFor(a, req, 900 + i);
    return { entry, a, req: { ...req, sequences: seqs } as RequirementSet };
  }).filter((x) => x.req.sequences!.length > 0);

  // 1. As the analysis runs it (the cell on, lazy checks), RUNS times with fresh checkers.
  const lazy: number[] = [];
  let results: CycleResult[][] = [];
  for (let r = 0; r < RUNS; r++) {
    const ctxs = perArm.map((x) => createArmContext(x.entry.arm, x.req));
    const s = performance.now();
    results = perArm.map((x, i) => analyzeCycles(x.entry.arm, x.a, x.req, createMoveChecker(ctxs[i], x.req)));
    lazy.push(performance.now() - s);
  }
  const all = results.flat();
  const steps = perArm.flatMap((x) => x.req.sequences!.flatMap((q) => q.steps));
  const branchesPerStep = perArm.reduce((s, x) => s + x.req.sequences!.reduce((t, q) => t + q.steps.reduce((u, st) => {
    const i = x.req.targets.findIndex((tg) => st.kind === "move" && tg.name === st.target);
    return u + x.a.targets[i].solutions.filter((sol) => sol.collisionFree !== false).length;
  }, 0), 0), 0) / steps.length;

  // 2. The model alone at exactly 4 branches per target (no cell): the dynamic programme's own cost.
  const modelMs: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const inputs = perArm.map((x, ai) => {
      const model = createModel(kinematicsOf(x.entry.arm as ArmDocument));
      const rng = createRng(31 + ai), q = new Float64Array(model.n);
      const targets = new Map<string, number[][]>();
      for (const t of x.req.targets) targets.set(t.name, Array.from({ length: BRANCHES }, () => { randomConfiguration(model, rng, q); return Array.from(q); }));
      const limits = { n: model.n, maxSpeed: x.entry.arm.joints.map((j) => j.maxSpeed ?? NaN), maxAcceleration: x.entry.arm.joints.map((j) => j.maxAcceleration ?? NaN) };
      return { limits, inputs: { targets, paths: new Map() } as CycleInputs, seqs: x.req.sequences! };
    });
    const s = performance.now();
    for (const x of inputs) for (const q of x.seqs) analyzeCycle(x.limits, q, x.inputs);
    modelMs.push(performance.now() - s);
  }

  // 3. Every move between the branches of consecutive steps checked in the cell (worst case).
  const ctxs = perArm.map((x) => createArmContext(x.entry.arm, x.req));
  let moves = 0, blocked = 0, evaluations = 0;
  const s3 = performance.now();
  perArm.forEach((x, i) => {
    const checker = createMoveChecker(ctxs[i], x.req);
    if (!checker) return;
    const branchesOf = (name: string) => x.a.targets[x.req.targets.findIndex((t) => t.name === name)].solutions.filter((s) => s.collisionFree !== false).map((s) => s.q);
    for (const q of x.req.sequences!) {
      q.steps.forEach((st, k) => {
        const prev = q.steps[(k + q.steps.length - 1) % q.steps.length];
        if (st.kind !== "move" || prev.kind !== "move") return;
        for (const qa of branchesOf(prev.target)) for (const qb of branchesOf(st.target)) {
          if (qa.every((v, j) => v === qb[j])) continue;
          const r = checker.check(qa, qb, { kind: "move", name: prev.target }, { kind: "move", name: st.target });
          moves++; evaluations += r.evaluations;
          if (!r.free) blocked++;
        }
      });
    }
  });
  const eagerMs = performance.now() - s3;

  const timed = all.filter((c) => c.time !== null);
  const checked = all.reduce((s, c) => s + c.movesChecked, 0), left = all.reduce((s, c) => s + c.movesBlocked, 0);
  console.log(`${perArm.length} arms × ${SEQUENCES} sequences × ${STEPS} steps (targets each arm reaches; ${branchesPerStep.toFixed(2)} collision-free branches per step on average), ${req.cell.obstacles.length} obstacles`);
  console.log(`analysis (once, for reference): ${analysisMs.toFixed(0)} ms`);
  console.log(`cycle stage as the analysis runs it (cell on): median ${median(lazy).toFixed(1)} ms, min ${Math.min(...lazy).toFixed(1)} ms over ${RUNS} runs (target ≤ ${TARGET_MS} ms); ${checked} moves checked, ${left} blocked and left out; ${timed.length}/${all.length} cycles found, ${all.length - timed.length} with no free combination`);
  console.log(`model alone at exactly ${BRANCHES} branches per target (no cell): median ${median(modelMs).toFixed(1)} ms, min ${Math.min(...modelMs).toFixed(1)} ms`);
  console.log(`every move between branches checked (worst case): ${eagerMs.toFixed(0)} ms for ${moves} moves (${moves ? ((eagerMs / moves) * 1000).toFixed(0) : 0} µs each, ${moves ? (evaluations / moves).toFixed(1) : 0} configurations evaluated per move), ${blocked} blocked`);
}

if (process.argv[1] && /bench[\\/]cycle\.ts$/.test(process.argv[1])) {
  run().catch((e: unknown) => { console.error(e); process.exitCode = 1; });
}
