import "server-only";
/**
 * Stored analysis results (docs/design.md#stored-results): one AnalysisResult row per analysis
 * key, shared by every run with that key, its arms gzip-compressed one row each. Readers take the
 * head (small JSON) alone, one arm, or the whole result arm by arm: each arm is decompressed on
 * libuv's thread pool and parsed on its own, with a turn of the event loop between arms, so no
 * request parses a large result in one piece.
 */
import { decodeArm, encodeResult, STORED_FORMAT, type ResultHead, type StoredResult } from "@/lib/analysis/stored";
import type { ArmAnalysis, ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { db, type Tx } from "./client";

/** Lets other requests run between two pieces of work. */
const yieldToEvents = () => new Promise<void>((resolve) => setImmediate(resolve));

/** A fresh result or its stored form, as the runner hands it over. */
export type ResultToStore = ShortlistAnalysis | StoredResult;

const isStored = (r: ResultToStore): r is StoredResult => (r as StoredResult).format === STORED_FORMAT && Array.isArray((r as StoredResult).arms) && typeof (r as StoredResult).head === "string";

/** The stored form of `r` (encoded here when a fresh result is given). */
export function storedForm(r: ResultToStore): StoredResult {
  return isStored(r) ? r : encodeResult(r);
}

/**
 * Stores the result of `key` unless it is stored already (results depend only on their inputs,
 * so a second one with the same key is the same result). Inside the caller's transaction.
 */
export async function storeResultInTx(tx: Tx, key: string, analysisVersion: string, stored: StoredResult): Promise<void> {
  const existing = await tx.analysisResult.findUnique({ where: { key }, select: { key: true } });
  if (existing) return;
  await tx.analysisResult.create({
    data: {
      key, analysisVersion, format: stored.format, head: stored.head, armCount: stored.arms.length, bytes: stored.bytes, jsonBytes: stored.jsonBytes,
    },
  });
  for (let i = 0; i < stored.arms.length; i++) {
    await tx.analysisResultArm.create({ data: { resultKey: key, position: i, armId: stored.arms[i].armId, data: stored.arms[i].data } });
  }
}

/** True when a result with this key is stored. */
export async function hasStoredResult(key: string, c: Tx = db()): Promise<boolean> {
  return (await c.analysisResult.findUnique({ where: { key }, select: { key: true } })) !== null;
}

interface HeadRow { format: string; head: string; armCount: number; bytes: number; jsonBytes: number }

async function headRow(key: string): Promise<HeadRow | null> {
  return db().analysisResult.findUnique({ where: { key }, select: { format: true, head: true, armCount: true, bytes: true, jsonBytes: true } });
}

/** Sizes of a stored result (bytes stored, bytes of its JSON), or null. */
export async function storedResultSize(key: string): Promise<{ bytes: number; jsonBytes: number; arms: number } | null> {
  const r = await db().analysisResult.findUnique({ where: { key }, select: { bytes: true, jsonBytes: true, armCount: true } });
  return r ? { bytes: r.bytes, jsonBytes: r.jsonBytes, arms: r.armCount } : null;
}

/** A result stored before the split: its whole JSON. */
function wholeJson(row: HeadRow): ShortlistAnalysis {
  return JSON.parse(row.head) as ShortlistAnalysis;
}

/** The head of a stored result (everything but the arms), or null. */
export async function readResultHead(key: string): Promise<ResultHead | null> {
  const row = await headRow(key);
  if (!row) return null;
  if (row.format !== STORED_FORMAT) {
    const { arms: _arms, ...head } = wholeJson(row);
    void _arms;
    return head;
  }
  return JSON.parse(row.head) as ResultHead;
}

/** One arm of a stored result by its place, or null. */
export async function readResultArm(key: string, position: number): Promise<ArmAnalysis | null> {
  const row = await db().analysisResultArm.findUnique({ where: { resultKey_position: { resultKey: key, position } }, select: { data: true } });
  if (row) return decodeArm(row.data);
  const head = await headRow(key);
  return head && head.format !== STORED_FORMAT ? wholeJson(head).arms[position] ?? null : null;
}

/**
 * The arms of a stored result one at a time, in order (each decompressed and parsed alone, a
 * turn of the event loop between two). For a result stored before the split, its parsed arms.
 */
export async function* readResultArms(key: string): AsyncGenerator<ArmAnalysis> {
  const head = await headRow(key);
  if (!head) return;
  if (head.format !== STORED_FORMAT) {
    yield* wholeJson(head).arms;
    return;
  }
  for (let i = 0; i < head.armCount; i++) {
    const row = await db().analysisResultArm.findUnique({ where: { resultKey_position: { resultKey: key, position: i } }, select: { data: true } });
    if (!row) throw new Error(`stored result ${key} lacks arm ${i + 1} of ${head.armCount}`);
    yield await decodeArm(row.data);
    await yieldToEvents();
  }
}

/** Parsed results kept in memory, newest use last, up to this many bytes of their JSON in all. */
const CACHE_BYTES = 256 * 2 ** 20;
const cache = new Map<string, { result: ShortlistAnalysis; bytes: number }>();
let cachedBytes = 0;

/** A whole stored result, assembled arm by arm (cached by key while it fits the budget), or null. */
export async function readResult(key: string): Promise<ShortlistAnalysis | null> {
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit.result;
  }
  const row = await headRow(key);
  if (!row) return null;
  let result: ShortlistAnalysis;
  if (row.format !== STORED_FORMAT) result = wholeJson(row);
  else {
    const arms: ArmAnalysis[] = [];
    for await (const a of readResultArms(key)) arms.push(a);
    const head = JSON.parse(row.head) as ResultHead;
    result = { ...head, arms } as ShortlistAnalysis;
  }
  if (row.jsonBytes <= CACHE_BYTES) {
    cache.set(key, { result, bytes: row.jsonBytes });
    cachedBytes += row.jsonBytes;
    for (const [k, v] of cache) {
      if (cachedBytes <= CACHE_BYTES) break;
      cache.delete(k);
      cachedBytes -= v.bytes;
    }
  }
  return result;
}
