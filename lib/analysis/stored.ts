/**
 * The bytes a finished run stores (docs/design.md#stored-results): the result in its stored form
 * (compact.ts), split into a head (everything but the arms: names, weights, ranking, thresholds;
 * plain JSON, small) and one gzip-compressed JSON per arm, so a reader decompresses and parses one
 * arm at a time and the page's summary never needs the arms' per-sample data. Kept apart from the
 * rest of lib/analysis because it uses node:zlib (server only), like ./key.
 */
import { gunzip, gzipSync } from "node:zlib";
import { promisify } from "node:util";
import { compactResult } from "./compact";
import type { ArmAnalysis, ShortlistAnalysis } from "./shortlist";

/** Name of this layout (stored beside the bytes). */
export const STORED_FORMAT = "split-gzip-1";

/** A result as stored: the head's JSON and each arm's gzip-compressed JSON, in the result's order. */
export interface StoredResult {
  format: typeof STORED_FORMAT;
  /** JSON of the result without `arms`. */
  head: string;
  arms: { armId: string; data: Uint8Array<ArrayBuffer> }[];
  /** Bytes stored: the head's plus the compressed arms'. */
  bytes: number;
  /** Bytes of the JSON before compression (head and arms). */
  jsonBytes: number;
}

/** The head of a stored result: the result without its arms. */
export type ResultHead = Omit<ShortlistAnalysis, "arms">;

/** The stored form of a fresh result, compressed (synchronous: run it off the request path, e.g. in the analysis thread). */
export function encodeResult(result: ShortlistAnalysis): StoredResult {
  const compact = compactResult(result);
  const { arms, ...head } = compact;
  const headJson = JSON.stringify(head);
  let bytes = Buffer.byteLength(headJson), jsonBytes = bytes;
  const parts = arms.map((a) => {
    const json = JSON.stringify(a);
    jsonBytes += Buffer.byteLength(json);
    // a copy in a buffer of its own, so it can be transferred between threads
    const data = new Uint8Array(gzipSync(json, { level: 6 }));
    bytes += data.byteLength;
    return { armId: a.id, data };
  });
  return { format: STORED_FORMAT, head: headJson, arms: parts, bytes, jsonBytes };
}

const gunzipAsync = promisify(gunzip);

/** One stored arm, decompressed (on libuv's thread pool) and parsed. */
export async function decodeArm(data: Uint8Array): Promise<ArmAnalysis> {
  const text = (await gunzipAsync(data)).toString("utf8");
  return JSON.parse(text) as ArmAnalysis;
}
