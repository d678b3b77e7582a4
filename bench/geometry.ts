/**
 * Distance-query benchmark (`npm run bench`): the median time of one query per shape pair, over
 * random pairs (apart, near and overlapping), on packed shapes with a reused result (the
 * allocation-free path the analysis uses). Times are this process's CPU time per query (user +
 * system, process.cpuUsage), which other work on a shared machine disturbs less than wall-clock
 * time; both vary with load; reported, never asserted.
 */
import { loadavg } from "node:os";
import { createDistanceResult, distancePacked, packShape, STRIDE, type Shape } from "@/lib/geometry";
import { createRng, type Rng } from "@/lib/kinematics";

const PAIRS = 512;
const ROUNDS = 41;
/** Passes over the pairs per timed round (process.cpuUsage has microsecond resolution). */
const REPEAT = 8;

function pose(rng: Rng, p: number[]): number[] {
  // random rotation from a random unit quaternion
  let q: number[];
  do q = [rng() * 2 - 1, rng() * 2 - 1, rng() * 2 - 1, rng() * 2 - 1]; while (Math.hypot(...q) < 0.1 || Math.hypot(...q) > 1);
  const n = Math.hypot(...q);
  const [w, x, y, z] = q.map((v) => v / n);
  return [1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w), p[0], 2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w), p[1], 2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y), p[2], 0, 0, 0, 1];
}

function shape(rng: Rng, kind: Shape["shape"], spread: number): Shape {
  const p = [spread * (rng() - 0.5), spread * (rng() - 0.5), spread * (rng() - 0.5)];
  switch (kind) {
    case "sphere": return { shape: "sphere", center: p, radius: 0.02 + 0.1 * rng() };
    case "capsule": return { shape: "capsule", from: p, to: [p[0] + 0.4 * (rng() - 0.5), p[1] + 0.4 * (rng() - 0.5), p[2] + 0.4 * (rng() - 0.5)], radius: 0.02 + 0.06 * rng() };
    case "box": return { shape: "box", pose: pose(rng, p), size: [0.05 + 0.3 * rng(), 0.05 + 0.3 * rng(), 0.05 + 0.3 * rng()] };
    default: return { shape: "cylinder", pose: pose(rng, p), radius: 0.03 + 0.1 * rng(), length: 0.05 + 0.3 * rng() };
  }
}

/** Median CPU ns per query of `a`–`b` pairs placed at random in a 0.8 m cube. */
function medianNs(a: Shape["shape"], b: Shape["shape"], seed: number): { ns: number; overlap: number } {
  const rng = createRng(seed);
  const A = new Float64Array(STRIDE * PAIRS), B = new Float64Array(STRIDE * PAIRS);
  for (let i = 0; i < PAIRS; i++) {
    packShape(shape(rng, a, 0.8), A, STRIDE * i);
    packShape(shape(rng, b, 0.8), B, STRIDE * i);
  }
  const out = createDistanceResult();
  let overlap = 0, sink = 0;
  for (let i = 0; i < PAIRS; i++) if (distancePacked(A, STRIDE * i, B, STRIDE * i, out) === 0) overlap++;
  const times: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    const c0 = process.cpuUsage();
    for (let rep = 0; rep < REPEAT; rep++) for (let i = 0; i < PAIRS; i++) sink += distancePacked(A, STRIDE * i, B, STRIDE * i, out);
    const c = process.cpuUsage(c0);
    times.push(((c.user + c.system) * 1e3) / (REPEAT * PAIRS));
  }
  if (sink === -1) console.log(sink);
  times.sort((x, y) => x - y);
  return { ns: times[ROUNDS >> 1], overlap: overlap / PAIRS };
}

export async function run(): Promise<void> {
  console.log(`\n== Distance queries (median CPU time per query, ${PAIRS} random pairs per kind, packed shapes; load average ${loadavg()[0].toFixed(1)}) ==`);
  const kinds: Shape["shape"][] = ["sphere", "capsule", "box", "cylinder"];
  const rows: string[][] = [["pair", "median", "overlapping", "target"]];
  const targets: Record<string, string> = { "capsule–capsule": "≤ 100 ns", "capsule–box": "≤ 500 ns" };
  let seed = 1;
  for (let i = 0; i < 4; i++) {
    for (let j = i; j < 4; j++) {
      const name = `${kinds[i]}–${kinds[j]}`;
      const r = medianNs(kinds[i], kinds[j], seed++);
      rows.push([name, `${r.ns.toFixed(0)} ns`, `${(r.overlap * 100).toFixed(0)} %`, targets[name] ?? ""]);
    }
  }
  const w = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  for (const r of rows) console.log(r.map((v, c) => (c === 0 ? v.padEnd(w[c]) : v.padStart(w[c]))).join("  "));
}

if (process.argv[1] && /bench[\\/]geometry\.ts$/.test(process.argv[1])) void run();
