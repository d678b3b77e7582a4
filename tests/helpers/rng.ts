/** Seeded randomness for tests and benchmarks (the library's mulberry32, plus a few draws). */
import { createRng, type Rng } from "@/lib/kinematics";

export { createRng, type Rng };

/** Uniform in [lo, hi). */
export function uniform(rng: Rng, lo: number, hi: number): number {
  return lo + (hi - lo) * rng();
}

/** One element of `items`, uniformly. */
export function pick<T>(rng: Rng, items: readonly T[]): T {
  return items[Math.min(items.length - 1, Math.floor(rng() * items.length))];
}
