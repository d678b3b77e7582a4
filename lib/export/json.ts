/** The shortlist as JSON: pins, metadata, the ranking used and the full stored analysis. */
import type { RankedArm } from "@/lib/analysis/ranking";
import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import type { ExportMeta } from "./tables";

const SHORTLIST_EXPORT_FORMAT = "armsift-shortlist-1";

export function toShortlistJson(meta: ExportMeta, analysis: ShortlistAnalysis, ranking: readonly RankedArm[]): string {
  return JSON.stringify({ format: SHORTLIST_EXPORT_FORMAT, meta, ranking, analysis }, null, 2) + "\n";
}
