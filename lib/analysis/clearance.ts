/**
 * One arm's clearance over a requirement set, from its stored results (pure; for the compliance
 * table, the exports and the page): the smallest distance over the checked pairs at the reached
 * targets' chosen configurations and along the paths, against the required clearance.
 */
import type { ArmAnalysis } from "./shortlist";
import type { Verdict } from "./types";
import { fixed } from "@/shared/format";

interface ArmClearance {
  /** Smallest clearance (m), or null when nothing was measured. */
  value: number | null;
  /** meets: at least the required clearance everywhere measured; marginal: below it; fails: a path collides; unknown: nothing checked. */
  verdict: Verdict;
  /** Where and between what, in words. */
  reason: string;
}

/** The arm's clearance; `required` is the cell's required clearance (m). */
export function armClearance(arm: ArmAnalysis, required: number): ArmClearance {
  if (arm.error) return { value: null, verdict: "unknown", reason: "arm not analysed" };
  if (!arm.cell || arm.cell.checkedPairs === 0) return { value: null, verdict: "unknown", reason: "nothing checked: no collision geometry on the arm, the tool or the payload, or no obstacles" };
  let value: number | null = null, where = "";
  const take = (c: number, why: string) => { if (value === null || c < value) { value = c; where = why; } };
  arm.targets.forEach((t) => {
    if (t.reached && t.cell?.clearance != null && t.cell.closest) take(t.cell.clearance, `at ${t.name}, ${t.cell.closest.a} to ${t.cell.closest.b}`);
  });
  const colliding = arm.paths.filter((p) => p.cell && !p.cell.collisionFree);
  arm.paths.forEach((p) => {
    if (p.cell?.collisionFree && p.cell.clearance !== null && p.cell.closest) take(p.cell.clearance, `along ${p.name}, ${p.cell.closest.a} to ${p.cell.closest.b}`);
  });
  const collidingTargets = arm.targets.filter((t) => t.cell && !t.cell.collisionFree).length;
  const tail = [
    collidingTargets ? `${collidingTargets} target${collidingTargets === 1 ? "" : "s"} collide in every branch found` : "",
    colliding.length ? `path${colliding.length === 1 ? "" : "s"} ${colliding.map((p) => p.name).join(", ")} collide` : "",
  ].filter(Boolean).join("; ");
  const mmText = (m: number) => `${fixed(m * 1000, 1)} mm`;
  if (colliding.length) return { value, verdict: "fails", reason: [value !== null ? `smallest clearance elsewhere ${mmText(value)} (${where})` : "", tail].filter(Boolean).join("; ") };
  if (value === null) return { value: null, verdict: "unknown", reason: tail || "no reached target or path to measure" };
  const v = value as number;
  return {
    value: v,
    verdict: v >= required ? "meets" : "marginal",
    reason: `smallest clearance ${mmText(v)} ${where} (required ${mmText(required)})${tail ? `; ${tail}` : ""}`,
  };
}
