/**
 * Sampled reach envelope: forward kinematics of seeded random in-limit configurations, reduced to
 * an outer boundary in a side view (radius from the base's vertical line vs height, cell frame)
 * and a top view (x-y, cell frame), with the targets placed in both views, and a sampled reach
 * compared with the datasheet's.
 *
 * Sampling finds points inside the envelope only, so the boundary and the reach are lower bounds;
 * a short coordinate search from the farthest samples tightens the reach.
 */
import { createRng, forwardKinematics, jointAxisWorld, randomConfiguration } from "@/lib/kinematics";
import type { ArmContext } from "./context";
import { fixed } from "@/shared/format";

export interface WorkspaceBudget {
  /** Random configurations sampled. */
  samples: number;
  /** Angular bins of the side (elevation, −90°…90°) and top (azimuth, 360°) boundaries. */
  sideBins: number;
  topBins: number;
}
export const DEFAULT_WORKSPACE_BUDGET: WorkspaceBudget = { samples: 8000, sideBins: 72, topBins: 96 };

export interface WorkspaceAnalysis {
  samples: number;
  seed: number;
  /** Arm base origin in the cell frame (m): the centre of both views. */
  origin: number[];
  /** Outer boundary of the TCP in the side view: [r, z] (m), r = horizontal distance from the origin, z = cell height; by elevation angle. */
  side: number[][];
  /** Outer boundary of the TCP in the top view: [x, y] (m, cell frame), by azimuth. */
  top: number[][];
  /** Targets in both views. */
  targets: { name: string; r: number; z: number; x: number; y: number; reached: boolean | null }[];
  /**
   * Largest distance of the flange centre (the arm's tool point) from joint 1's axis found (m) — the way datasheets
   * usually state reach (common practice, no source) — after refinement; a lower bound.
   */
  sampledReach: number;
  /** Datasheet reach (m) or null. */
  datasheetReach: number | null;
  /** sampledReach / datasheetReach, or null. */
  reachRatio: number | null;
  note: string;
}

/** Samples the envelope of one arm (deterministic for a given seed). */
export function analyzeWorkspace(
  ctx: ArmContext,
  datasheetReach: number | undefined,
  targets: { name: string; position: readonly number[]; reached: boolean | null }[],
  budget: WorkspaceBudget,
  seed: number,
): WorkspaceAnalysis {
  const { model, data } = ctx;
  const n = model.n;
  const rng = createRng(seed);
  const q = new Float64Array(n);
  const o = [model.base[3], model.base[7], model.base[11]];
  const side: (number[] | null)[] = new Array(budget.sideBins).fill(null);
  const sideD = new Float64Array(budget.sideBins).fill(-1);
  const top: (number[] | null)[] = new Array(budget.topBins).fill(null);
  const topD = new Float64Array(budget.topBins).fill(-1);
  const reachOf = (qq: Float64Array) => { forwardKinematics(model, data, qq); return flangeAxisDistance(ctx); };
  let bestReach = -1;
  const bestQ = new Float64Array(n);
  for (let k = 0; k < budget.samples; k++) {
    randomConfiguration(model, rng, q);
    forwardKinematics(model, data, q);
    const t = data.toolPose;
    const dx = t[3] - o[0], dy = t[7] - o[1], dz = t[11] - o[2];
    const r = Math.hypot(dx, dy);
    const el = Math.atan2(dz, r); // −π/2 … π/2
    const si = Math.min(budget.sideBins - 1, Math.floor(((el + Math.PI / 2) / Math.PI) * budget.sideBins));
    const ds = Math.hypot(r, dz);
    if (ds > sideD[si]) { sideD[si] = ds; side[si] = [r, t[11]]; }
    const az = Math.atan2(dy, dx); // −π … π
    const ti = Math.min(budget.topBins - 1, Math.floor(((az + Math.PI) / (2 * Math.PI)) * budget.topBins));
    if (r > topD[ti]) { topD[ti] = r; top[ti] = [t[3], t[7]]; }
    const fr = flangeAxisDistance(ctx);
    if (fr > bestReach) { bestReach = fr; bestQ.set(q); }
  }
  // Coordinate search on the farthest sample (step halves when no joint improves).
  if (bestReach >= 0) {
    let stepFrac = 0.05;
    const trial = new Float64Array(n);
    for (let it = 0; it < 40 && stepFrac > 1e-4; it++) {
      let improved = false;
      for (let j = 0; j < n; j++) {
        for (const sgn of [1, -1]) {
          trial.set(bestQ);
          trial[j] = Math.min(model.upper[j], Math.max(model.lower[j], bestQ[j] + sgn * stepFrac * (model.upper[j] - model.lower[j])));
          const r = reachOf(trial);
          if (r > bestReach + 1e-12) { bestReach = r; bestQ.set(trial); improved = true; }
        }
      }
      if (!improved) stepFrac /= 2;
    }
  }
  const tgt = targets.map((t) => {
    const dx = t.position[0] - o[0], dy = t.position[1] - o[1];
    return { name: t.name, r: Math.hypot(dx, dy), z: t.position[2], x: t.position[0], y: t.position[1], reached: t.reached };
  });
  const ds = datasheetReach ?? null;
  const ratio = ds ? bestReach / ds : null;
  const note = ds === null
    ? "the datasheet gives no reach"
    : `sampled flange reach ${fixed(bestReach * 1000, 0)} mm is ${fixed(ratio! * 100, 0)} % of the datasheet's ${fixed(ds * 1000, 0)} mm` +
      (ratio! < 0.9 ? " (check the DH table or the limits: the model reaches less than the datasheet says)" : ratio! > 1.1 ? " (the model reaches farther than the datasheet says: check the DH table)" : "");
  return {
    samples: budget.samples, seed, origin: o,
    side: side.filter((p): p is number[] => p !== null), top: top.filter((p): p is number[] => p !== null),
    targets: tgt, sampledReach: Math.max(0, bestReach), datasheetReach: ds, reachRatio: ratio, note,
  };
}

const axisScratch = new Float64Array(6);

/**
 * Distance from joint 1's axis of the arm's own tool point, the flange centre (after an FK call):
 * TCP pose · tcp⁻¹, i.e. the last link frame · the arm's `tool`, so the flange offset that an `mdh`
 * table or an imported chain keeps in `tool` counts, and a DH table and its equivalent chain give
 * the same reach.
 */
function flangeAxisDistance(ctx: ArmContext): number {
  const { model, data } = ctx;
  const ax = jointAxisWorld(model, data, 1, axisScratch);
  const zx = ax[0], zy = ax[1], zz = ax[2];
  const t = data.toolPose, v = ctx.tcpInverse;
  const fx = t[0] * v[3] + t[1] * v[7] + t[2] * v[11] + t[3];
  const fy = t[4] * v[3] + t[5] * v[7] + t[6] * v[11] + t[7];
  const fz = t[8] * v[3] + t[9] * v[7] + t[10] * v[11] + t[11];
  const rx = fx - ax[3], ry = fy - ax[4], rz = fz - ax[5];
  const along = rx * zx + ry * zy + rz * zz;
  return Math.hypot(rx - along * zx, ry - along * zy, rz - along * zz);
}
