/**
 * The cell along a cycle's moves (docs/design.md#cycle-time): a point-to-point move between two
 * configurations follows the straight line in joint space (all joints start and end together),
 * and it is checked there for collisions by the conservative motion bound of cell.ts. Pure; uses
 * the arm context's cell buffers.
 *
 * ## The bound
 * For a move qa → qb no point of body b moves farther than M_b = Σⱼ Rⱼ,b·|Δqⱼ| (cell.ts, "Motion
 * between configurations"). The move is cut into N = ⌈maxᵦ M_b / 0.25 m⌉ equal joint steps (at
 * least 1), so that no point of any body moves more than 0.25 m between two consecutive
 * configurations; each configuration is checked (the ends first, then in bisection order, so a
 * collision shows early), then each step between two by the motion check,
 * which proves that a pair with end distances d₀, d₁ keeps at least c along the step when
 * (d₀ + d₁ − M)/2 ≥ c, and otherwise halves the step (at most 64 configurations per step). The
 * move is blocked when a configuration along it collides, or when the check could not prove a
 * positive distance within its budget (a stretch left unresolved with a bound of 0): unknown is
 * never a pass. The smallest distance found along the move (exact where evaluated, else the
 * proven bound) is its clearance: below the required clearance it is exact or a proven lower
 * bound; at or above it, the whole move is proven to keep the required clearance (to the check's
 * 0.1 mm tolerance). The required clearance is reported; it does not block a move.
 *
 * ## Contact
 * A move into or out of a target or path whose `contact` list lets the tool and the payload
 * touch an obstacle ends (or starts) touching it: such pairs are not checked along that move
 * (the union of the two ends' lists).
 */
import type { RequirementSet } from "@/shared/schemas/requirements";
import type { ArmContext } from "./context";
import { checkCell, checkMotion, contactMask, pairNames } from "./cell";
import type { MoveCheck, MoveChecker, StepRef } from "./cycle";

/** Most any body point moves between two configurations checked along a move (m). */
export const MOVE_SEGMENT = 0.25;

/** A checker of the moves of one arm in the requirement set's cell; null when nothing is checked. */
export function createMoveChecker(ctx: ArmContext, req: Pick<RequirementSet, "targets" | "paths">): MoveChecker | null {
  const { cell, cellData: cd, model, data } = ctx;
  if (!cell.active) return null;
  const n = cell.n, np = cell.pairs.length;
  const contacts = new Map<string, readonly string[]>();
  for (const t of req.targets) contacts.set(`move:${t.name}`, t.contact ?? []);
  for (const p of req.paths) contacts.set(`path:${p.name}`, p.contact ?? []);
  const masks = new Map<string, Uint8Array | null>();
  const maskOf = (a: StepRef, b: StepRef) => {
    const key = `${a.kind}:${a.name}\u0000${b.kind}:${b.name}`;
    if (!masks.has(key)) {
      const names = [...new Set([...(contacts.get(`${a.kind}:${a.name}`) ?? []), ...(contacts.get(`${b.kind}:${b.name}`) ?? [])])];
      masks.set(key, names.length ? contactMask(cell, names) : null);
    }
    return masks.get(key)!;
  };
  // per-pair distances at each configuration along a move (grown as needed, reused)
  const dist: Float64Array[] = [], exact: Uint8Array[] = [];
  const prev = new Float64Array(n), q = new Float64Array(n);
  const required = cell.clearance;
  // the same move recurs across sequences and visits: checked once
  const memo = new Map<string, MoveCheck>();
  return {
    required,
    check(qa, qb, from, to): MoveCheck {
      const memoKey = `${from.kind}:${from.name}\u0000${to.kind}:${to.name}\u0000${qa.join(",")}\u0000${qb.join(",")}`;
      const known = memo.get(memoKey);
      if (known) return known;
      const r = checkMove(qa, qb, maskOf(from, to));
      memo.set(memoKey, r);
      return r;
    },
  };

  function checkMove(qa: readonly number[], qb: readonly number[], exempt: Uint8Array | null): MoveCheck {
    let maxMotion = 0;
    for (let b = 0; b < n + 3; b++) {
      let m = 0;
      for (let j = 0; j < n; j++) m += cell.motion[b * n + j] * Math.abs(qb[j] - qa[j]);
      if (m > maxMotion) maxMotion = m;
    }
    const steps = Math.max(1, Math.ceil(maxMotion / MOVE_SEGMENT));
    let lowest = Infinity, lowestPair = -1, evaluations = 0;
    const blocked = (pair: number, fraction: number): MoveCheck => {
      const [a, b] = pairNames(cell, pair);
      return { free: false, clearance: 0, closest: { a, b }, hit: { a, b, fraction }, evaluations };
    };
    while (dist.length <= steps) { dist.push(new Float64Array(np)); exact.push(new Uint8Array(np)); }
    // the configurations in bisection order (ends, middle, quarters, …): a collision shows early
    for (const i of bisectionOrder(steps)) {
      const f = i / steps;
      for (let j = 0; j < n; j++) q[j] = qa[j] + f * (qb[j] - qa[j]);
      const c = checkCell(cell, cd, model, data, q, exempt, ctx.check);
      evaluations++;
      if (!c.collisionFree) return blocked(c.collisionPair, f);
      if (c.clearance < lowest) { lowest = c.clearance; lowestPair = c.clearancePair; }
      dist[i].set(cd.pairDistance);
      exact[i].set(cd.pairExact);
    }
    // then the motion between consecutive configurations
    for (let i = 1; i <= steps; i++) {
      for (let j = 0; j < n; j++) { prev[j] = qa[j] + ((i - 1) / steps) * (qb[j] - qa[j]); q[j] = qa[j] + (i / steps) * (qb[j] - qa[j]); }
      const m = checkMotion(cell, cd, model, data, prev, q, dist[i - 1], exact[i - 1], dist[i], exact[i], exempt, required);
      evaluations += m.evaluations;
      if (m.collision) return blocked(m.collision.pair, (i - 1 + m.collision.fraction) / steps);
      if (m.lowest < lowest) { lowest = m.lowest; lowestPair = m.lowestPair; }
      if (m.unresolved && !(m.lowest > 0)) return blocked(m.lowestPair, (i - 0.5) / steps);
    }
    const closest = lowestPair >= 0 ? (([a, b]) => ({ a, b }))(pairNames(cell, lowestPair)) : null;
    return { free: true, clearance: Number.isFinite(lowest) ? lowest : null, closest, hit: null, evaluations };
  }
}

/** 0 … steps with the two ends first, then the middles of the halves, quarters, … (each once). */
function bisectionOrder(steps: number): number[] {
  const out = [0, steps], seen = new Uint8Array(steps + 1);
  seen[0] = seen[steps] = 1;
  let spans: [number, number][] = [[0, steps]];
  while (spans.length) {
    const next: [number, number][] = [];
    for (const [a, b] of spans) {
      if (b - a < 2) continue;
      const mid = (a + b) >> 1;
      if (!seen[mid]) { seen[mid] = 1; out.push(mid); }
      next.push([a, mid], [mid, b]);
    }
    spans = next;
  }
  return out;
}
