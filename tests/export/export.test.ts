// Exports of a shortlist result: the CSV and XLSX are parsed back and compared with the analysis
// library's result for the demo bench-assembly scenario (values, units, verdict words, metadata).
// CSV is read with papaparse, XLSX with exceljs (tests/export/parse.ts).
import fc from "fast-check";
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { analyzeShortlist, rankArms, type ShortlistAnalysis } from "@/lib/analysis";
import { armClearance } from "@/lib/analysis/clearance";
import { complianceTable, csvField, rankingTable, taskMatrixTable, toCsv, toShortlistJson, toXlsx, type ExportMeta } from "@/lib/export";
import { parseCsvRows, readCsvExport, readXlsx, sheetRecords } from "./parse";
import type { ArmDocument } from "@/shared/schemas";

let analysis: ShortlistAnalysis;
let meta: ExportMeta;
beforeAll(() => {
  const req = loadSeedRequirementSets().find((r) => r.name.startsWith("Bench assembly"))!;
  const arms = loadSeedArms().map((arm, i) => ({ id: `arm-${i + 1}`, revision: i + 1, arm }));
  analysis = analyzeShortlist(arms, req);
  meta = {
    shortlist: { id: "sl-1", name: "Press-fit cell, \"round 1\"" },
    run: { id: "run-1", finishedAt: "2026-01-02T03:04:05.000Z" },
    analysisVersion: analysis.version,
    requirement: { id: "req-1", name: req.name, revision: 3 },
    arms: arms.map((a) => ({ id: a.id, name: a.arm.name, revision: a.revision })),
    weights: analysis.weights,
    weightsAdjusted: false,
    caution: analysis.caution,
    exportedAt: "2026-01-02T03:05:00.000Z",
  };
}, 120_000); // the bench set has a mounting region: the analysis searches each arm's placement too

