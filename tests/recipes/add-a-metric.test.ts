// Walks the "How to add a metric" recipe of DEVELOPERS.md: a throw-away sub-score is added the
// way the recipe says (one row in the sub-score table through its extension point
// `defineSubScores`, one rule beside the others) and must then reach, with no other edit, the
// weights schema, the requirement-set editor, the analysis result and its ranking, the ranking
// panel and the exports. The expected score is recomputed here from the definition
// score = Σ wₖ sₖ / Σ wₖ (docs/design.md#ranking), not read back from the ranking.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";

const KEY = "axisEconomy";
const LABEL = "Axis economy (recipe test)";

vi.mock("@/shared/sub-scores", async (importOriginal) => {
  const table = await importOriginal<typeof import("@/shared/sub-scores")>();
  const rows = [...table.SUB_SCORE_ROWS, { key: KEY, label: LABEL, colour: "#123456", defaultWeight: 3, measures: "4 / number of axes" }];
  return { ...table, SUB_SCORES: table.defineSubScores(rows) };
});
vi.mock("@/lib/analysis/sub-scores", async (importOriginal) => {
  const rules = await importOriginal<typeof import("@/lib/analysis/sub-scores")>();
  const axisEconomy = {
    score: ({ ctx }: { ctx: { model: { n: number } } }) => ({ value: Math.min(1, 4 / ctx.model.n), applicable: true, note: `${ctx.model.n} axes` }),
  };
  return { ...rules, SUB_SCORE_RULES: { ...rules.SUB_SCORE_RULES, [KEY]: axisEconomy } };
});
// The editor's save hook asks Next for its router; outside Next a do-nothing router stands in.
vi.mock("next/navigation", () => ({ useRouter: () => ({ push() {}, replace() {}, refresh() {}, back() {} }) }));

const { SUB_SCORES } = await import("@/shared/sub-scores");
const { requirementSetSchema, weightsSchema } = await import("@/shared/schemas/requirements");
const { emptyReqForm, reqFormFromDoc, validateReqForm } = await import("@/components/requirements/reqForm");
const { RequirementEditor } = await import("@/components/requirements/RequirementEditor");
const { RankingPanel } = await import("@/components/shortlist/RankingPanel");
const { analyzeShortlist, rankArms } = await import("@/lib/analysis");
const { rankingTable, toCsv, toXlsx } = await import("@/lib/export");
const { loadSeedArms, loadSeedRequirementSets } = await import("@/seed-data/index");
const { readCsvExport, readXlsx } = await import("../export/parse");

type Any = Record<string, number>;

