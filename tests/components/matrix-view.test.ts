// The task matrix as a large page sends it (components/shortlist/view.ts): the summary rows keep
// each cell's verdict, margin and limiting factor and leave out the reason and the details, which
// the matrix loads with the arm (armMatrixCells of the arm's analysis gives the same full cells).
import { describe, expect, it } from "vitest";
import { analyzeShortlist } from "@/lib/analysis";
import { armMatrixCells, matrixRows, matrixSummaryRows, pathProfile } from "@/components/shortlist/view";
import { compactResult, PROFILE_POINTS } from "@/lib/analysis/compact";
import { largeShortlist } from "../../bench/large-shortlist";

const { arms, requirementSet } = largeShortlist({ arms: 2, targets: 5, paths: 2, waypoints: 8, step: 1e-4 });
const result = compactResult(analyzeShortlist(arms.map((arm, i) => ({ id: `arm-${i + 1}`, revision: 1, arm })), requirementSet));

describe("task matrix rows", () => {
  it("the summary is the full rows without reasons and details", () => {
    const full = matrixRows(result), summary = matrixSummaryRows(result);
    expect(summary.map((r) => r.armId)).toEqual(full.map((r) => r.armId));
    for (const [i, r] of summary.entries()) {
      expect(r.cells).toHaveLength(requirementSet.targets.length + requirementSet.paths.length);
      for (const [c, cell] of r.cells.entries()) {
        expect(cell).not.toHaveProperty("reason");
        expect(cell).not.toHaveProperty("details");
        const { reason, details, ...rest } = full[i].cells[c];
        expect(cell).toEqual(rest);
        expect(reason).toBe(c < requirementSet.targets.length ? result.arms[i].targets[c].reason : result.arms[i].paths[c - requirementSet.targets.length].reason);
        expect(details!.length).toBeGreaterThan(0);
      }
      expect(armMatrixCells(result.requirementSet, result.arms[i])).toEqual(full[i].cells);
    }
  });

  it("a stored path's profile chart has its kept samples, at most PROFILE_POINTS", () => {
    for (const p of result.arms[0].paths) {
      const chart = pathProfile(p);
      expect(chart.points.length).toBe(p.q.length);
      expect(chart.points.length).toBeLessThanOrEqual(PROFILE_POINTS);
    }
  });
});
