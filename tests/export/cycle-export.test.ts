// Cycle time in the exports (docs/formats.md#shortlist-export): the cycle table (CSV `table=cycle`,
// an XLSX sheet), the compliance rows against a required cycle time and the JSON, read back with
// papaparse and exceljs (tests/export/parse.ts) and compared with the analysis result.
import { describe, expect, it } from "vitest";
import { analyzeShortlist } from "@/lib/analysis";
import { complianceTable, shortlistExport, toCsv, cycleTable, type ExportMeta } from "@/lib/export";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";
import { readCsvExport, readXlsx, sheetRecords } from "./parse";

const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
// Two invented planar arms, one three times as fast as the other; the slow one has no acceleration limits.
const planar = (name: string, v: number, accel: boolean) =>
  armSchema.parse({ name, convention: "dh", joints: [1, 0.8].map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3, maxSpeed: v, ...(accel ? { maxAcceleration: 4 * v } : {}) })) });
const req = requirementSetSchema.parse({
  name: "two loops", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] }, paths: [], specs: [],
  targets: [{ name: "a", position: [1.2, 0.5, 0], rpy: [0, 0, 0], mode: "point" }, { name: "b", position: [-0.4, 1.3, 0], rpy: [0, 0, 0], mode: "point" }],
  sequences: [
    { name: "ab", required: 2.5, steps: [{ kind: "move", target: "a", dwell: 0.2 }, { kind: "wait", seconds: 0.3 }, { kind: "move", target: "b" }] },
    { name: "free", steps: [{ kind: "move", target: "b" }, { kind: "move", target: "a" }] },
  ],
});
const analysis = analyzeShortlist([{ id: "quick", revision: 1, arm: planar("Quick 2R", 3, true) }, { id: "slow", revision: 2, arm: planar("Slow 2R", 1, false) }], req);
const meta: ExportMeta = {
  shortlist: { id: "sl-1", name: "Cycle" }, run: { id: "run-1", finishedAt: null }, analysisVersion: analysis.version,
  requirement: { id: "req-1", name: req.name, revision: 1 }, arms: analysis.arms.map((a) => ({ id: a.id, name: a.name, revision: a.revision })),
  weights: analysis.weights, weightsAdjusted: false, caution: analysis.caution, exportedAt: "2026-01-02T03:05:00.000Z",
};

