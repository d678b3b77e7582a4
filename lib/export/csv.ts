/**
 * CSV (RFC 4180): the one writer of every CSV the product makes, the exports' metadata lines
 * included and the command line's tables. Every field goes through csvField: quoted when it
 * holds a comma, quote or line break, and guarded against spreadsheet formulas.
 */
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

/** One record: its fields through csvField, joined by commas. */
const csvRecord = (cells: readonly Cell[]): string => cells.map(csvField).join(",");

/** Records as CSV text, each ended by `eol` (CRLF as RFC 4180 says; the command line uses LF). */
export function csvText(records: readonly (readonly Cell[])[], eol: "\r\n" | "\n" = "\r\n"): string {
  return records.map((r) => csvRecord(r) + eol).join("");
}

/**
 * One table as CSV text above its metadata: the title line `# Armsift <title>`, then one record
 * per metadata entry, `# <key>` and the value (a comment line to readers that skip `#` lines, two
 * cells to a spreadsheet, the value quoted and guarded like any cell), then the header row and
 * the rows. Line breaks inside values become spaces.
 */
export function toCsv(table: Table, meta: ExportMeta): string {
  const records: Cell[][] = [[`# Armsift ${table.title.toLowerCase()}`]];
  for (const [k, v] of metadataPairs(meta)) records.push([`# ${k}`, v.replace(/[\r\n]+/g, " ")]);
  records.push(table.columns, ...table.rows);
  return csvText(records);
}
