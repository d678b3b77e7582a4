// Readers used by the export tests (kept independent of lib/export: the tests parse what a
// spreadsheet or a CSV reader would see, with exceljs and papaparse).
import ExcelJS from "exceljs";
import Papa from "papaparse";

/**
 * Every record of a CSV text, read with papaparse (a general-purpose RFC 4180 parser), strictly:
 * a parse error (unbalanced quote, stray quote) fails the test.
 */
export function parseCsvRows(text: string): string[][] {
  const parsed = Papa.parse<string[]>(text, { header: false, delimiter: ",", skipEmptyLines: true, newline: "\r\n" });
  if (parsed.errors.length > 0) throw new Error(`CSV does not parse: ${parsed.errors.map((e) => `row ${e.row}: ${e.message}`).join("; ")}`);
  return parsed.data;
}

/**
 * A CSV export split into its metadata, header and rows (as objects by column name). Metadata are
 * the records whose first cell starts with "# ": the title alone, then `# key` and the value,
 * returned as "key: value". Every row must have as many fields as the header.
 */
export function readCsvExport(text: string): { meta: string[]; columns: string[]; records: Record<string, string>[] } {
  const all = parseCsvRows(text.replace(/^\uFEFF/, ""));
  const isMeta = (r: string[]) => r[0].startsWith("# ");
  const meta = all.filter(isMeta).map((r) => (r.length > 1 ? `${r[0].slice(2)}: ${r.slice(1).join(",")}` : r[0].slice(2)));
  const [columns, ...rows] = all.filter((r) => !isMeta(r));
  for (const [i, r] of rows.entries()) if (r.length !== columns.length) throw new Error(`CSV row ${i + 1} has ${r.length} fields, the header ${columns.length}`);
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
