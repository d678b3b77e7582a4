/**
 * Seeded pseudo-random numbers: mulberry32 (Tommy Ettinger's 32-bit generator, public domain,
 * as popularised in the PractRand-tested list of small JavaScript PRNGs; from memory). Not for
 * cryptography; fast, 2³² period, deterministic across platforms (uses only 32-bit integer ops).
 */

/** A generator of numbers uniform in [0, 1). */
export type Rng = () => number;

/**
 * Creates a mulberry32 generator from a seed (any number; its low 32 bits are used).
 * Same seed ⇒ same sequence. Does not allocate per call.
 */
export function createRng(seed: number): Rng {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
