/**
 * XLSX workbook (exceljs): one sheet per table (Ranking, Task matrix, Compliance, …), then
 * Metadata. Written with exceljs's streaming writer: each row is committed as it is added and the
 * zip is produced as it goes (strings inline, no shared-string table), so memory stays bounded by
 * a few rows and the compressor's window rather than the whole workbook; a turn of the event loop
 * every few hundred rows lets other requests run.
 */
import { PassThrough } from "node:stream";
import ExcelJS from "exceljs";
import { metadataPairs, type ExportMeta, type Table } from "./tables";

/** Rows written between two turns of the event loop. */
const ROWS_PER_TURN = 200;
const turn = () => new Promise<void>((resolve) => setImmediate(resolve));

async function addTable(wb: ExcelJS.stream.xlsx.WorkbookWriter, table: Table): Promise<void> {
  const ws = wb.addWorksheet(table.title, { views: [{ state: "frozen", ySplit: 1 }] });
  // widths before the first row is committed (a committed row cannot be changed)
  ws.columns = table.columns.map((c, i) => {
    let width = c.length;
    for (const r of table.rows) width = Math.max(width, String(r[i] ?? "").length);
    return { width: Math.min(60, Math.max(8, width + 2)) };
  });
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: table.columns.length } };
  const head = ws.addRow(table.columns);
  head.font = { bold: true };
  head.commit();
  for (let i = 0; i < table.rows.length; i++) {
    ws.addRow(table.rows[i].map((c) => (c === null ? null : c))).commit();
    if (i % ROWS_PER_TURN === ROWS_PER_TURN - 1) await turn();
  }
  ws.commit();
}

/** The workbook as a stream of bytes (written while it is read). */
export function xlsxStream(tables: Table[], meta: ExportMeta): ReadableStream<Uint8Array> {
  const out = new PassThrough();
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useSharedStrings: false, useStyles: true });
  wb.creator = "Armsift";
  wb.created = new Date(meta.exportedAt);
  const write = async () => {
    for (const t of tables) await addTable(wb, t);
    const ws = wb.addWorksheet("Metadata");
    ws.columns = [{ width: 20 }, { width: 100, style: { alignment: { wrapText: true, vertical: "top" } } }];
    const head = ws.addRow(["Key", "Value"]);
    head.font = { bold: true };
    head.commit();
    for (const [k, v] of metadataPairs(meta)) ws.addRow([k, v]).commit();
    ws.commit();
    await wb.commit();
  };
  write().catch((err: unknown) => out.destroy(err instanceof Error ? err : new Error(String(err))));
  const reader = out[Symbol.asyncIterator]();
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      const next = await reader.next();
      if (next.done) controller.close();
      else controller.enqueue(new Uint8Array(next.value as Buffer));
    },
    cancel(reason) {
      out.destroy(reason instanceof Error ? reason : undefined);
    },
  });
}

/** All bytes of a stream. */
export async function streamBytes(stream: ReadableStream<Uint8Array>): Promise<Buffer> {
  const parts: Uint8Array[] = [];
  for await (const p of stream as unknown as AsyncIterable<Uint8Array>) parts.push(p);
  return Buffer.concat(parts);
}

/** The workbook as bytes. */
export async function toXlsx(tables: Table[], meta: ExportMeta): Promise<Buffer> {
  return streamBytes(xlsxStream(tables, meta));
}
