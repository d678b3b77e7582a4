/**
 * Invented arms for tests and benchmarks: a seeded random-arm generator and a few hand-checkable
 * arms. All values are invented; none describes a real product.
 */
import type { DhArmKinematics } from "@/lib/kinematics";
import { mat4FromPositionRpy } from "@/lib/kinematics";
import { pick, uniform, type Rng } from "./rng";

type Joint = DhArmKinematics["joints"][number];
const DEG = Math.PI / 180;

export interface RandomArmOptions {
  n: number;
  convention: "dh" | "mdh";
  /** Probability that a joint is prismatic (default 0.15). */
  prismaticProbability?: number;
  /** Add a random base and tool transform (default true). */
  baseAndTool?: boolean;
}

/** A random rigid transform with translation in ±`reach` and any rotation (rpy uniform). */
export function randomTransform(rng: Rng, reach: number): number[] {
  const m = mat4FromPositionRpy(
    new Float64Array(16),
    [uniform(rng, -reach, reach), uniform(rng, -reach, reach), uniform(rng, -reach, reach)],
    [uniform(rng, -Math.PI, Math.PI), uniform(rng, -Math.PI / 2, Math.PI / 2), uniform(rng, -Math.PI, Math.PI)],
  );
  return Array.from(m);
}

/**
 * A reasonable random arm: link lengths a, d in 0.05–0.5 m (some zero), twists mostly from
 * {0, ±90°, 180°} with some arbitrary ones, revolute limits ±(90..180)°, prismatic ranges 0 to
 * 0.1–0.3 m.
 */
export function randomArm(rng: Rng, options: RandomArmOptions): DhArmKinematics {
  const pp = options.prismaticProbability ?? 0.15;
  const joints: Joint[] = [];
  for (let i = 0; i < options.n; i++) {
    const prismatic = i > 0 && rng() < pp;
    const alpha = rng() < 0.75 ? pick(rng, [0, Math.PI / 2, -Math.PI / 2, Math.PI]) : uniform(rng, -Math.PI, Math.PI);
    const a = rng() < 0.3 ? 0 : uniform(rng, 0.05, 0.5);
    const d = rng() < 0.4 ? 0 : uniform(rng, 0.05, 0.5) * (rng() < 0.2 ? -1 : 1);
    const theta = rng() < 0.5 ? 0 : uniform(rng, -Math.PI, Math.PI);
    if (prismatic) {
      joints.push({ type: "prismatic", a, alpha, d, theta, min: 0, max: uniform(rng, 0.1, 0.3) });
    } else {
      const lo = -uniform(rng, 90, 180) * DEG;
      const hi = uniform(rng, 90, 180) * DEG;
      joints.push({ type: "revolute", a, alpha, d, theta, min: lo, max: hi });
    }
  }
  const arm: DhArmKinematics = { name: `random-${options.convention}-${options.n}`, convention: options.convention, joints };
  if (options.baseAndTool ?? true) {
    arm.base = randomTransform(rng, 0.3);
    arm.tool = randomTransform(rng, 0.15);
  }
  return arm;
}

/** Planar arm with revolute joints and link lengths `l` (m), standard DH, z out of the plane. */
export function planarArm(l: readonly number[], limit = Math.PI): DhArmKinematics {
  return {
    name: `planar-${l.length}R`,
    convention: "dh",
    joints: l.map((a) => ({ type: "revolute" as const, a, alpha: 0, d: 0, theta: 0, min: -limit, max: limit })),
  };
}

/**
 * Invented 6R arm with a spherical wrist (axes 4, 5, 6 meet in one point), standard DH, limits of
 * a typical shoulder-elbow-wrist layout. Values invented for this project.
 */
export const SPHERICAL_WRIST_6R: DhArmKinematics = {
  name: "invented 6R spherical wrist",
  convention: "dh",
  joints: [
    { type: "revolute", a: 0.12, alpha: -Math.PI / 2, d: 0.38, theta: 0, min: -170 * DEG, max: 170 * DEG },
    { type: "revolute", a: 0.42, alpha: 0, d: 0, theta: -Math.PI / 2, min: -120 * DEG, max: 140 * DEG },
    { type: "revolute", a: 0.06, alpha: -Math.PI / 2, d: 0, theta: 0, min: -150 * DEG, max: 160 * DEG },
    { type: "revolute", a: 0, alpha: Math.PI / 2, d: 0.44, theta: 0, min: -180 * DEG, max: 180 * DEG },
    { type: "revolute", a: 0, alpha: -Math.PI / 2, d: 0, theta: 0, min: -125 * DEG, max: 125 * DEG },
    { type: "revolute", a: 0, alpha: 0, d: 0.09, theta: 0, min: -350 * DEG, max: 350 * DEG },
  ],
  tool: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.12, 0, 0, 0, 1],
};

/**
 * Joint table of an invented spherical-wrist 6R arm in standard DH with a collision radius (m) on
 * every joint, for cell and collision checks (the capsules come from the table). Values invented
 * for this project.
 */
export const CAPSULE_6R_JOINTS = [
  { type: "revolute", a: 0.1, alpha: -90 * DEG, d: 0.4, theta: 0, min: -3, max: 3, radius: 0.07 },
  { type: "revolute", a: 0.45, alpha: 0, d: 0, theta: -90 * DEG, min: -2, max: 2, radius: 0.06 },
  { type: "revolute", a: 0.05, alpha: -90 * DEG, d: 0, theta: 0, min: -2.5, max: 2.5, radius: 0.05 },
  { type: "revolute", a: 0, alpha: 90 * DEG, d: 0.42, theta: 0, min: -3, max: 3, radius: 0.045 },
  { type: "revolute", a: 0, alpha: -90 * DEG, d: 0, theta: 0, min: -2, max: 2, radius: 0.04 },
  { type: "revolute", a: 0, alpha: 0, d: 0.08, theta: 0, min: -6, max: 6, radius: 0.035 },
] as const;
