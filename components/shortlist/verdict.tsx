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

/** Number with at most `d` decimals, or a dash. */
export function fmtNum(v: number | null | undefined, d = 2): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "–";
  const s = v.toFixed(d);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

/** ISO time as "2026-01-02 03:04 UTC". */
export { utc } from "../time";
