/**
 * The stored form of a result (docs/design.md#stored-results): what a finished run keeps of
 * {@link analyzeShortlist}'s output, so that a shortlist at the schema's limits stores a bounded
 * amount. Pure and deterministic, like the analysis:
 * - each path's per-sample profiles and joint values keep at most {@link PROFILE_POINTS} samples:
 *   both ends, the worst sample of every profile (lowest σ_min, dexterity margin, speed ratios and
 *   clearance), the first unreached sample, the limiting-speed sample and the first collision and
 *   flip, then per stretch of the path the sample with the lowest dexterity margin; `profile.index`
 *   gives each kept sample's place among the path's `samples`;
 * - each path's event lists (flips, restarts, limit hits) keep their first {@link EVENTS_KEPT}
 *   entries, and `eventCounts` says how many there were;
 * - every non-integer number keeps {@link STORED_DIGITS} significant digits (relative 5·10⁻⁸:
 *   below 0.1 µm on a joint value of a metre-scale arm, far below the 10 µm default tolerance);
 * - the ranking is recomputed from the stored sub-scores, so the page's live re-ranking of the
 *   stored result and the stored ranking agree exactly.
 * The verdicts, reasons, counts and every figure computed over all samples (minimum margin, speed
 * ratio, clearance, cycle times) are taken from the full analysis before anything is dropped.
 */
import type { PathAnalysis } from "./paths";
import { rerank, type ArmAnalysis, type ShortlistAnalysis } from "./shortlist";

/** Samples kept per path profile at most (the sample count of a path is up to its budget's maxSamples, 1000). */
export const PROFILE_POINTS = 100;
/** Entries kept per event list of a path (flips, restarts, limit hits). */
export const EVENTS_KEPT = 20;
/** Significant digits kept of every non-integer number. */
export const STORED_DIGITS = 7;

/** Index of the smallest non-null value, or -1. */
function argMin(xs: readonly (number | null)[] | undefined): number {
  let best = -1, v = Infinity;
  if (!xs) return -1;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    if (x !== null && x < v) { v = x; best = i; }
  }
  return best;
}

/**
 * The samples a path keeps (sorted original indices, at most `maxPoints`): the ends, the worst
 * sample of each profile and the events named in the module comment, then, in equal stretches of
 * the path, the sample of lowest dexterity margin of each stretch (its first sample where none is
 * reached), and evenly spread samples where a stretch's pick was kept already.
 */
export function keptSamples(p: PathAnalysis, maxPoints = PROFILE_POINTS): number[] {
  const n = p.profile.s.length;
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  const must = new Set<number>([0, n - 1]);
  const pr = p.profile;
  for (const xs of [pr.sigmaMinTranslation, pr.dexterityMargin, pr.speedRatio, pr.trajectorySpeedRatio, pr.clearance]) {
    const k = argMin(xs);
    if (k >= 0) must.add(k);
  }
  for (const k of [p.firstUnreached?.index, p.speed.limitingSample, p.cell?.firstCollision?.index, p.flips[0]?.index]) {
    if (typeof k === "number" && k >= 0 && k < n) must.add(k);
  }
  const buckets = Math.max(0, maxPoints - must.size);
  const kept = new Set(must);
  for (let b = 0; b < buckets && kept.size < maxPoints; b++) {
    const lo = Math.floor((b * n) / buckets), hi = Math.floor(((b + 1) * n) / buckets);
    let pick = lo, v = Infinity;
    for (let i = lo; i < hi; i++) {
      const m = pr.dexterityMargin[i];
      if (m !== null && m < v) { v = m; pick = i; }
    }
    kept.add(pick);
  }
  // where a stretch's pick was already kept, fill up with evenly spread samples
  for (let pass = 1; kept.size < maxPoints && pass <= n; pass *= 2) {
    const free = maxPoints - kept.size;
    for (let j = 0; j < free * pass && kept.size < maxPoints; j++) kept.add(Math.floor(((j + 0.5) * n) / (free * pass)));
  }
  return [...kept].sort((a, b) => a - b).slice(0, maxPoints);
}

/** A path with its profiles and joint values at the kept samples and its event lists cut. */
export function compactPath(p: PathAnalysis, maxPoints = PROFILE_POINTS): PathAnalysis {
  const idx = keptSamples(p, maxPoints);
  const at = <T>(xs: readonly T[] | undefined): T[] => (xs ? idx.map((i) => xs[i]) : []);
  const pr = p.profile;
  // a path already in its stored form keeps its own places among the samples
  const places = pr.index ? idx.map((i) => pr.index![i]) : idx;
  return {
    ...p,
    flips: p.flips.slice(0, EVENTS_KEPT),
    restarts: p.restarts.slice(0, EVENTS_KEPT),
    limitHits: p.limitHits.slice(0, EVENTS_KEPT),
    eventCounts: p.eventCounts ?? { flips: p.flips.length, restarts: p.restarts.length, limitHits: p.limitHits.length },
    profile: {
      index: places,
      s: at(pr.s),
      sigmaMinTranslation: at(pr.sigmaMinTranslation),
      dexterityMargin: at(pr.dexterityMargin),
      speedRatio: at(pr.speedRatio),
      trajectorySpeedRatio: at(pr.trajectorySpeedRatio),
      clearance: at(pr.clearance),
    },
    q: at(p.q),
  };
}

/** Every non-integer finite number of a JSON value with `digits` significant digits (a new value). */
export function roundNumbers<T>(value: T, digits = STORED_DIGITS): T {
  const walk = (v: unknown): unknown => {
    if (typeof v === "number") return Number.isFinite(v) && !Number.isInteger(v) ? Number(v.toPrecision(digits)) : v;
    if (Array.isArray(v)) return v.map(walk);
    if (v && typeof v === "object") {
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v)) out[k] = walk(x);
      return out;
    }
    return v;
  };
  return walk(value) as T;
}

/** One arm in its stored form. */
export function compactArm(a: ArmAnalysis): ArmAnalysis {
  return roundNumbers({ ...a, paths: a.paths.map((p) => compactPath(p)) });
}

/** A whole result in its stored form (see the module comment). */
export function compactResult(r: ShortlistAnalysis): ShortlistAnalysis {
  const arms = r.arms.map(compactArm);
  const rest = roundNumbers({ ...r, arms: [], ranking: [] });
  return { ...rest, weights: r.weights, arms, ranking: rerank({ arms }, r.weights) };
}
