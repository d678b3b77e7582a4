/**
 * Cache key of an analysis: sha-256 over a canonical JSON of (ANALYSIS_VERSION, arms, requirement
 * set). Kept apart from the rest of lib/analysis because it uses node:crypto (server only); the
 * rest is browser-safe.
 */
import { createHash } from "node:crypto";
import type { RequirementSet } from "@/shared/schemas/requirements";
import { ANALYSIS_VERSION, type ShortlistArm } from "./shortlist";

/**
 * JSON with object keys sorted at every level (arrays keep their order), numbers as JSON writes
 * them (shortest round-trip form), undefined members dropped. Two equal inputs give equal text.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    if (typeof value === "number" && !Number.isFinite(value)) return "null";
    return JSON.stringify(value) ?? "null";
  }
  if (Array.isArray(value) || ArrayBuffer.isView(value)) {
    return `[${Array.from(value as ArrayLike<unknown>, (v) => canonicalJson(v === undefined ? null : v)).join(",")}]`;
  }
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj).filter((k) => obj[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(",")}}`;
}

/** sha-256 (hex) of the canonical JSON of {version, arms (id, revision, arm), requirementSet}. */
export function analysisKey(arms: readonly ShortlistArm[], requirementSet: RequirementSet): string {
  const input = { version: ANALYSIS_VERSION, arms: arms.map((a) => ({ id: a.id, revision: a.revision, arm: a.arm })), requirementSet };
  return createHash("sha256").update(canonicalJson(input), "utf8").digest("hex");
}