describe("adding a sub-score (DEVELOPERS.md, How to add a metric)", () => {
  const seedReq = loadSeedRequirementSets().find((r) => r.name.startsWith("Bench assembly"))!;
  // Re-parse from the file form: the stored weights lack the new key and get its default.
  const req = requirementSetSchema.parse(JSON.parse(JSON.stringify(seedReq)));
  const pick = loadSeedArms().filter((a) => ["Compact Six 3", "Helper Seven 7", "Table SCARA 600"].some((n) => a.name.startsWith(n.split(" ")[0])));
  const arms = pick.map((arm, i) => ({ id: `arm-${i + 1}`, revision: 1, arm }));
  const analysis = analyzeShortlist(arms, req);

  it("the table holds the new row and the weights schema gives its default", () => {
    expect(SUB_SCORES.keys).toContain(KEY);
    expect((weightsSchema.parse({}) as Any)[KEY]).toBe(3);
    expect((req.weights as Any)[KEY]).toBe(3);
  });

  it("reaches the requirement-set editor: a labelled weight field that saves into the document", () => {
    const form = emptyReqForm();
    expect((form.weights as Record<string, string>)[KEY]).toBe("3");
    const html = renderToStaticMarkup(createElement(RequirementEditor, { canWrite: true, initial: req, id: "req-1", revision: 1 }));
    expect(html).toContain(LABEL);
    expect(html).toContain(`name="weights.${KEY}"`);
    const edited = reqFormFromDoc(req);
    (edited.weights as Record<string, string>)[KEY] = "7.5";
    const { doc, errors } = validateReqForm(edited);
    expect(errors).toEqual([]);
    expect((doc.weights as Any)[KEY]).toBe(7.5);
    (edited.weights as Record<string, string>)[KEY] = "-1";
    expect(validateReqForm(edited).errors.map((e) => e.path)).toContain(`weights.${KEY}`);
  });

  it("reaches the analysis and the ranking: its value per arm and its share of the score", () => {
    expect(arms.length).toBe(3);
    for (const a of analysis.arms) {
      const s = (a.subScores as Record<string, { value: number; applicable: boolean }>)[KEY];
      expect(s).toEqual({ value: Math.min(1, 4 / a.axes), applicable: true, note: `${a.axes} axes` });
    }
    const weights = { ...analysis.weights, [KEY]: 1000 } as typeof analysis.weights;
    const ranked = rankArms(analysis.arms.map((a) => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), weights);
    for (const r of ranked) {
      const a = analysis.arms.find((x) => x.id === r.armId)!;
      const subs = a.subScores as Record<string, { value: number; applicable: boolean }>;
      const w = weights as unknown as Any;
      const total = Object.keys(subs).filter((k) => subs[k].applicable).reduce((t, k) => t + w[k], 0);
      const expected = Object.keys(subs).filter((k) => subs[k].applicable).reduce((t, k) => t + (w[k] / total) * subs[k].value, 0);
      expect(r.score).toBeCloseTo(expected, 12);
      expect((r.contributions as Any)[KEY]).toBeCloseTo((1000 / total) * subs[KEY].value, 12);
    }
    // With an overwhelming weight the qualified arm with the fewest axes leads.
    const qualified = ranked.filter((r) => !r.disqualified);
    const fewest = Math.min(...qualified.map((r) => analysis.arms.find((a) => a.id === r.armId)!.axes));
    expect(analysis.arms.find((a) => a.id === qualified[0].armId)!.axes).toBe(fewest);
  });

  it("reaches the ranking panel: a labelled slider, a swatch in its colour and a table column", () => {
    const html = renderToStaticMarkup(createElement(RankingPanel, {
      shortlistId: "sl-1", runId: "run-1", requirementSetId: "req-1", requirementName: req.name, canSaveWeights: true, weights: analysis.weights,
      arms: analysis.arms.map((a) => ({ id: a.id, armId: a.id, name: a.name, revision: a.revision, summary: a.summary, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })),
    }));
    expect(html).toContain(`aria-label="Weight: ${LABEL}"`);
    expect(html).toContain("background:#123456");
    expect(html.split(LABEL).length - 1).toBeGreaterThanOrEqual(3); // slider label, aria-label, table header
  });

  it("reaches the exports: CSV columns (read back with papaparse), the XLSX ranking sheet and the weights line", async () => {
    const meta = {
      shortlist: { id: "sl-1", name: "Recipe" }, run: { id: "run-1", finishedAt: null }, analysisVersion: analysis.version,
      requirement: { id: "req-1", name: req.name, revision: 1 }, arms: arms.map((a) => ({ id: a.id, name: a.arm.name, revision: 1 })),
      weights: analysis.weights, weightsAdjusted: false, caution: analysis.caution, exportedAt: "2026-01-02T03:05:00.000Z",
    };
    const csv = toCsv(rankingTable(analysis), meta);
    const { columns, records, meta: lines } = readCsvExport(csv);
    for (const col of ["contribution (0–1)", "sub-score (0–1)", "weight (share of 1)"]) expect(columns).toContain(`${LABEL} ${col}`);
    expect(records).toHaveLength(arms.length);
    for (const rec of records) {
      const a = analysis.arms.find((x) => x.name === rec.Arm)!;
      expect(Number(rec[`${LABEL} sub-score (0–1)`])).toBeCloseTo(Math.min(1, 4 / a.axes), 4);
    }
    expect(lines.find((l) => l.startsWith("Weights: "))).toContain(`${KEY} 3`);
    const sheets = await readXlsx(await toXlsx([rankingTable(analysis)], meta));
    const ranking = Object.entries(sheets).find(([name]) => name.startsWith("Ranking"))![1];
    expect(ranking.flat()).toContain(`${LABEL} contribution (0–1)`);
  });

  it("a result stored before the sub-score existed still ranks and exports (the new one not applicable)", () => {
    const old = JSON.parse(JSON.stringify(analysis)) as typeof analysis;
    for (const a of old.arms) delete (a.subScores as Record<string, unknown>)[KEY];
    const ranked = rankArms(old.arms.map((a) => ({ armId: a.id, subScores: a.subScores, failedMusts: a.failedMusts, unknownMusts: a.unknownMusts })), old.weights);
    for (const r of ranked) expect((r.contributions as Any)[KEY]).toBe(0);
    const table = rankingTable(old, ranked);
    const col = table.columns.indexOf(`${LABEL} sub-score (0–1)`);
    expect(col).toBeGreaterThan(0);
    for (const row of table.rows) expect(row[col]).toBe("not applicable");
  });
});
