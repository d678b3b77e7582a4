// Readers used by the export tests (kept independent of lib/export: the tests parse what a
// spreadsheet or a CSV reader would see).
import ExcelJS from "exceljs";

/** RFC 4180 reader: quoted fields, doubled quotes, CRLF or LF line ends. */
export function parseCsvRows(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++; }
      else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") { row.push(field); field = ""; }
    else if (c === "\r" && text[i + 1] === "\n") { /* CRLF: the LF ends the row */ }
    else if (c === "\n") { row.push(field); rows.push(row); row = []; field = ""; }
    else field += c;
  }
  if (field !== "" || row.length) { row.push(field); rows.push(row); }
  return rows;
}

/**
 * A CSV export split into its metadata, header and rows (as objects by column name). Metadata are
 * the records whose first cell starts with "# ": the title alone, then `# key` and the value,
 * returned as "key: value".
 */
export function readCsvExport(text: string): { meta: string[]; columns: string[]; records: Record<string, string>[] } {
  const all = parseCsvRows(text.replace(/^\uFEFF/, ""));
  const isMeta = (r: string[]) => r[0].startsWith("# ");
  const meta = all.filter(isMeta).map((r) => (r.length > 1 ? `${r[0].slice(2)}: ${r.slice(1).join(",")}` : r[0].slice(2)));
  const [columns, ...rows] = all.filter((r) => !isMeta(r));
  return { meta, columns, records: rows.map((r) => Object.fromEntries(columns.map((c, i) => [c, r[i]]))) };
}

/** Every sheet of a workbook as rows of plain values. */
export async function readXlsx(bytes: Buffer | ArrayBuffer): Promise<Record<string, unknown[][]>> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as ArrayBuffer);
  const out: Record<string, unknown[][]> = {};
  wb.eachSheet((ws) => {
    const rows: unknown[][] = [];
    ws.eachRow({ includeEmpty: false }, (r) => {
      const values = r.values as unknown[];
      rows.push(values.slice(1).map((v) => (v === undefined ? null : v)));
    });
    out[ws.name] = rows;
  });
  return out;
}

/** Sheet rows as objects keyed by the header row. */
export function sheetRecords(rows: unknown[][]): Record<string, unknown>[] {
  const [head, ...body] = rows;
  return body.map((r) => Object.fromEntries((head as string[]).map((c, i) => [c, r[i] ?? null])));
}
