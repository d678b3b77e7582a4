/**
 * Kinematics benchmark (`npm run bench`): IK success rate and time on three sets of 1000 reachable
 * targets (FK of random in-limit configurations; independent seeds), single attempt and with
 * restarts, FK and Jacobian time per call, and Orocos KDL's LMA solver on the same targets when
 * /usr/bin/python3 can import PyKDL (bench/kdl_ik.py). Timings are wall-clock on this machine and
 * vary with load; they are reported, never asserted.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import {
  computeJacobian,
  createData,
  createModel,
  createRng,
  dhToChain,
  forwardKinematics,
  positionDistance,
  randomConfiguration,
  rotationAngleBetween,
  solveIk,
  withinLimits,
  type ArmKinematics,
  type ArmModel,
  type IkOptions,
} from "@/lib/kinematics";
import { randomArm, SPHERICAL_WRIST_6R } from "@/tests/helpers/arms";

const TARGETS_PER_SET = 1000;

interface TargetSet {
  name: string;
  arms: ArmKinematics[];
  targets: { arm: number; pose: number[] }[];
}

function makeSet(name: string, arms: ArmKinematics[], targetSeed: number): TargetSet {
  const rng = createRng(targetSeed);
  const models = arms.map(createModel);
  const targets: TargetSet["targets"] = [];
  for (let k = 0; k < TARGETS_PER_SET; k++) {
    const i = k % arms.length;
    const data = createData(models[i]);
    forwardKinematics(models[i], data, randomConfiguration(models[i], rng));
    targets.push({ arm: i, pose: Array.from(data.toolPose) });
  }
  return { name, arms, targets };
}

function randomArms(seed: number, n: number): ArmKinematics[] {
  const rng = createRng(seed);
  return Array.from({ length: 20 }, (_, i) => randomArm(rng, { n, convention: i % 2 ? "mdh" : "dh" }));
}

function quantile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))];
}

interface SolveStats {
  rate: number;
  median: number;
  p95: number;
  meanRestarts: number;
}

/** Solves every target; "reached" is re-checked independently by FK of the answer. */
function runIk(set: TargetSet, options: IkOptions): SolveStats {
  const models: ArmModel[] = set.arms.map(createModel);
  const datas = models.map(createData);
  const check = models.map(createData);
  const times: number[] = [];
  let ok = 0, restarts = 0;
  set.targets.forEach((t, k) => {
    const target = Float64Array.from(t.pose);
    const start = performance.now();
    const r = solveIk(models[t.arm], datas[t.arm], target, { ...options, seed: k + 1 });
    times.push(performance.now() - start);
    restarts += r.restarts;
    forwardKinematics(models[t.arm], check[t.arm], r.q);
    const pose = check[t.arm].toolPose;
    if (r.status === "reached" && positionDistance(pose, target) <= 1e-5 && rotationAngleBetween(pose, target) <= 1e-4 && withinLimits(models[t.arm], r.q)) ok++;
  });
  return { rate: ok / set.targets.length, median: quantile(times, 0.5), p95: quantile(times, 0.95), meanRestarts: restarts / set.targets.length };
}

/** Mean time per call (µs) of FK and of the tool-point Jacobian over many random configurations. */
function timeFkJacobian(arm: ArmKinematics): { fk: number; jac: number } {
  const model = createModel(arm);
  const data = createData(model);
  const rng = createRng(99);
  const qs = Array.from({ length: 256 }, () => randomConfiguration(model, rng));
  const J = new Float64Array(6 * model.n);
  const calls = 400_000;
  const measure = (fn: (q: Float64Array) => void) => {
    for (let i = 0; i < 50_000; i++) fn(qs[i & 255]); // warm-up
    let best = Infinity;
    for (let rep = 0; rep < 3; rep++) {
      const start = performance.now();
      for (let i = 0; i < calls; i++) fn(qs[i & 255]);
      best = Math.min(best, ((performance.now() - start) * 1000) / calls);
    }
    return best;
  };
  return {
    fk: measure((q) => forwardKinematics(model, data, q)),
    jac: measure((q) => computeJacobian(model, data, q, J)),
  };
}

interface KdlStats {
  name: string;
  rate: number;
  median: number;
  p95: number;
}

