/** An export as a download: its file name, content type and bytes, text or a stream of bytes. */
export interface ExportFile {
  fileName: string;
  contentType: string;
  body: string | Uint8Array<ArrayBuffer> | ReadableStream<Uint8Array>;
}

/** An ASCII file-name stem from a name shown to people (accents dropped, other characters → "-"). */
export function fileStem(name: string, max: number, fallback: string): string {
  return name.normalize("NFKD").replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, max) || fallback;
}

/** An arm or requirement-set document as the JSON file the import endpoints read back. */
export function documentExport(doc: { name: string }, kind: "arm" | "requirements"): ExportFile {
  return {
    fileName: `${fileStem(doc.name, 80, "export")}.${kind}.json`,
    contentType: "application/json; charset=utf-8",
    body: JSON.stringify(doc, null, 2) + "\n",
  };
}
