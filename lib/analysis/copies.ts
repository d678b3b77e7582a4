/**
 * Copies of a configuration 2π apart. A revolute joint whose range exceeds one turn reaches the
 * same link pose at q and at q ± 2π (and further turns) when those stay within its limits; the
 * pose, the Jacobian and the statics are the same for every copy, only the distance to the
 * joint's limits differs. The analysis therefore reports, per joint, the in-limit copy farthest
 * from its limits (nearest the middle of the range), which gives the largest joint-limit margin
 * and hence the largest dexterity margin a solution can have, and says which copy that was.
 */
import type { ArmModel } from "@/lib/kinematics";

const TWO_PI = 2 * Math.PI;
/** Slack (rad) when testing whether a copy is within the limits. */
const COPY_SLACK = 1e-12;

/** One joint with more than one in-limit copy: the value reported and the other copies (rad). */
export interface JointCopyChoice {
  /** 1-based joint. */
  joint: number;
  /** The copy reported (rad): the one nearest the middle of the range. */
  chosen: number;
  /** The other in-limit copies of the same angle (rad), ascending. */
  others: number[];
}

/**
 * The configuration with each revolute joint moved by whole turns to the in-limit copy nearest
 * the middle of its range (ties: the lower value); prismatic joints and joints with a single
 * in-limit copy are unchanged. Returns the configuration (a new array) and the joints that had a
 * choice. Values outside the limits are kept as they are (they have no in-limit copy to choose).
 */
export function centredCopy(model: ArmModel, q: ArrayLike<number>): { q: Float64Array; copies: JointCopyChoice[] } {
  const out = Float64Array.from(q);
  const copies: JointCopyChoice[] = [];
  for (let j = 0; j < model.n; j++) {
    if (model.prismatic[j] === 1) continue;
    const lo = model.lower[j], hi = model.upper[j], v = q[j];
    if (!(hi - lo >= TWO_PI - 2 * COPY_SLACK)) continue;
    const values: number[] = [];
    for (let k = Math.ceil((lo - COPY_SLACK - v) / TWO_PI); v + k * TWO_PI <= hi + COPY_SLACK; k++) values.push(v + k * TWO_PI);
    if (values.length < 2) continue;
    const mid = 0.5 * (lo + hi);
    let best = values[0];
    for (const c of values) if (Math.abs(c - mid) < Math.abs(best - mid)) best = c;
    out[j] = best;
    copies.push({ joint: j + 1, chosen: best, others: values.filter((c) => c !== best) });
  }
  return { q: out, copies };
}
