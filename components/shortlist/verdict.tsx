import type { Verdict } from "@/lib/analysis/types";

/** Symbol + word for each verdict: colour is never the only carrier. */
export const VERDICT_SYMBOL: Record<Verdict, string> = { meets: "✓", marginal: "△", fails: "✗", unknown: "?" };

export function VerdictTag({ v, compact = false }: { v: Verdict; compact?: boolean }) {
  return (
    <span className={`verdict v-${v}`}>
      <span aria-hidden="true" className="vsym">
        {VERDICT_SYMBOL[v]}
      </span>{" "}
      {compact ? <span className="vword">{v}</span> : v}
    </span>
  );
}
