// The JSON export written in pieces (shortlistJsonPieces) is the same document as the one written
// whole (toShortlistJson): parsed, equal, for a result with arms and for one without.
import { describe, expect, it } from "vitest";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { analyzeShortlist, type ShortlistAnalysis } from "@/lib/analysis";
import { shortlistJsonPieces, toShortlistJson, type ExportMeta } from "@/lib/export";

const req = loadSeedRequirementSets().find((r) => r.name.startsWith("Bench assembly"))!;
const analysis = analyzeShortlist(loadSeedArms().slice(0, 3).map((arm, i) => ({ id: `arm-${i + 1}`, revision: 1, arm })), req);
const meta: ExportMeta = {
  shortlist: { id: "sl-1", name: "Pieces" }, run: { id: "run-1", finishedAt: null }, analysisVersion: analysis.version,
  requirement: { id: "req-1", name: req.name, revision: 1 }, arms: analysis.arms.map((a) => ({ id: a.id, name: a.name, revision: a.revision })),
  weights: analysis.weights, weightsAdjusted: false, caution: analysis.caution, exportedAt: "2026-01-02T03:05:00.000Z",
};

async function joined(a: ShortlistAnalysis): Promise<string> {
  const { arms, ...head } = a;
  let text = "";
  for await (const piece of shortlistJsonPieces(meta, head, a.ranking, arms)) text += piece;
  return text;
}

describe("JSON export in pieces", () => {
  it("parses to the same document as the whole text, indented alike", async () => {
    const text = await joined(analysis);
    expect(JSON.parse(text)).toEqual(JSON.parse(toShortlistJson(meta, analysis, analysis.ranking)));
    expect(text.endsWith("\n}\n")).toBe(true);
    expect(text.split("\n")[1]).toBe('  "format": "armsift-shortlist-1",');
  });

  it("a result without arms is still one valid document", async () => {
    const empty = { ...analysis, arms: [], ranking: [] };
    expect(JSON.parse(await joined(empty)).analysis.arms).toEqual([]);
  });
});