describe("CSV", () => {
  it("quotes, doubles quotes and guards formula-like text", () => {
    expect(csvField('a "b", c')).toBe('"a ""b"", c"');
    expect(csvField("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)");
    expect(csvField("-12.5")).toBe("-12.5");
    expect(csvField(-3)).toBe("-3");
    expect(csvField(null)).toBe("");
  });

  it("any row of text reads back cell by cell with papaparse (formula-like text with its guard)", () => {
    // What a spreadsheet must show: the text itself, or the text behind an apostrophe when it
    // starts like a formula (=, +, -, @, tab, CR) and is not a plain number.
    const shown = (t: string) => (/^[=+\-@\t\r]/.test(t) && !/^-?\d+(\.\d+)?$/.test(t) ? `'${t}` : t);
    const cell = fc.oneof(fc.string(), fc.constantFrom('"', '""', ",", "\r\n", "\n", "\r", "=1+1", "+A1", "-3", "@SUM(A1)", "\tx", "é ü 中", " a , \"b\" "));
    fc.assert(
      fc.property(fc.array(cell, { minLength: 1, maxLength: 6 }), (cells) => {
        const line = cells.map(csvField).join(",");
        const parsed = Papa.parse<string[]>(line + "\r\n", { header: false, delimiter: ",", newline: "\r\n", skipEmptyLines: false });
        expect(parsed.errors).toEqual([]);
        expect(parsed.data[0]).toEqual(cells.map(shown));
      }),
      { numRuns: 400, seed: 20260102 },
    );
  });

  it("metadata lines go through the same writer as the cells: names are quoted and formula-guarded", () => {
    const hostile: ExportMeta = {
      ...meta,
      shortlist: { id: "sl-1", name: "=1+2" },
      requirement: { ...meta.requirement, name: 'cell,=HYPERLINK("http://evil.test","x")' },
      arms: [{ id: "arm-1", name: "@SUM(A1:A9)", revision: 1 }, { id: "arm-2", name: "+1,-2\r\n=3", revision: 2 }],
    };
    const text = toCsv(complianceTable(analysis), hostile);
    // What a spreadsheet would see: no cell of any line starts a formula (numbers aside).
    const cells = parseCsvRows(text).flat();
    const formulas = cells.filter((c) => /^[=+\-@\t\r]/.test(c) && !/^-?\d+(\.\d+)?$/.test(c));
    expect(formulas).toEqual([]);
    // Every line starts a record whose first cell is "# …" or a header/row cell; the values survive.
    const { meta: lines } = readCsvExport(text);
    expect(lines).toContain("Shortlist: '=1+2 (sl-1)");
    expect(lines).toContain(`Requirement set: cell,=HYPERLINK("http://evil.test","x") (req-1) revision 3`);
    expect(lines).toContain("Arm: '@SUM(A1:A9) (arm-1) revision 1");
    expect(lines).toContain("Arm: '+1,-2 =3 (arm-2) revision 2");
    expect(text.split("\r\n").filter((l) => l.startsWith("# ")).length).toBe(lines.length);
  });

  it("compliance: one row per requirement and arm with the display value, unit and verdict word", () => {
    const text = toCsv(complianceTable(analysis), meta);
    const { meta: lines, columns, records } = readCsvExport(text);
    expect(columns).toEqual(["Requirement", "Priority", "Comparator", "Required value", "Required unit", "Arm", "Arm revision", "Arm value", "Arm value unit", "Verdict", "Reason"]);
    // the spec requirements, the cell's required clearance, then the sequence's required cycle time (the seed
    // set has one), each against every arm
    expect(records).toHaveLength(analysis.arms.length * (analysis.requirementSet.specs.length + 2));
    for (const a of analysis.arms) {
      const rec = records.find((r) => r.Arm === a.name && r.Requirement.startsWith("Cycle time of sequence pick-place-press"))!;
      expect([rec.Priority, rec["Required value"], rec.Verdict]).toEqual(["want", "3.6", a.cycles[0].verdict]);
    }
    for (const a of analysis.arms) {
      const rec = records.find((r) => r.Arm === a.name && r.Requirement === "Clearance in the cell (targets and paths)")!;
      const c = armClearance(a, analysis.cell!.clearance);
      expect(rec.Verdict).toBe(c.verdict);
      expect(rec["Required value"]).toBe(String(analysis.cell!.clearance * 1000));
      expect(rec["Arm value"]).toBe(c.value === null ? "no data" : String(Math.round(c.value * 1e4) / 10));
    }
    expect(lines).toContain(`Analysis version: ${analysis.version}`);
    expect(lines).toContain(`Requirement set: ${meta.requirement.name} (req-1) revision 3`);
    expect(lines.filter((l) => l.startsWith("Arm: "))).toHaveLength(analysis.arms.length);
    expect(lines.some((l) => l.startsWith("Caution: ") && l.includes("ISO 12100"))).toBe(true);
    for (const a of analysis.arms) {
      for (const s of a.specs) {
        const rec = records.find((r) => r.Arm === a.name && r.Requirement === s.label)!;
        expect(rec.Verdict).toBe(s.verdict);
        expect(["meets", "marginal", "fails", "unknown"]).toContain(rec.Verdict);
        expect(rec["Arm value"]).toBe(s.value === null ? "no data" : s.valueDisplay);
        expect(rec["Required unit"]).toBe(s.displayUnit);
        expect(rec["Arm revision"]).toBe(String(a.revision));
      }
    }
    // Reach is shown in mm (stored in m): the demo requirement asks for ≥ 600 mm.
    const reach = records.find((r) => r.Requirement.startsWith("Reach"))!;
    expect(reach["Required value"]).toBe("600");
    expect(reach["Required unit"]).toBe("mm");
  });

  it("ranking: rank order, status and contributions as computed by rankArms", () => {
    const weights = { ...analysis.weights, price: 10 };
    const reranked = rankArms(analysis.arms.map((a) => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), weights);
    const { records } = readCsvExport(toCsv(rankingTable(analysis, reranked), { ...meta, weights, weightsAdjusted: true }));
    expect(records.map((r) => r.Arm)).toEqual(reranked.map((r) => analysis.arms.find((a) => a.id === r.armId)!.name));
    records.forEach((rec, i) => {
      const r = reranked[i];
      expect(Number(rec.Rank)).toBe(r.rank);
      expect(rec.Status).toBe(r.disqualified ? "disqualified" : "qualified");
      expect(Number(rec["Score (0–1)"])).toBeCloseTo(r.score, 4);
      expect(Number(rec["Price contribution (0–1)"])).toBeCloseTo(r.contributions.price, 4);
      expect(rec["Failed must requirements"]).toBe(r.failedMusts.join("; "));
    });
  });
});

describe("XLSX", () => {
  it("has Ranking, Compliance and Metadata sheets with numbers as numbers and verdicts as words", async () => {
    const bytes = await toXlsx([rankingTable(analysis), complianceTable(analysis)], meta);
    const sheets = await readXlsx(bytes);
    expect(Object.keys(sheets)).toEqual(["Ranking", "Compliance", "Metadata"]);
    const ranking = sheetRecords(sheets.Ranking);
    expect(ranking.map((r) => r.Rank)).toEqual(analysis.ranking.map((r) => r.rank));
    expect(ranking[0]["Score (0–1)"]).toBeCloseTo(analysis.ranking[0].score, 4);
    const compliance = sheetRecords(sheets.Compliance);
    const armMass = compliance.filter((r) => String(r.Requirement).startsWith("Arm mass"));
    expect(armMass).toHaveLength(analysis.arms.length);
    for (const row of armMass) {
      const arm = analysis.arms.find((a) => a.name === row.Arm)!;
      const s = arm.specs.find((x) => x.field === "armMass")!;
      expect(row["Arm value"]).toBe(Number(s.valueDisplay));
      expect(row["Arm value unit"]).toBe("kg");
      expect(row.Verdict).toBe(s.verdict);
    }
    const md = Object.fromEntries(sheets.Metadata.slice(1).filter((r) => r[0] !== "Arm").map((r) => [r[0], r[1]]));
    expect(md["Analysis version"]).toBe(analysis.version);
    expect(md["Requirement set"]).toContain("revision 3");
    expect(sheets.Metadata.filter((r) => r[0] === "Arm").map((r) => r[1])).toEqual(meta.arms.map((a) => `${a.name} (${a.id}) revision ${a.revision}`));
  });
});

describe("XLSX task matrix", () => {
  it("has one row per arm and, per target and path, the verdict word, the dexterity margin (0–1) and the reason", async () => {
    const bytes = await toXlsx([rankingTable(analysis), taskMatrixTable(analysis), complianceTable(analysis)], meta);
    const sheets = await readXlsx(bytes);
    expect(Object.keys(sheets)).toEqual(["Ranking", "Task matrix", "Compliance", "Metadata"]);
    const head = sheets["Task matrix"][0] as string[];
    const { targets, paths } = analysis.requirementSet;
    expect(head).toHaveLength(2 + 4 * (targets.length + paths.length));
    expect(head[5]).toBe(`Target ${targets[0]}: clearance (mm)`);
    expect(head.slice(0, 5)).toEqual(["Arm", "Arm revision", `Target ${targets[0]}: verdict`, `Target ${targets[0]}: dexterity margin D (0–1)`, `Target ${targets[0]}: reason`]);
    const rows = sheetRecords(sheets["Task matrix"]);
    expect(rows.map((r) => r.Arm)).toEqual(analysis.arms.map((a) => a.name));
    let reached = 0, missed = 0;
    for (const a of analysis.arms) {
      const row = rows.find((r) => r.Arm === a.name)!;
      expect(row["Arm revision"]).toBe(a.revision);
      a.targets.forEach((t, i) => {
        const name = targets[i];
        expect(row[`Target ${name}: verdict`]).toBe(t.verdict);
        expect(["meets", "marginal", "fails", "unknown"]).toContain(row[`Target ${name}: verdict`]);
        expect(row[`Target ${name}: reason`]).toBe(t.reason);
        const c = row[`Target ${name}: clearance (mm)`];
        if (t.cell) expect(c).toBe(t.cell.collisionFree ? (t.cell.clearance === null ? null : Math.round(t.cell.clearance * 1e4) / 10) : 0);
        const m = row[`Target ${name}: dexterity margin D (0–1)`];
        if (t.dexterity) {
          reached++;
          expect(typeof m).toBe("number");
          expect(Math.abs((m as number) - t.dexterity.margin)).toBeLessThanOrEqual(0.00005);
        } else {
          missed++;
          expect(m).toBeNull();
        }
      });
    }
    // The demo bench-assembly scenario is built so that some arms miss some targets (seed README).
    expect(reached).toBeGreaterThan(0);
    expect(missed).toBeGreaterThan(0);
  });

  it("paths carry their smallest dexterity margin; an arm that was not analysed says so", async () => {
    const req = loadSeedRequirementSets().find((r) => r.name.startsWith("Deburring"))!;
    const arms = loadSeedArms();
    const broken = { ...arms[0], name: "Broken model", joints: arms[0].joints.map((j, i) => (i === 0 ? { ...j, type: "bogus" as never } : j)) } as ArmDocument;
    const small = { ...analysis.budget, workspace: { ...analysis.budget.workspace, samples: 300 } };
    const deburr = analyzeShortlist([{ id: "a", revision: 1, arm: arms[1] }, { id: "b", revision: 2, arm: broken }], req, { budget: small });
    const rows = sheetRecords((await readXlsx(await toXlsx([taskMatrixTable(deburr)], meta)))["Task matrix"]);
    expect(req.paths.length).toBeGreaterThan(0);
    expect(deburr.arms[0].paths.some((p) => p.minDexterityMargin !== null)).toBe(true);
    for (const [i, p] of deburr.arms[0].paths.entries()) {
      const name = req.paths[i].name;
      expect(rows[0][`Path ${name}: verdict`]).toBe(p.verdict);
      expect(rows[0][`Path ${name}: reason`]).toBe(p.reason);
      const m = rows[0][`Path ${name}: smallest dexterity margin D (0–1)`];
      if (p.minDexterityMargin === null) expect(m).toBeNull();
      else expect(Math.abs((m as number) - p.minDexterityMargin)).toBeLessThanOrEqual(0.00005);
    }
    expect(rows[1].Arm).toBe("Broken model");
    expect(rows[1][`Target ${req.targets[0].name}: verdict`]).toBe("not analysed");
    expect(String(rows[1][`Path ${req.paths[0].name}: reason`])).toMatch(/^the arm model is invalid/);
  });
});

describe("JSON", () => {
  it("round-trips the analysis with its metadata and ranking", () => {
    const parsed = JSON.parse(toShortlistJson(meta, analysis, analysis.ranking));
    expect(parsed.format).toBe("armsift-shortlist-1");
    expect(parsed.meta.requirement.revision).toBe(3);
    expect(parsed.analysis).toEqual(JSON.parse(JSON.stringify(analysis)));
  });
});
