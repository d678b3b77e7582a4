/** ISO time as "2026-01-02 03:04 UTC"; a dash when there is none. */
export function utc(iso: string | Date | null | undefined): string {
  if (!iso) return "–";
  const d = typeof iso === "string" ? new Date(iso) : iso;
  return d.toISOString().slice(0, 16).replace("T", " ") + " UTC";
}
