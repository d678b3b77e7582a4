/**
 * Distance-query benchmark (`npm run bench`): the median time of one query per shape pair, and of
 * one full collision check of a six-axis arm with tool and payload among 20 obstacles, over
 * random pairs (apart, near and overlapping), on packed shapes with a reused result (the
 * allocation-free path the analysis uses). Times are this process's CPU time per query (user +
 * system, process.cpuUsage), which other work on a shared machine disturbs less than wall-clock
 * time; both vary with load; reported, never asserted.
 */
import { loadavg } from "node:os";
import { createDistanceResult, distancePacked as distancePackedImport, packShape, type Shape } from "@/lib/geometry";
import { createRng, randomConfiguration, type Rng } from "@/lib/kinematics";
import { checkCell, createCellCheck } from "@/lib/analysis/cell";
import { createArmContext } from "@/lib/analysis/context";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { CAPSULE_6R_JOINTS } from "../tests/helpers/arms";

const PAIRS = 512;
// Local bindings, as the analysis uses them (an imported binding is a getter call on every use).
const STRIDE = 24;
const distancePacked = distancePackedImport;
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

/**
 * One full check (forward kinematics, placing every shape, every pair) of an invented six-axis arm
 * with capsules on the base and every link, a tool (capsule and box) and a payload, among 20
 * obstacles: median CPU µs per check over random configurations.
 */
function fullCheck(): { us: number; pairs: number; colliding: number } {
  const arm = armSchema.parse({
    name: "Bench six", convention: "dh",
    baseCollision: [{ from: [0, 0, 0.07], to: [0, 0, 0.12], radius: 0.065 }],
    joints: CAPSULE_6R_JOINTS,
  });
  const rng = createRng(20);
  const obstacles = Array.from({ length: 20 }, (_, k) => {
    const ang = rng() * 2 * Math.PI, rad = 0.5 + rng() * 0.8, z = rng() * 1.2, size = 0.05 + rng() * 0.25;
    const c = [rad * Math.cos(ang), rad * Math.sin(ang), z];
    const pose = [Math.cos(ang), -Math.sin(ang), 0, c[0], Math.sin(ang), Math.cos(ang), 0, c[1], 0, 0, 1, c[2], 0, 0, 0, 1];
    const name = `obstacle ${k + 1}`;
    return [
      { name, shape: "box", pose, size: [size, size * 0.6, size * 1.4] },
      { name, shape: "sphere", center: c, radius: size / 2 },
      { name, shape: "cylinder", pose, radius: size / 3, length: size * 2 },
      { name, shape: "capsule", from: c, to: [c[0], c[1], c[2] + 2 * size], radius: size / 4 },
    ][k % 4];
  });
  const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  const req = requirementSetSchema.parse({
    name: "Bench cell", base: I, targets: [], paths: [], specs: [],
    tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.12, 0, 0, 0, 1], mass: 0, cog: [0, 0, 0], collision: [{ from: [0, 0, 0.03], to: [0, 0, 0.08], radius: 0.025 }, { shape: "box", pose: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], size: [0.05, 0.02, 0.04] }] },
    payload: { mass: 0, cog: [0, 0, 0], collision: [{ from: [0, 0, 0], to: [0, 0, 0.03], radius: 0.02 }] },
    cell: { obstacles },
  });
  const ctx = createArmContext(arm, req);
  const qs = Array.from({ length: 256 }, () => Float64Array.from(randomConfiguration(ctx.model, rng)));
  const out = createCellCheck();
  let colliding = 0;
  for (const q of qs) if (!checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, null, out).collisionFree) colliding++;
  const times: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    const c0 = process.cpuUsage();
    for (let rep = 0; rep < 8; rep++) for (const q of qs) checkCell(ctx.cell, ctx.cellData, ctx.model, ctx.data, q, null, out);
    const c = process.cpuUsage(c0);
    times.push((c.user + c.system) / (8 * qs.length));
  }
  times.sort((x, y) => x - y);
  return { us: times[ROUNDS >> 1], pairs: ctx.cell.pairs.length, colliding: colliding / qs.length };
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
  const f = fullCheck();
  console.log(`full check of a six-axis arm with tool and payload among 20 obstacles (${f.pairs} pairs, ${(f.colliding * 100).toFixed(0)} % of the configurations colliding): median ${f.us.toFixed(2)} µs CPU per check (target ≤ 10 µs)`);
}

if (process.argv[1] && /bench[\\/]geometry\.ts$/.test(process.argv[1])) void run();
