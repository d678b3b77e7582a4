// Designed outcomes of the demo's mounting region (seed-data/requirements/bench-assembly.json):
// every arm searched for its own placement on the bench's rear half (bench top or a 100 mm or
// 200 mm riser, any yaw), analysed there and ranked beside the nominal base, through the
// product's analysis (analyzeShortlist). The placement search is checked against constructed
// cases and a brute-force grid in tests/analysis/placement.test.ts; here the demo's story.
import { describe, expect, it } from "vitest";
import { analyzeShortlist } from "@/lib/analysis";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";

describe("demo mounting region: the bench assembly cell", { timeout: 300_000 }, () => {
  const req = loadSeedRequirementSets().find((r) => r.name.startsWith("Bench assembly"))!;
  const arms = loadSeedArms().map((arm, i) => ({ id: `demo-${i + 1}`, revision: 1, arm }));
  const result = analyzeShortlist(arms, req);
  const byName = (name: string) => {
    const a = result.arms.find((x) => x.name === name)!;
    return {
      nominal: a, placed: result.placement!.arms.find((p) => p.id === a.id)!,
      nominalRank: result.ranking.find((r) => r.armId === a.id)!.rank, placedRank: result.placement!.ranking.find((r) => r.armId === a.id)!.rank,
    };
  };
  const reached = (a: { targets: { reached: boolean }[] }) => a.targets.filter((t) => t.reached).length;

  it("the set has a region with pedestal heights, and every arm gets a placement in it", () => {
    expect(req.mounting?.heights).toEqual([0.8, 0.9, 1.0]);
    const p = result.placement!;
    expect(p.arms).toHaveLength(arms.length);
    for (const a of p.arms) {
      expect(a.skipped).toBeNull();
      expect(a.placement!.x).toBeGreaterThanOrEqual(-0.5);
      expect(a.placement!.x).toBeLessThanOrEqual(0.2);
      expect([0.8, 0.9, 1.0]).toContain(a.placement!.z);
      expect(a.base![11]).toBe(a.placement!.z);
    }
  });

  it("no arm reaches fewer targets at its own placement than at the nominal base (the nominal base is in the region)", () => {
    for (const a of result.arms) expect(reached(result.placement!.arms.find((p) => p.id === a.id)!.analysis!), a.name).toBeGreaterThanOrEqual(reached(a));
  });

  it("Bench Six 5 reaches all nine targets only at its own placement, on a riser", () => {
    const b = byName("Bench Six 5");
    expect(reached(b.nominal)).toBe(7);
    expect(reached(b.placed.analysis!)).toBe(9);
    expect(b.placed.placement!.z).toBeGreaterThan(0.8);
  });

  it("the small Compact Six 3 gains two targets and Helper Seven 7 climbs the ranking at their own placements", () => {
    const c = byName("Compact Six 3");
    expect(reached(c.placed.analysis!) - reached(c.nominal)).toBe(2);
    const h = byName("Helper Seven 7");
    expect(h.placedRank).toBeLessThan(h.nominalRank);
  });
});
