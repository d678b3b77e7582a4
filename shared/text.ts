/**
 * Cleans a name shown to others (arm, requirement set, target, path, shortlist, account and guest
 * names, link labels): Unicode NFKC, control and format characters removed (NUL, bidirectional
 * overrides such as U+202E, zero-width joiners, private-use and unassigned code points), runs of
 * blanks collapsed to one space, trimmed. The result is still plain text; React escapes it where
 * it is shown.
 */
export function cleanName(name: string): string {
  return name
    .normalize("NFKC")
    .replace(/[\p{Cc}\p{Cf}\p{Co}\p{Cn}]/gu, "")
    .replace(/\s+/g, " ")
    .trim();
}
