/** CSV (RFC 4180, CRLF) with a `#` metadata header block above the table's header row. */
import { metadataPairs, type Cell, type ExportMeta, type Table } from "./tables";

/** Text that a spreadsheet would run as a formula is prefixed with an apostrophe (CSV injection). */
function guard(text: string): string {
  return /^[=+\-@\t\r]/.test(text) && !/^-?\d+(\.\d+)?$/.test(text) ? `'${text}` : text;
}

export function csvField(v: Cell): string {
  if (v === null) return "";
  const text = typeof v === "number" ? (Number.isFinite(v) ? String(v) : "") : guard(v);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One table as CSV text; metadata lines start with "# " (single line each). */
export function toCsv(table: Table, meta: ExportMeta): string {
  const lines = [`# Armsift ${table.title.toLowerCase()}`, ...metadataPairs(meta).map(([k, v]) => `# ${k}: ${v.replace(/[\r\n]+/g, " ")}`)];
  lines.push(table.columns.map(csvField).join(","));
  for (const row of table.rows) lines.push(row.map(csvField).join(","));
  return lines.join("\r\n") + "\r\n";
}
