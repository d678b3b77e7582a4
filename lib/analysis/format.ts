/** Number formatting for the reason sentences (display units: mm, degrees, N, N·m, kg). */
export const mm = (m: number): string => `${trim(m * 1000, m * 1000 < 10 ? 2 : 1)} mm`;
export const deg = (rad: number): string => `${trim((rad * 180) / Math.PI, 1)}°`;
export const num = (v: number, d = 2): string => trim(v, d);
export const pct = (fraction: number): string => `${trim(fraction * 100, 0)} %`;

function trim(v: number, d: number): string {
  if (!Number.isFinite(v)) return "–";
  const s = v.toFixed(d);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

/** An obstacle's name in quotes for a reason; arm bodies ("base", "link 3", "tool", "payload") as they are. */
export function quoteBody(name: string): string {
  return /^(base|tool|payload|link \d+)$/.test(name) ? name : `'${name}'`;
}
