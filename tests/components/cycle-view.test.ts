// The shortlist page's cycle chart data: one row per arm with the step times of its cycle, the
// steps named in order, an unknown cycle as an empty bar; the step colours alternate per kind.
import { describe, expect, it } from "vitest";
import { cycleChartData } from "@/components/shortlist/view";
import { stepColours } from "@/components/shortlist/CycleChart";
import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import type { CycleResult } from "@/lib/analysis/cycle";

const step = (kind: "move" | "path" | "wait", name: string, time: number, limitingJoint: number | null) => ({ kind, name, q: [0, 0], time, limitingJoint, branch: kind === "move" ? 0 : null, clearance: kind === "wait" ? null : 0.02 });
const known: CycleResult = {
  name: "loop", time: 4.5, partsPerHour: 800, required: 5, verdict: "meets", estimate: true, assumedAcceleration: [2], reason: "", blocked: null, movesChecked: 3, movesBlocked: 0,
  steps: [step("move", "pick", 1.25, 1), step("path", "seam", 2.25, 2), step("wait", "wait", 1, null)],
};
const unknown: CycleResult = { ...known, time: null, partsPerHour: null, verdict: "unknown", estimate: false, steps: [], reason: 'target "pick" is not reached' };
const blocked: CycleResult = { ...unknown, verdict: "fails", blocked: { step: 2, kind: "path", name: "seam", a: "link 3", b: "fence" }, reason: "blocked" };
const analysis = (cycles: (CycleResult | undefined)[]) =>
  ({ requirementSet: { sequences: ["loop"] }, arms: cycles.map((c, i) => ({ id: `a${i}`, name: `Arm ${i}`, cycles: c ? [c] : undefined })) }) as unknown as ShortlistAnalysis;

describe("cycle chart data", () => {
  it("names the steps in order and gives each arm its step times; an unknown cycle has no segments", () => {
    const d = cycleChartData(analysis([unknown, known, undefined]), 0)!;
    expect(d.sequence).toBe("loop");
    expect(d.required).toBe(5);
    expect(d.steps.map((s) => s.label)).toEqual(["1. pick", "2. path seam", "3. wait"]);
    expect(d.rows.map((r) => r.armId)).toEqual(["a0", "a1", "a2"]);
    expect(d.rows[0]).toEqual({ arm: "Arm 0", armId: "a0", time: null, estimate: false, blocked: false });
    expect(d.rows[1]).toMatchObject({ time: 4.5, estimate: true, s0: 1.25, s1: 2.25, s2: 1 });
    // a result stored before cycles existed: no row values, no failure
    expect(d.rows[2]).toEqual({ arm: "Arm 2", armId: "a2", time: null, estimate: false, blocked: false });
  });

  it("marks an arm whose every branch combination is blocked in the cell", () => {
    const d = cycleChartData(analysis([blocked, known]), 0)!;
    expect(d.rows[0]).toMatchObject({ time: null, blocked: true });
  });

  it("is null when no arm has a known cycle", () => {
    expect(cycleChartData(analysis([unknown, undefined]), 0)).toBeNull();
  });

  it("gives neighbouring steps of one kind different shades", () => {
    const c = stepColours([
      { key: "s0", label: "", kind: "move" }, { key: "s1", label: "", kind: "move" }, { key: "s2", label: "", kind: "wait" }, { key: "s3", label: "", kind: "move" },
    ]);
    expect(c[0]).not.toBe(c[1]);
    expect(c[3]).toBe(c[0]);
    expect(new Set([c[0], c[1], c[2]]).size).toBe(3);
  });
});
