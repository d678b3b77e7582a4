/**
 * `analyze`: the shortlist analysis of arm files against a requirement-set file, as JSON (the
 * full result with its cache key) or as the CSV compliance table (one row per requirement × arm).
 */
import path from "node:path";
import { analyzeShortlist, type ShortlistAnalysis, type ShortlistArm } from "@/lib/analysis";
import { analysisKey } from "@/lib/analysis/key";
import { csvText } from "@/lib/export/csv";
import { COMPARATOR_TEXT, requirementSetSchema } from "@/shared/schemas/requirements";
import { fixed } from "@/shared/format";
import { CliError, parseOptions, readArm, readDocument, required, type CliCommand } from "../io";

/**
 * The compliance table: specs, then targets and paths, each against every arm. Written by the
 * exports' CSV writer (quoting and the spreadsheet-formula guard), one LF-ended line per record.
 */
function complianceCsv(result: ShortlistAnalysis): string {
  const rows: (string | number | null)[][] = [["kind", "requirement", "priority", "required", "arm", "value", "unit", "verdict", "reason"]];
  const nSpecs = result.requirementSet.specs.length;
  for (let i = 0; i < nSpecs; i++) {
    for (const a of result.arms) {
      const s = a.specs[i];
      rows.push(["spec", s.label, s.priority, `${COMPARATOR_TEXT[s.comparator].symbol} ${s.requiredDisplay}`, a.name, s.valueDisplay, s.displayUnit, s.verdict, s.reason]);
    }
  }
  result.requirementSet.targets.forEach((name, i) => {
    for (const a of result.arms) {
      const t = a.targets[i];
      if (!t) { rows.push(["target", name, "", "reached", a.name, "", "", "unknown", a.error ?? ""]); continue; }
      rows.push(["target", name, "", `reached (${t.mode})`, a.name, t.reached ? fixed(t.dexterity!.margin, 3) : fixed(t.positionError * 1000, 1), t.reached ? "dexterity margin" : "mm position error", t.verdict, t.reason]);
    }
  });
  result.requirementSet.paths.forEach((name, i) => {
    for (const a of result.arms) {
      const p = a.paths[i];
      if (!p) { rows.push(["path", name, "", "followed", a.name, "", "", "unknown", a.error ?? ""]); continue; }
      const f = p.speed.achievableFraction;
      rows.push(["path", name, "", `${fixed(p.speed.required * 1000, 0)} mm/s`, a.name, f === null ? "" : fixed(f * 100, 0), f === null ? "" : "% of required speed", p.verdict, p.reason]);
    }
  });
  return csvText(rows, "\n");
}

export const command: CliCommand = {
  usage: "analyze  --arms A.json,B.json --requirements R.json [--format json|csv]  → the shortlist analysis (JSON) or the compliance table (CSV)",
  run(argv) {
    const options = parseOptions(argv, ["arms", "requirements", "format"]);
    const format = options.get("format") ?? "json";
    if (format !== "json" && format !== "csv") throw new CliError("--format", `must be json or csv, got "${format}"`);
    const files = required(options, "arms").split(",").map((s) => s.trim()).filter(Boolean);
    if (files.length === 0) throw new CliError("--arms", "needs at least one arm file");
    const arms: ShortlistArm[] = files.map((f, i) => ({ id: `${i + 1}:${path.basename(f)}`, revision: 1, arm: readArm(f, "--arms") }));
    const reqFile = required(options, "requirements");
    const requirementSet = readDocument(requirementSetSchema, reqFile, "--requirements");
    const result = analyzeShortlist(arms, requirementSet);
    if (format === "csv") return complianceCsv(result);
    return { key: analysisKey(arms, requirementSet), ...result } as unknown as Record<string, unknown>;
  },
};
