/**
 * A shortlist's export assembled from a stored result: the ranking (recomputed when the weights
 * asked for differ from the stored ones), the metadata every format states, and the file in the
 * chosen format, whole (shortlistExport) or written as it is sent (shortlistExportStream). No
 * database, no HTTP.
 */
import type { Weights } from "@/shared/schemas/requirements";
import { SUB_SCORES } from "@/shared/sub-scores";
import { rerank, type ArmAnalysis, type ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { complianceTable, cycleStepsTable, cycleTable, placementTable, rankingTable, taskMatrixTable, type ExportMeta, type Table } from "./tables";
import { toCsv } from "./csv";
import { toXlsx, xlsxStream } from "./xlsx";
import { shortlistJsonPieces, toShortlistJson } from "./json";
import { fileStem, type ExportFile } from "./files";

interface ShortlistExportRequest {
  shortlist: { id: string; name: string };
  run: { id: string; finishedAt: Date | null; requirement: { setId: string; revision: number } };
  analysis: ShortlistAnalysis;
  format: "csv" | "xlsx" | "json";
  /** Which table a CSV holds (default ranking). */
  table?: "ranking" | "compliance" | "cycle" | "placement";
  /** Weights to rank with; the stored ones when absent. */
  weights?: Weights;
  exportedAt: Date;
}

/** The ranking an export uses and whether it differs from the stored one. */
function exportRanking(analysis: { weights: Weights; ranking: ShortlistAnalysis["ranking"] }, arms: Parameters<typeof rerank>[0]["arms"], asked?: Weights) {
  const weights = asked ?? analysis.weights;
  const adjusted = SUB_SCORES.keys.some((k) => weights[k] !== analysis.weights[k]);
  return { weights, adjusted, ranking: adjusted ? rerank({ arms }, weights) : analysis.ranking };
}

function exportMeta(
  r: Omit<ShortlistExportRequest, "analysis" | "format">,
  head: Omit<ShortlistAnalysis, "arms">,
  arms: readonly Pick<ArmAnalysis, "id" | "name" | "revision">[],
  weights: Weights,
  adjusted: boolean,
): ExportMeta {
  return {
    shortlist: { id: r.shortlist.id, name: r.shortlist.name },
    run: { id: r.run.id, finishedAt: r.run.finishedAt ? r.run.finishedAt.toISOString() : null },
    analysisVersion: head.version,
    requirement: { id: r.run.requirement.setId, name: head.requirementSet.name, revision: r.run.requirement.revision },
    arms: arms.map((a) => ({ id: a.id, name: a.name, revision: a.revision })),
    weights,
    weightsAdjusted: adjusted,
    caution: head.caution,
    exportedAt: r.exportedAt.toISOString(),
  };
}

const baseName = (r: Pick<ShortlistExportRequest, "shortlist" | "run">) => `${fileStem(r.shortlist.name, 60, "shortlist")}.run-${r.run.id.slice(0, 8)}`;
const XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

function xlsxTables(analysis: ShortlistAnalysis, ranking: ShortlistAnalysis["ranking"]): Table[] {
  const cycles = (analysis.requirementSet.sequences ?? []).length > 0 ? [cycleTable(analysis), cycleStepsTable(analysis)] : [];
  const placement = analysis.placement ? [placementTable(analysis)] : [];
  return [rankingTable(analysis, ranking), taskMatrixTable(analysis), complianceTable(analysis), ...cycles, ...placement];
}

function csvFile(r: Pick<ShortlistExportRequest, "shortlist" | "run" | "table">, analysis: ShortlistAnalysis, ranking: ShortlistAnalysis["ranking"], meta: ExportMeta): ExportFile {
  const table = r.table === "compliance" ? complianceTable(analysis) : r.table === "cycle" ? cycleTable(analysis) : r.table === "placement" ? placementTable(analysis) : rankingTable(analysis, ranking);
  return { fileName: `${baseName(r)}.${r.table ?? "ranking"}.csv`, contentType: "text/csv; charset=utf-8", body: "\uFEFF" + toCsv(table, meta) };
}

export async function shortlistExport(r: ShortlistExportRequest): Promise<ExportFile> {
  const { analysis } = r;
  const { weights, adjusted, ranking } = exportRanking(analysis, analysis.arms, r.weights);
  const meta = exportMeta(r, analysis, analysis.arms, weights, adjusted);
  if (r.format === "json") {
    return { fileName: `${baseName(r)}.json`, contentType: "application/json; charset=utf-8", body: toShortlistJson(meta, analysis, ranking) };
  }
  if (r.format === "xlsx") {
    const bytes = await toXlsx(xlsxTables(analysis, ranking), meta);
    return { fileName: `${baseName(r)}.xlsx`, contentType: XLSX_TYPE, body: new Uint8Array(bytes) };
  }
  return csvFile(r, analysis, ranking, meta);
}

/** A stored result read piecewise: its head, and its arms one at a time (each call reads them again). */
export interface StoredResultSource {
  head: Omit<ShortlistAnalysis, "arms">;
  arms: () => AsyncIterable<ArmAnalysis>;
}

/**
 * The same export written as it is sent. JSON: one pass over the arms for the metadata (and the
 * sub-scores, when the weights differ), then the document arm by arm: never the whole result in
 * memory or in one string. XLSX: the workbook through the streaming writer. CSV (the ranking,
 * compliance and cycle tables: a row per arm or per requirement and arm) as one text.
 */
export async function shortlistExportStream(r: Omit<ShortlistExportRequest, "analysis"> & { source: StoredResultSource }): Promise<ExportFile> {
  const { head } = r.source;
  if (r.format === "json") {
    const idents: Parameters<typeof rerank>[0]["arms"][number][] = [];
    const names: Pick<ArmAnalysis, "id" | "name" | "revision">[] = [];
    for await (const a of r.source.arms()) {
      idents.push({ id: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts });
      names.push({ id: a.id, name: a.name, revision: a.revision });
    }
    const { weights, adjusted, ranking } = exportRanking(head, idents, r.weights);
    const meta = exportMeta(r, head, names, weights, adjusted);
    const pieces = shortlistJsonPieces(meta, head, ranking, r.source.arms());
    const encoder = new TextEncoder();
    const body = new ReadableStream<Uint8Array>({
      async pull(controller) {
        const next = await pieces.next();
        if (next.done) controller.close();
        else controller.enqueue(encoder.encode(next.value));
      },
      async cancel() {
        await pieces.return(undefined);
      },
    });
    return { fileName: `${baseName(r)}.json`, contentType: "application/json; charset=utf-8", body };
  }
  const arms: ArmAnalysis[] = [];
  for await (const a of r.source.arms()) arms.push(a);
  const analysis = { ...head, arms } as ShortlistAnalysis;
  const { weights, adjusted, ranking } = exportRanking(analysis, arms, r.weights);
  const meta = exportMeta(r, head, arms, weights, adjusted);
  if (r.format === "xlsx") return { fileName: `${baseName(r)}.xlsx`, contentType: XLSX_TYPE, body: xlsxStream(xlsxTables(analysis, ranking), meta) };
  return csvFile(r, analysis, ranking, meta);
}