function runKdl(sets: TargetSet[]): KdlStats[] | string {
  const probe = spawnSync("/usr/bin/python3", ["-c", "import PyKDL, numpy"], { encoding: "utf8" });
  if (probe.status !== 0) return "PyKDL not importable by /usr/bin/python3: KDL comparison skipped";
  const dir = mkdtempSync(path.join(tmpdir(), "armsift-bench-"));
  try {
    const input = path.join(dir, "sets.json");
    writeFileSync(input, JSON.stringify({ sets }));
    const r = spawnSync("/usr/bin/python3", [path.join(__dirname, "kdl_ik.py"), input], { encoding: "utf8", maxBuffer: 64 << 20 });
    if (r.status !== 0) return `KDL run failed: ${r.stderr.trim().split("\n").pop()}`;
    const doc = JSON.parse(r.stdout) as { sets: { name: string; reached: number; total: number; timesMs: number[] }[] };
    return doc.sets.map((s) => ({ name: s.name, rate: s.reached / s.total, median: quantile(s.timesMs, 0.5), p95: quantile(s.timesMs, 0.95) }));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const pct = (v: number) => `${(100 * v).toFixed(1)} %`;
const ms = (v: number) => `${v.toFixed(3)} ms`;

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  ");
  return [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n");
}

export async function run(): Promise<void> {
  const sets = [
    makeSet("20 random 6-joint arms", randomArms(6001, 6), 16001),
    makeSet("20 random 7-joint arms", randomArms(7001, 7), 17001),
    makeSet("6R spherical wrist (invented)", [SPHERICAL_WRIST_6R], 18001),
  ];
  console.log(`\nInverse kinematics, ${TARGETS_PER_SET} reachable targets per set (pose mode, 1e-5 m / 1e-4 rad, within limits)`);
  // warm up the JIT on a separate seed so the first set is not penalised
  runIk(makeSet("warm-up", randomArms(5, 6), 5), {});
  const rows: string[][] = [];
  const ours: SolveStats[] = [];
  for (const set of sets) {
    const single = runIk(set, { maxRestarts: 0 });
    const full = runIk(set, {});
    ours.push(full);
    rows.push([set.name, pct(single.rate), ms(single.median), pct(full.rate), ms(full.median), ms(full.p95), full.meanRestarts.toFixed(2)]);
  }
  console.log(table(["set", "1 attempt", "median", "with restarts", "median", "p95", "mean restarts"], rows));

  const kdl = runKdl(sets);
  if (typeof kdl === "string") {
    console.log(`\n${kdl}`);
  } else {
    console.log("\nOrocos KDL ChainIkSolverPos_LMA (equal weights, ≤ 10 random restarts, wrapped into limits), same targets");
    console.log(
      table(
        ["set", "KDL reached", "KDL median", "KDL p95", "median ratio (ours/KDL)"],
        kdl.map((k, i) => [k.name, pct(k.rate), ms(k.median), ms(k.p95), (ours[i].median / k.median).toFixed(3)]),
      ),
    );
  }

  console.log("\nForward kinematics and Jacobian, time per call (best of 3 × 400k calls)");
  const six = timeFkJacobian(SPHERICAL_WRIST_6R);
  const seven = timeFkJacobian(sets[1].arms[0]);
  const sixChain = timeFkJacobian(dhToChain(SPHERICAL_WRIST_6R));
  console.log(
    table(
      ["arm", "FK", "Jacobian (incl. FK)"],
      [
        ["6 joints (spherical wrist)", `${six.fk.toFixed(3)} µs`, `${six.jac.toFixed(3)} µs`],
        ["7 joints (random)", `${seven.fk.toFixed(3)} µs`, `${seven.jac.toFixed(3)} µs`],
        ["6 joints, same arm as a joint chain", `${sixChain.fk.toFixed(3)} µs`, `${sixChain.jac.toFixed(3)} µs`],
      ],
    ),
  );
  console.log("\nTargets: ≥ 99.9 % reached on every set, median IK ≤ 0.5 × KDL, FK ≤ 1 µs and Jacobian ≤ 2 µs for 6 joints (DH table or chain).");
}
