/** XLSX workbook (exceljs): one sheet per table (Ranking, Task matrix, Compliance), then Metadata. */
import ExcelJS from "exceljs";
import { metadataPairs, type ExportMeta, type Table } from "./tables";

function addTable(wb: ExcelJS.Workbook, table: Table): void {
  const ws = wb.addWorksheet(table.title, { views: [{ state: "frozen", ySplit: 1 }] });
  ws.addRow(table.columns);
  ws.getRow(1).font = { bold: true };
  for (const row of table.rows) ws.addRow(row.map((c) => (c === null ? null : c)));
  table.columns.forEach((c, i) => {
    const width = Math.max(c.length, ...table.rows.map((r) => String(r[i] ?? "").length));
    ws.getColumn(i + 1).width = Math.min(60, Math.max(8, width + 2));
  });
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: table.columns.length } };
}

/** The workbook as bytes. */
export async function toXlsx(tables: Table[], meta: ExportMeta): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = "Armsift";
  wb.created = new Date(meta.exportedAt);
  for (const t of tables) addTable(wb, t);
  const ws = wb.addWorksheet("Metadata");
  ws.addRow(["Key", "Value"]).font = { bold: true };
  for (const [k, v] of metadataPairs(meta)) ws.addRow([k, v]);
  ws.getColumn(1).width = 20;
  ws.getColumn(2).width = 100;
  ws.getColumn(2).alignment = { wrapText: true, vertical: "top" };
  const out = await wb.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}
