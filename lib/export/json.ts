/**
 * The shortlist as JSON: pins, metadata, the ranking used and the full stored analysis. Written in
 * pieces (the document's head, then one arm at a time), so a result at the schema's limits never
 * becomes one string: a JavaScript string holds at most about 512 MB, and building one that large
 * would hold the server's thread for seconds.
 */
import type { RankedArm } from "@/lib/analysis/ranking";
import type { ArmAnalysis, ShortlistAnalysis } from "@/lib/analysis/shortlist";
import type { ExportMeta } from "./tables";

const SHORTLIST_EXPORT_FORMAT = "armsift-shortlist-1";

/** `json` (an indented JSON text) indented by `by` more spaces after each line break. */
const indent = (json: string, by: string) => json.replace(/\n/g, `\n${by}`);

/**
 * The export's text in pieces: the same document as toShortlistJson (indented by 2), the
 * analysis's fields in the head's order and its arms last, each arm serialised alone.
 */
export async function* shortlistJsonPieces(
  meta: ExportMeta,
  head: Omit<ShortlistAnalysis, "arms">,
  ranking: readonly RankedArm[],
  arms: AsyncIterable<ArmAnalysis> | Iterable<ArmAnalysis>,
): AsyncGenerator<string> {
  const top = JSON.stringify({ format: SHORTLIST_EXPORT_FORMAT, meta, ranking }, null, 2);
  const analysisHead = indent(JSON.stringify(head, null, 2), "  ");
  // both end in "\n}" (top) and "\n  }" (the analysis head): reopen them
  yield `${top.slice(0, -2)},\n  "analysis": ${analysisHead.slice(0, -4)},\n    "arms": [`;
  let first = true;
  for await (const a of arms) {
    yield `${first ? "" : ","}\n      ${indent(JSON.stringify(a, null, 2), "      ")}`;
    first = false;
  }
  yield `${first ? "" : "\n    "}]\n  }\n}\n`;
}

export function toShortlistJson(meta: ExportMeta, analysis: ShortlistAnalysis, ranking: readonly RankedArm[]): string {
  return JSON.stringify({ format: SHORTLIST_EXPORT_FORMAT, meta, ranking, analysis }, null, 2) + "\n";
}
