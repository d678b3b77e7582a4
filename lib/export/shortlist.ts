/**
 * A shortlist's export assembled from a stored result: the ranking (recomputed when the weights
 * asked for differ from the stored ones), the metadata every format states, and the file in the
 * chosen format. Pure apart from the XLSX writer's promise: no database, no HTTP.
 */
import type { Weights } from "@/shared/schemas/requirements";
import { SUB_SCORES } from "@/shared/sub-scores";
import { rerank, type ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { complianceTable, cycleStepsTable, cycleTable, rankingTable, taskMatrixTable, type ExportMeta } from "./tables";
import { toCsv } from "./csv";
import { toXlsx } from "./xlsx";
import { toShortlistJson } from "./json";
import { fileStem, type ExportFile } from "./files";

interface ShortlistExportRequest {
  shortlist: { id: string; name: string };
  run: { id: string; finishedAt: Date | null; requirement: { setId: string; revision: number } };
  analysis: ShortlistAnalysis;
  format: "csv" | "xlsx" | "json";
  /** Which table a CSV holds (default ranking). */
  table?: "ranking" | "compliance" | "cycle";
  /** Weights to rank with; the stored ones when absent. */
  weights?: Weights;
  exportedAt: Date;
}

export async function shortlistExport(r: ShortlistExportRequest): Promise<ExportFile> {
  const { analysis } = r;
  const weights = r.weights ?? analysis.weights;
  const adjusted = SUB_SCORES.keys.some((k) => weights[k] !== analysis.weights[k]);
  const ranking = adjusted ? rerank(analysis, weights) : analysis.ranking;
  const meta: ExportMeta = {
    shortlist: { id: r.shortlist.id, name: r.shortlist.name },
    run: { id: r.run.id, finishedAt: r.run.finishedAt ? r.run.finishedAt.toISOString() : null },
    analysisVersion: analysis.version,
    requirement: { id: r.run.requirement.setId, name: analysis.requirementSet.name, revision: r.run.requirement.revision },
    arms: analysis.arms.map((a) => ({ id: a.id, name: a.name, revision: a.revision })),
    weights,
    weightsAdjusted: adjusted,
    caution: analysis.caution,
    exportedAt: r.exportedAt.toISOString(),
  };
  const base = `${fileStem(r.shortlist.name, 60, "shortlist")}.run-${r.run.id.slice(0, 8)}`;
  if (r.format === "json") {
    return { fileName: `${base}.json`, contentType: "application/json; charset=utf-8", body: toShortlistJson(meta, analysis, ranking) };
  }
  if (r.format === "xlsx") {
    const cycles = (analysis.requirementSet.sequences ?? []).length > 0 ? [cycleTable(analysis), cycleStepsTable(analysis)] : [];
    const bytes = await toXlsx([rankingTable(analysis, ranking), taskMatrixTable(analysis), complianceTable(analysis), ...cycles], meta);
    return { fileName: `${base}.xlsx`, contentType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", body: new Uint8Array(bytes) };
  }
  const table = r.table === "compliance" ? complianceTable(analysis) : r.table === "cycle" ? cycleTable(analysis) : rankingTable(analysis, ranking);
  return { fileName: `${base}.${r.table ?? "ranking"}.csv`, contentType: "text/csv; charset=utf-8", body: "\uFEFF" + toCsv(table, meta) };
}
