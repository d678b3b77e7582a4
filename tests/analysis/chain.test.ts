// The analysis of a DH arm and of the same arm rewritten as a general joint chain must agree:
// reachability, dexterity, statics, wrist loads, paths and the workspace only see the kinematics
// through forward kinematics, Jacobians and joint axes, which the conversion preserves to about
// 1e-15 (tests/kinematics/chain.test.ts). Reference: the product's DH analysis, itself checked
// against numpy/scipy (tests/reference/analysis_reference.py) and KDL.
import { describe, expect, it, vi } from "vitest";
import { analyzeShortlist, DEFAULT_BUDGET } from "@/lib/analysis";
import { dhToChain } from "@/lib/kinematics";
import type { ArmDocument } from "@/shared/schemas";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";

// Analysis seeds are drawn from the arm's description (lib/analysis/canonical.ts), which differs
// between a DH table and its chain; here both get the same seeds, so the same random restarts and
// samples, and only the kinematics can make a difference.
vi.mock("@/lib/analysis/canonical", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/analysis/canonical")>()),
  armSeedText: () => "same seeds for the DH table and its chain",
}));

/** Paths where two results differ: strings and booleans exactly, numbers beyond 1e-7 (absolute, or relative above 1). */
function differences(a: unknown, b: unknown, path = "", out: string[] = []): string[] {
  if (typeof a === "number" && typeof b === "number") {
    if (!(Math.abs(a - b) <= 1e-7 * Math.max(1, Math.abs(a))) && !(Number.isNaN(a) && Number.isNaN(b))) out.push(`${path}: ${a} vs ${b}`);
  } else if (a && b && typeof a === "object" && typeof b === "object") {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const k of keys) differences((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`, out);
  } else if (a !== b) out.push(`${path}: ${JSON.stringify(a)} vs ${JSON.stringify(b)}`);
  return out;
}

describe("analysis of chain arms", () => {
  const budget = { ...DEFAULT_BUDGET, workspace: { ...DEFAULT_BUDGET.workspace, samples: 300 } };
  const dhArms = loadSeedArms().filter((a) => a.convention !== "chain" && (a.name === "Reach Cobot 10" || a.name === "Foundry Six 12"));
  it.each(loadSeedRequirementSets().map((r) => [r.name, r] as const))("%s: same verdicts, reasons and figures for the DH table and its chain", (_name, req) => {
    expect(dhArms.map((a) => a.convention).sort()).toEqual(["dh", "mdh"]);
    for (const dh of dhArms) {
      if (dh.convention === "chain") continue;
      const chain = dhToChain(dh) as ArmDocument;
      const a = analyzeShortlist([{ id: "x", revision: 1, arm: dh }], req, { budget });
      const b = analyzeShortlist([{ id: "x", revision: 1, arm: chain }], req, { budget });
      expect(b.arms[0].error).toBeNull();
      expect(differences(JSON.parse(JSON.stringify(a.arms[0])), JSON.parse(JSON.stringify(b.arms[0]))), dh.name).toEqual([]);
    }
  });
});
