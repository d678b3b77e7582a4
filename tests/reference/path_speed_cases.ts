/**
 * Cases for the exact path-speed check: random invented arms (3 to 8 joints, standard and
 * modified DH, some prismatic joints, some joints without a speed limit; base and tool
 * transforms), random straight-line paths analysed by the product (analyzePath), and
 * configurations with joints at, near and just outside a position limit.
 *
 * Only the configurations q and the required twists come from the product here (that is where a
 * path sample's configuration comes from). The reference values are computed from them
 * independently by path_speed_reference.py: Orocos KDL for the Jacobian, scipy's linprog (HiGHS)
 * for the linear program. Run by regenerate.sh (`npx tsx tests/reference/path_speed_cases.ts`);
 * deterministic (seeded), writes tests/reference/fixtures/path_speed_cases.json.
 */
import { writeFileSync } from "node:fs";
import path from "node:path";
import { analyzePath, createArmContext, DEFAULT_PATH_BUDGET, samplePath } from "@/lib/analysis";
import { computeJacobian, createRng, forwardKinematics, randomConfiguration, type ArmKinematics, type Rng } from "@/lib/kinematics";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema, type PathSpec } from "@/shared/schemas/requirements";
import { randomArm } from "../helpers/arms";
import { uniform } from "../helpers/rng";

const OUT = path.resolve(__dirname, "fixtures/path_speed_cases.json");
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const CASE_REQUIREMENTS = requirementSetSchema.parse({
  name: "path speed cases", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, targets: [], paths: [], specs: [],
});
/** Path analysis budget of the cases (fewer samples than the default, same method). */
const CASE_BUDGET = { ...DEFAULT_PATH_BUDGET, maxSamples: 40 };

type Mode = PathSpec["mode"];

type DhArm = Extract<ArmKinematics, { convention: "dh" | "mdh" }>;

function withSpeeds(rng: Rng, arm: DhArm): DhArm {
  return {
    ...arm,
    joints: arm.joints.map((j, i) => {
      if (i > 0 && rng() < 0.12) return j; // no speed limit on the datasheet
      return { ...j, maxSpeed: j.type === "prismatic" ? uniform(rng, 0.15, 0.8) : uniform(rng, 0.6, 3.5) };
    }),
  };
}

function rpyOf(t: ArrayLike<number>): [number, number, number] {
  return [Math.atan2(t[9], t[10]), Math.asin(Math.max(-1, Math.min(1, -t[8]))), Math.atan2(t[4], t[0])];
}

function main(): void {
  const rng = createRng(20241203);
  const arms: DhArm[] = [];
  const paths: { arm: number; seed: number; path: PathSpec }[] = [];
  const samples: { arm: number; kind: "path" | "limit"; path: number | null; index: number | null; mode: Mode; q: number[]; twist: number[] }[] = [];
  // [joints, modes, joints without a speed limit (1-based; besides the random ones)]
  const plan: [number, Mode[], number[]][] = [
    [3, ["point"], []], [4, ["point"], []], [5, ["point", "axis"], []], [6, ["axis", "pose"], []], [6, ["pose", "point"], []],
    [7, ["pose", "axis"], []], [7, ["point", "pose"], []], [8, ["pose"], []], [5, ["axis"], []], [6, ["pose"], []],
    [4, ["point"], [1, 2, 3]], // the unlimited joints alone can carry a point motion: s unbounded
  ];
  plan.forEach(([n, modes, unlimited], a) => {
    const arm = withSpeeds(rng, randomArm(rng, { n, convention: a % 2 ? "mdh" : "dh", prismaticProbability: 0.25 }) as DhArm);
    arm.joints = arm.joints.map((j, i) => (unlimited.includes(i + 1) ? { ...j, maxSpeed: undefined } : j));
    arm.name = `speed case ${a + 1} (${n} joints)`;
    arms.push(arm);
    const doc = armSchema.parse(arm);
    const ctx = createArmContext(doc, CASE_REQUIREMENTS, 1);
    const { model, data } = ctx;
    // Paths: straight lines between the tool poses of two nearby random configurations.
    modes.forEach((mode, p) => {
      const q0 = randomConfiguration(model, rng);
      const q1 = Float64Array.from(q0, (v, j) => {
        const span = model.upper[j] - model.lower[j];
        return Math.min(model.upper[j], Math.max(model.lower[j], v + uniform(rng, -0.15, 0.15) * span));
      });
      forwardKinematics(model, data, q0);
      const t0 = Float64Array.from(data.toolPose);
      forwardKinematics(model, data, q1);
      const t1 = Float64Array.from(data.toolPose);
      const spec: PathSpec = {
        name: `line ${p + 1}`, mode, speed: uniform(rng, 0.1, 0.6), step: 0.01,
        waypoints: [{ position: [t0[3], t0[7], t0[11]], rpy: rpyOf(t0) }, { position: [t1[3], t1[7], t1[11]], rpy: rpyOf(t1) }],
      };
      const seed = 1000 * (a + 1) + p;
      paths.push({ arm: a, seed, path: spec });
      const result = analyzePath(ctx, spec, CASE_BUDGET, seed);
      const sampled = samplePath(spec, CASE_BUDGET.maxSamples).samples;
      result.q.forEach((q, k) => {
        const twist = sampled[k].twist;
        if (q && twist) samples.push({ arm: a, kind: "path", path: paths.length - 1, index: k, mode, q, twist });
      });
    });
    // Configurations at a position limit (exactly, within 0.1 % of the range) and just outside the
    // at-limit band (2 % of the range), with a required twist the arm can make there (J·q̇ for a
    // random q̇) or a random one.
    const jac = new Float64Array(6 * n);
    for (let c = 0; c < 14; c++) {
      const q = randomConfiguration(model, rng);
      const k = Math.min(n - 1, Math.floor(rng() * n));
      const span = model.upper[k] - model.lower[k];
      const offset = [0, 0, 0.001, 0.02][c % 4] * span;
      q[k] = c % 2 ? model.lower[k] + offset : model.upper[k] - offset;
      if (c % 5 === 0) { const k2 = (k + 1) % n; q[k2] = model.lower[k2]; }
      computeJacobian(model, data, q, jac);
      let twist: number[];
      if (c % 3 === 2) {
        twist = Array.from({ length: 6 }, () => uniform(rng, -1, 1));
      } else {
        const qd = Array.from({ length: n }, () => uniform(rng, -1, 1));
        twist = Array.from({ length: 6 }, (_, r) => qd.reduce((acc, v, j) => acc + jac[r * n + j] * v, 0));
      }
      const norm = Math.hypot(twist[0], twist[1], twist[2]) || 1;
      twist = twist.map((v) => (v / norm) * 0.3);
      samples.push({ arm: a, kind: "limit", path: null, index: null, mode: modes[c % modes.length], q: Array.from(q), twist });
    }
  });
  const doc = {
    source: "tests/reference/path_speed_cases.ts (configurations and twists from the product's analyzePath and seeded draws)",
    atLimitFraction: 0.005,
    budget: CASE_BUDGET,
    requirements: CASE_REQUIREMENTS,
    arms, paths, samples,
  };
  writeFileSync(OUT, JSON.stringify(doc, null, 1) + "\n");
  console.error(`wrote ${OUT}: ${arms.length} arms, ${paths.length} paths, ${samples.length} samples`);
}

main();
