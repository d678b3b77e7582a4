/** Shared small types of the analysis results (JSON-serialisable). */

/**
 * Verdict of one (arm, target), (arm, path) or (arm, requirement) pair (docs/design.md#verdicts):
 * `meets`, `marginal` (met, but close to a limit or with a caveat), `fails`, or `unknown` (data
 * missing: never a silent pass).
 */
export type Verdict = "meets" | "marginal" | "fails" | "unknown";

/** Order used when verdicts are combined: the worst part decides. */
const VERDICT_SEVERITY: Record<Verdict, number> = { meets: 0, marginal: 1, unknown: 2, fails: 3 };

/** The worse of two verdicts by {@link VERDICT_SEVERITY}. */
export function worseVerdict(a: Verdict, b: Verdict): Verdict {
  return VERDICT_SEVERITY[b] > VERDICT_SEVERITY[a] ? b : a;
}

