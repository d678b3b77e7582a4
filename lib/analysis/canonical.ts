/**
 * Canonical JSON and content seeds (pure, browser-safe).
 *
 * Every random draw of an analysis (IK restarts, structural ranks, workspace samples) is seeded
 * from content, never from a position in a list: an arm's seed is a hash of its kinematic
 * description, a target's or path's seed a hash of that and the item's name. The same arm
 * against the same requirement set therefore gets the same result wherever it stands in a
 * shortlist and whichever other arms are in it.
 */
import type { ArmDocument } from "@/shared/schemas/arm";

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

/**
 * 32-bit hash of a string: FNV-1a over its UTF-16 code units (Fowler, Noll & Vo; common
 * practice), then the 32-bit finaliser of MurmurHash3 (Appleby; from memory) so that nearby
 * strings give unrelated seeds. Not for security. Never 0 (0 is mapped to 1), so it is a valid
 * generator seed.
 */
function hash32(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return (h >>> 0) || 1;
}

/**
 * The text an arm's seeds are drawn from: the canonical JSON of what the analysis reads of its
 * kinematics (convention, joints, base, tool). Name, maker, description and datasheet specs are
 * left out, so renaming an arm or correcting its price does not move its IK search.
 */
export function armSeedText(arm: Pick<ArmDocument, "convention" | "joints" | "base" | "tool">): string {
  return canonicalJson({ convention: arm.convention, joints: arm.joints, base: arm.base ?? null, tool: arm.tool ?? null });
}

/** What a seed is for; part of the hashed text so the streams differ. */
type SeedPurpose = "ranks" | "target" | "path" | "workspace" | "place";

/** Seed for one purpose of one arm; `item` is the target's or path's name ("" otherwise). */
export function contentSeed(armText: string, purpose: SeedPurpose, item = ""): number {
  return hash32(`${purpose}\u0000${item}\u0000${armText}`);
}
