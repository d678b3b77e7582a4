/**
 * Placement benchmark (`npm run bench`, called by bench/run.ts): the synthetic shortlist of the
 * analysis benchmark (8 arms × 50 targets) in its cell of 20 obstacles, with a mounting region of
 * 1.0 m × 1.0 m × 0.5 m × 180° of yaw, every arm's placement searched cold in a fresh process:
 * total time, placements evaluated (and abandoned early), time per placement, peak memory.
 * Timings are wall-clock on this machine and vary with load; they are reported, never asserted.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { placeShortlist } from "@/lib/analysis/placement";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { syntheticSet, withCell } from "./analysis";

const TARGET_MS = 20_000;

/** The synthetic set in its cell with the mounting region around the nominal base (the origin). */
function placementSet() {
  const { arms, req } = withCell(syntheticSet());
  const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  return {
    arms,
    req: requirementSetSchema.parse({ ...req, mounting: { region: { x: [-0.5, 0.5], y: [-0.5, 0.5], z: [0, 0.5], yaw: [-Math.PI / 2, Math.PI / 2] }, orientation: I4 } }),
  };
}

/** Entry of the fresh process: the search for every arm, first thing after loading; one JSON line. */
function coldPlacement(): void {
  const { arms, req } = placementSet();
  let peakRss = process.memoryUsage().rss, peakHeap = process.memoryUsage().heapUsed, calls = 0;
  const perArm: number[] = [];
  let armStart = performance.now();
  const t0 = performance.now(), c0 = process.cpuUsage();
  const results = placeShortlist(arms, req, {
    onArm: (i) => { if (i > 0) perArm.push(performance.now() - armStart); armStart = performance.now(); },
    onProgress: () => {
      if (++calls % 8 !== 0) return;
      const m = process.memoryUsage();
      peakRss = Math.max(peakRss, m.rss);
      peakHeap = Math.max(peakHeap, m.heapUsed);
    },
  });
  perArm.push(performance.now() - armStart);
  const total = performance.now() - t0, cu = process.cpuUsage(c0);
  const m = process.memoryUsage();
  console.log(`placement-cold ${JSON.stringify({
    total, cpu: (cu.user + cu.system) / 1000, peakRss: Math.max(peakRss, m.rss), peakHeap: Math.max(peakHeap, m.heapUsed),
    arms: results.map((r, i) => ({ name: arms[i].arm.name, ms: perArm[i], evaluated: r.result?.evaluated ?? 0, pruned: r.result?.pruned ?? 0, reached: r.result?.goal.reached ?? null, targets: req.targets.length, skipped: r.skipped })),
  })}`);
}

export async function run(): Promise<void> {
  console.log("\n== Placement benchmark ==");
  const root = path.resolve(__dirname, "..");
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "bench/placement.ts")], {
    cwd: root, encoding: "utf8", timeout: 600_000, env: { ...process.env, ARMSIFT_BENCH_PLACEMENT_COLD: "1" },
  });
  const line = /placement-cold (.*)/.exec(r.stdout ?? "");
  if (!line) {
    console.log(`placement run failed: ${(r.stderr ?? "").split("\n")[0]}`);
    return;
  }
  const out = JSON.parse(line[1]) as { total: number; cpu: number; peakRss: number; peakHeap: number; arms: { name: string; ms: number; evaluated: number; pruned: number; reached: number | null; targets: number; skipped: string | null }[] };
  const evaluated = out.arms.reduce((s, a) => s + a.evaluated, 0), pruned = out.arms.reduce((s, a) => s + a.pruned, 0);
  console.log("8 arms × 50 targets, 20 obstacles, region 1.0 m × 1.0 m × 0.5 m × 180° yaw, cold, one process");
  const rows: (string | number)[][] = [["arm", "ms", "placements", "abandoned early", "ms/placement", "reached at best"]];
  for (const a of out.arms) rows.push([a.name, a.ms.toFixed(0), a.evaluated, a.pruned, a.evaluated ? (a.ms / a.evaluated).toFixed(2) : "–", a.reached === null ? (a.skipped ?? "–") : `${a.reached}/${a.targets}`]);
  rows.push(["total", `${out.total.toFixed(0)} (target ≤ ${TARGET_MS})`, evaluated, pruned, (out.total / Math.max(1, evaluated)).toFixed(2), ""]);
  const widths = rows[0].map((_, c) => Math.max(...rows.map((x) => String(x[c]).length)));
  for (const x of rows) console.log(x.map((v, c) => String(v).padStart(widths[c])).join("  "));
  console.log(`CPU time of the run ${out.cpu.toFixed(0)} ms (wall-clock above; the two differ when the machine is shared)`);
  console.log(`peak memory: rss ${(out.peakRss / 2 ** 20).toFixed(0)} MiB, heapUsed ${(out.peakHeap / 2 ** 20).toFixed(0)} MiB`);
}

if (process.env.ARMSIFT_BENCH_PLACEMENT_COLD && process.argv[1] && /bench[\\/]placement\.ts$/.test(process.argv[1])) coldPlacement();
