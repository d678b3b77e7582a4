/**
 * Cache key of an analysis: sha-256 over a canonical JSON of (ANALYSIS_VERSION, arms, requirement
 * set). Kept apart from the rest of lib/analysis because it uses node:crypto (server only); the
 * rest is browser-safe.
 */
import { createHash } from "node:crypto";
import type { RequirementSet } from "@/shared/schemas/requirements";
import { canonicalJson } from "./canonical";
import { ANALYSIS_VERSION, type ShortlistArm } from "./shortlist";

export { canonicalJson };

/** sha-256 (hex) of the canonical JSON of {version, arms (id, revision, arm), requirementSet} for the current ANALYSIS_VERSION. */
export function analysisKey(arms: readonly ShortlistArm[], requirementSet: RequirementSet): string {
  return analysisKeyFor(ANALYSIS_VERSION, arms, requirementSet);
}

/** The key for a given analysis version (the definition; tests pin it with a fixed version). */
export function analysisKeyFor(version: string, arms: readonly ShortlistArm[], requirementSet: RequirementSet): string {
  const input = { version, arms: arms.map((a) => ({ id: a.id, revision: a.revision, arm: a.arm })), requirementSet };
  return createHash("sha256").update(canonicalJson(input), "utf8").digest("hex");
}