describe("cycle time in the exports", () => {
  it("the result holds what the exports read: one met and one missed requirement", () => {
    const [quick, slow] = analysis.arms.map((a) => a.cycles[0]);
    expect(quick.verdict).toBe("meets");
    expect(slow.verdict).toBe("fails");
    expect(slow.estimate).toBe(true);
  });

  it("CSV table=cycle: one row per sequence and arm with time, required time, parts per hour, verdict and the estimate flag", async () => {
    const file = await shortlistExport({ shortlist: meta.shortlist, run: { id: "run-1", finishedAt: null, requirement: { setId: "req-1", revision: 1 } }, analysis, format: "csv", table: "cycle", exportedAt: new Date(meta.exportedAt) });
    expect(file.fileName).toMatch(/\.cycle\.csv$/);
    const { columns, records, meta: lines } = readCsvExport(file.body as string);
    expect(lines[0]).toBe("Armsift cycle time");
    expect(columns).toEqual(cycleTable(analysis).columns);
    expect(records).toHaveLength(4);
    for (const rec of records) {
      const arm = analysis.arms.find((a) => a.name === rec.Arm)!;
      const c = arm.cycles[req.sequences!.findIndex((q) => q.name === rec.Sequence)];
      expect(Number(rec["Cycle time (s)"])).toBeCloseTo(c.time!, 3);
      expect(Number(rec["Parts per hour (1/h)"])).toBeCloseTo(3600 / c.time!, 1);
      expect(rec["Required cycle time (s)"]).toBe(c.required === null ? "" : String(c.required));
      expect(rec.Verdict).toBe(c.verdict);
      expect(rec["Estimate (assumed acceleration)"]).toBe(arm.id === "slow" ? "yes" : "no");
      expect(rec["Joints with assumed acceleration"]).toBe(arm.id === "slow" ? "joint 1, joint 2" : "");
    }
  });

  it("compliance: a row per arm for each sequence with a required time (want, at most, in s), none for a sequence without", () => {
    const { records } = readCsvExport(toCsv(complianceTable(analysis), meta));
    const rows = records.filter((r) => r.Requirement.startsWith("Cycle time"));
    expect(rows.map((r) => [r.Requirement, r.Arm, r.Verdict])).toEqual([
      ["Cycle time of sequence ab", "Quick 2R", "meets"],
      ["Cycle time of sequence ab (an estimate)", "Slow 2R", "fails"],
    ]);
    for (const r of rows) {
      expect(r.Priority).toBe("want");
      expect([r["Required value"], r["Required unit"], r["Arm value unit"]]).toEqual(["2.5", "s", "s"]);
      const c = analysis.arms.find((a) => a.name === r.Arm)!.cycles[0];
      expect(Number(r["Arm value"])).toBeCloseTo(c.time!, 3);
    }
  });

  it("XLSX: a Cycle time sheet with numbers as numbers and a Cycle steps sheet whose times add up to the cycle", async () => {
    const file = await shortlistExport({ shortlist: meta.shortlist, run: { id: "run-1", finishedAt: null, requirement: { setId: "req-1", revision: 1 } }, analysis, format: "xlsx", exportedAt: new Date(meta.exportedAt) });
    const sheets = await readXlsx(Buffer.from(file.body as Uint8Array));
    const cycles = sheetRecords(sheets["Cycle time"]);
    expect(cycles).toHaveLength(4);
    expect(typeof cycles[0]["Cycle time (s)"]).toBe("number");
    const steps = sheetRecords(sheets["Cycle steps"]);
    for (const c of cycles) {
      const own = steps.filter((s) => s.Sequence === c.Sequence && s.Arm === c.Arm);
      expect(own).toHaveLength(c["Steps (count)"] as number);
      expect(own.reduce((t, s) => t + (s["Time (s)"] as number), 0)).toBeCloseTo(c["Cycle time (s)"] as number, 2);
    }
    expect(sheetRecords(sheets.Ranking)[0]).toHaveProperty("Cycle time sub-score (0–1)");
  });

  it("JSON: the stored cycles of every arm, with the estimate flag", async () => {
    const file = await shortlistExport({ shortlist: meta.shortlist, run: { id: "run-1", finishedAt: null, requirement: { setId: "req-1", revision: 1 } }, analysis, format: "json", exportedAt: new Date(meta.exportedAt) });
    const doc = JSON.parse(file.body as string);
    expect(doc.analysis.requirementSet.sequences).toEqual(["ab", "free"]);
    expect(doc.analysis.arms.map((a: { cycles: { estimate: boolean }[] }) => a.cycles.map((c) => c.estimate))).toEqual([[false, false], [true, true]]);
  });

  it("without sequences the XLSX has no cycle sheets and the cycle table is empty", async () => {
    const plain = analyzeShortlist([{ id: "quick", revision: 1, arm: planar("Quick 2R", 3, true) }], requirementSetSchema.parse({ ...req, sequences: undefined }));
    expect(cycleTable(plain).rows).toEqual([]);
    const file = await shortlistExport({ shortlist: meta.shortlist, run: { id: "run-1", finishedAt: null, requirement: { setId: "req-1", revision: 1 } }, analysis: plain, format: "xlsx", exportedAt: new Date(meta.exportedAt) });
    expect(Object.keys(await readXlsx(Buffer.from(file.body as Uint8Array)))).toEqual(["Ranking", "Task matrix", "Compliance", "Metadata"]);
  });
});

describe("cycle time in the compliance table of the page (printed with it)", () => {
  it("shows per sequence the required time and each arm's cycle, parts per hour, estimate mark and verdict", async () => {
    const { createElement } = await import("react");
    const { renderToStaticMarkup } = await import("react-dom/server");
    const { CycleCompliance } = await import("@/components/shortlist/CycleCompliance");
    const html = renderToStaticMarkup(createElement(CycleCompliance, { analysis }));
    expect(html).toContain('data-testid="compliance-cycle"');
    expect(html).toContain('class="compliance printable"');
    expect(html.split('data-testid="compliance-cycle-row"').length - 1).toBe(2);
    const [quick, slow] = analysis.arms.map((a) => a.cycles[0]);
    expect(html).toContain(`${quick.time!.toFixed(2)} s`);
    expect(html).toContain(`(${Math.round(3600 / slow.time!)} parts/h)`);
    expect(html).toContain("≤ 2.50");
    expect(html).toContain("none given");
    expect(html.split("> estimate<").length - 1).toBe(2); // the slow arm, both sequences
    const none = analyzeShortlist([{ id: "quick", revision: 1, arm: planar("Quick 2R", 3, true) }], requirementSetSchema.parse({ ...req, sequences: undefined }));
    expect(renderToStaticMarkup(createElement(CycleCompliance, { analysis: none }))).toBe("");
  });
});
