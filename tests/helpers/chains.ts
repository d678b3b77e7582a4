/**
 * Invented general joint chains for tests: a seeded random-chain generator (rotated origins,
 * non-aligned axes, prismatic joints). All values invented; none describes a real product.
 */
import type { ChainArmKinematics } from "@/lib/kinematics";
import { randomTransform } from "./arms";
import { uniform, type Rng } from "./rng";

type ChainJoint = ChainArmKinematics["joints"][number];
const DEG = Math.PI / 180;

/** A unit vector: one of the frame axes (±) half of the time, else uniform on the sphere. */
export function randomAxis(rng: Rng): [number, number, number] {
  if (rng() < 0.5) {
    const k = Math.floor(rng() * 3), s = rng() < 0.5 ? -1 : 1;
    const v: [number, number, number] = [0, 0, 0];
    v[k] = s;
    return v;
  }
  const z = uniform(rng, -1, 1), t = uniform(rng, -Math.PI, Math.PI), r = Math.sqrt(1 - z * z);
  return [r * Math.cos(t), r * Math.sin(t), z];
}

export interface RandomChainOptions {
  n: number;
  /** Probability that a joint is prismatic (default 0.15). */
  prismaticProbability?: number;
  /** Add a random base and tool transform (default true). */
  baseAndTool?: boolean;
}

/** A random chain: origins with offsets up to 0.4 m per axis and any rpy, random axes, limits ±(90..180)°. */
export function randomChain(rng: Rng, options: RandomChainOptions): ChainArmKinematics {
  const pp = options.prismaticProbability ?? 0.15;
  const joints: ChainJoint[] = [];
  for (let i = 0; i < options.n; i++) {
    const prismatic = i > 0 && rng() < pp;
    const origin = {
      xyz: [uniform(rng, -0.4, 0.4), uniform(rng, -0.4, 0.4), uniform(rng, -0.4, 0.4)] as [number, number, number],
      rpy: [uniform(rng, -Math.PI, Math.PI), uniform(rng, -Math.PI / 2, Math.PI / 2), uniform(rng, -Math.PI, Math.PI)] as [number, number, number],
    };
    const axis = randomAxis(rng);
    if (prismatic) joints.push({ type: "prismatic", origin, axis, min: 0, max: uniform(rng, 0.1, 0.3) });
    else joints.push({ type: "revolute", origin, axis, min: -uniform(rng, 90, 180) * DEG, max: uniform(rng, 90, 180) * DEG });
  }
  const arm: ChainArmKinematics = { name: `random-chain-${options.n}`, convention: "chain", joints };
  if (options.baseAndTool ?? true) {
    arm.base = randomTransform(rng, 0.3);
    arm.tool = randomTransform(rng, 0.15);
  }
  return arm;
}
