/**
 * Cleans a display name (guests' names on a comment link): Unicode NFKC, control and format
 * characters (bidirectional overrides, zero-width joiners) removed, blanks collapsed, trimmed.
 * The result is still plain text; React escapes it where it is shown.
 */
export function cleanDisplayName(name: string): string {
  return name
    .normalize("NFKC")
    .replace(/[\p{Cc}\p{Cf}\p{Co}\p{Cn}]/gu, "")
    .replace(/\s+/g, " ")
    .trim();
}
