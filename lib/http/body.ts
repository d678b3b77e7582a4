import { ApiError } from "./errors";
import { count } from "@/shared/format";

/** Largest JSON body accepted (1 MiB). */
const MAX_BODY_BYTES = 1024 * 1024;
/** Deepest nesting of arrays/objects accepted; documents need fewer than 10 levels. */
const MAX_JSON_DEPTH = 64;


/** `size`: the declared length, or null when only "more than the limit" is known (streamed). */
function tooLarge(size: number | null, limit: number): ApiError {
  const sizeText = size === null ? `more than ${count(limit)} bytes` : `${count(size)} bytes`;
  const message = `request body is ${sizeText}; the limit is ${count(limit)} bytes (${limit / (1024 * 1024)} MiB)`;
  return new ApiError(400, "validation", message, { fieldErrors: [{ path: "", message }] });
}

/**
 * Reads the body as UTF-8 text, refusing more than `limit` bytes: a declared Content-Length
 * above it before reading anything, and a streamed (chunked) body as soon as the bytes read pass
 * it; the rest is never read.
 */
async function readBodyText(req: Request, limit = MAX_BODY_BYTES): Promise<string> {
  const declared = Number(req.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > limit) {
    await req.body?.cancel().catch(() => undefined);
    throw tooLarge(declared, limit);
  }
  if (!req.body) return "";
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(null, limit);
    }
    chunks.push(value);
  }
  const bytes = Buffer.concat(chunks, total);
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    const message = "request body is not valid UTF-8 text";
    throw new ApiError(400, "bad-json", message, { fieldErrors: [{ path: "", message }] });
  }
}

/** Deepest array/object nesting in JSON text (strings skipped); stops counting past `stopAt`. */
function jsonDepth(text: string, stopAt = MAX_JSON_DEPTH + 1): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92 /* \ */) i++;
      else if (c === 34 /* " */) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 123 /* { */ || c === 91 /* [ */) {
      depth++;
      if (depth > max) {
        max = depth;
        if (max >= stopAt) return max;
      }
    } else if (c === 125 /* } */ || c === 93 /* ] */) depth--;
  }
  return max;
}

function lineColumn(text: string, offset: number): string {
  let line = 1;
  let col = 1;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      col = 1;
    } else col++;
  }
  return `line ${line}, column ${col}`;
}

/** Parses JSON text; bad syntax → 400 bad-json, too deep → 400 validation, both with a field error on "". */
function parseJsonText(text: string): unknown {
  if (text.trim() === "") {
    const message = "request body is empty; send a JSON object";
    throw new ApiError(400, "bad-json", message, { fieldErrors: [{ path: "", message }] });
  }
  if (jsonDepth(text) > MAX_JSON_DEPTH) {
    const message = `JSON is nested more than ${MAX_JSON_DEPTH} levels deep`;
    throw new ApiError(400, "validation", message, { fieldErrors: [{ path: "", message }] });
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    const raw = err instanceof Error ? err.message : String(err);
    const pos = /position (\d+)/.exec(raw);
    const where = pos ? ` at ${lineColumn(text, Number(pos[1]))}` : "";
    const message = `request body is not valid JSON${where}: ${raw.replace(/^[^:]*JSON[^:]*: /, "").slice(0, 200)}`;
    throw new ApiError(400, "bad-json", message, { fieldErrors: [{ path: "", message }] });
  }
}

const kindOf = (v: unknown): string => (v === null ? "null" : Array.isArray(v) ? "an array" : typeof v === "object" ? "an object" : `a ${typeof v}`);

/** True for `application/json` and `application/<something>+json`, with or without parameters. */
function isJsonContentType(header: string | null): boolean {
  const type = header?.split(";")[0].trim().toLowerCase() ?? "";
  return type === "application/json" || /^application\/[a-z0-9.+-]+\+json$/.test(type);
}

/** 415 unless the request says its body is JSON (a text/plain or untyped body is refused unread). */
function requireJsonContentType(req: Request): void {
  const header = req.headers.get("content-type");
  if (isJsonContentType(header)) return;
  const message = header
    ? `request body is sent as ${JSON.stringify(header.slice(0, 100))}; send it as application/json`
    : "request body has no content type; send it as application/json";
  throw new ApiError(415, "unsupported-media-type", message, { fieldErrors: [{ path: "", message }] });
}

/**
 * Reads a JSON object body (Content-Type application/json, size-limited, depth-limited); any
 * other content type → 415, any other top-level value → 400 on path "".
 */
export async function readJsonObject(req: Request, limit = MAX_BODY_BYTES): Promise<Record<string, unknown>> {
  try {
    requireJsonContentType(req);
  } catch (err) {
    await req.body?.cancel().catch(() => undefined);
    throw err;
  }
  const value = parseJsonText(await readBodyText(req, limit));
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    const message = `expected a JSON object, got ${kindOf(value)}`;
    throw new ApiError(400, "validation", message, { fieldErrors: [{ path: "", message }] });
  }
  return value as Record<string, unknown>;
}
