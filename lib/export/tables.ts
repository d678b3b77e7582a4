/**
 * The ranking, the task matrix and the compliance table as plain rows (pure): the one source for the CSV, XLSX
 * and JSON exports, so every format carries the same values, units and verdict words.
 */
import { COMPARATOR_TEXT, type Weights } from "@/shared/schemas/requirements";
import { subScoreOf, type RankedArm } from "@/lib/analysis/ranking";
import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";
import { SUB_SCORES } from "@/shared/sub-scores";
import { armClearance } from "@/lib/analysis/clearance";

/** What every export states about where its numbers come from. */
export interface ExportMeta {
  shortlist: { id: string; name: string };
  run: { id: string; finishedAt: string | null };
  analysisVersion: string;
  requirement: { id: string; name: string; revision: number };
  arms: { id: string; name: string; revision: number }[];
  /** Weights the ranking was computed with. */
  weights: Weights;
  /** True when they differ from the requirement set's stored weights. */
  weightsAdjusted: boolean;
  caution: string;
  /** When the export was made (ISO). */
  exportedAt: string;
}

export type Cell = string | number | null;

export interface Table {
  title: string;
  columns: string[];
  rows: Cell[][];
}

const NUMERIC = /^-?\d+(\.\d+)?$/;
/** A display value as a number when it is one (so spreadsheets can compute with it). */
const asCell = (text: string): Cell => (NUMERIC.test(text) ? Number(text) : text === "" ? null : text);
const round = (v: number, d = 4) => Math.round(v * 10 ** d) / 10 ** d;

/** The ranking, best first; `ranking` may be a re-rank with other weights. */
export function rankingTable(analysis: ShortlistAnalysis, ranking: readonly RankedArm[] = analysis.ranking): Table {
  const byId = new Map(analysis.arms.map((a) => [a.id, a]));
  const columns = [
    "Rank", "Arm", "Maker", "Model code", "Arm revision", "Status", "Score (0–1)",
    ...SUB_SCORES.keys.map((k) => `${SUB_SCORES.label[k]} contribution (0–1)`),
    ...SUB_SCORES.keys.map((k) => `${SUB_SCORES.label[k]} sub-score (0–1)`),
    ...SUB_SCORES.keys.map((k) => `${SUB_SCORES.label[k]} weight (share of 1)`),
    "Targets reached (count)", "Targets (count)", "Failed must requirements", "Must requirements with missing data", "Summary",
  ];
  const rows = ranking.map((r): Cell[] => {
    const a = byId.get(r.armId)!;
    return [
      r.rank, a.name, a.maker, a.modelCode, a.revision, r.disqualified ? "disqualified" : "qualified", round(r.score),
      ...SUB_SCORES.keys.map((k) => round(r.contributions[k])),
      ...SUB_SCORES.keys.map((k) => { const s = subScoreOf(a.subScores, k); return s.applicable ? round(s.value) : "not applicable"; }),
      ...SUB_SCORES.keys.map((k) => round(r.weights[k])),
      a.targets.filter((t) => t.reached).length, a.targets.length,
      r.failedMusts.join("; "), r.unknownMusts.join("; "), a.summary,
    ];
  });
  return { title: "Ranking", columns, rows };
}


/** Every spec requirement against every arm: one row per (requirement, arm). */
export function complianceTable(analysis: ShortlistAnalysis): Table {
  const columns = ["Requirement", "Priority", "Comparator", "Required value", "Required unit", "Arm", "Arm revision", "Arm value", "Arm value unit", "Verdict", "Reason"];
  const rows: Cell[][] = [];
  const count = analysis.requirementSet.specs.length;
  for (let i = 0; i < count; i++) {
    for (const a of analysis.arms) {
      const s = a.specs[i];
      if (!s) continue;
      rows.push([
        s.label, s.priority, COMPARATOR_TEXT[s.comparator].words, asCell(s.requiredDisplay), s.displayUnit || null,
        a.name, a.revision, s.value === null ? "no data" : asCell(s.valueDisplay), s.value === null ? null : s.displayUnit || null, s.verdict, s.reason,
      ]);
    }
  }
  // the cell's required clearance, against each arm's smallest clearance (absent in results made without the cell)
  if (analysis.cell) {
    const req = analysis.cell.clearance;
    for (const a of analysis.arms) {
      const c = armClearance(a, req);
      rows.push(["Clearance in the cell (targets and paths)", "must", COMPARATOR_TEXT.atLeast.words, round(req * 1000, 1), "mm", a.name, a.revision, c.value === null ? "no data" : round(c.value * 1000, 1), c.value === null ? null : "mm", c.verdict, c.reason]);
    }
  }
  // each sequence's required cycle time, against each arm's estimated cycle (a required time informs, it never disqualifies)
  (analysis.requirementSet.sequences ?? []).forEach((name, i) => {
    for (const a of analysis.arms) {
      const c = a.cycles?.[i];
      if (!c || c.required === null) continue;
      rows.push([
        `Cycle time of sequence ${name}${c.estimate ? " (an estimate)" : ""}`, "want", COMPARATOR_TEXT.atMost.words, round(c.required, 3), "s",
        a.name, a.revision, c.time !== null ? round(c.time, 3) : c.blocked ? `blocked at step ${c.blocked.step}` : "no data", c.time === null ? null : "s", c.verdict, c.reason,
      ]);
    }
  });
  return { title: "Compliance", columns, rows };
}

/**
 * The cycle time of each sequence for each arm (docs/design.md#cycle-time): one row per
 * (sequence, arm) with the time, the required time, parts per hour, the verdict, whether the figure
 * is an estimate from an assumed acceleration (and which joints lacked the limit), the step that
 * blocks the cycle (if any) and the reason. Empty without sequences (and in results made before them).
 */
export function cycleTable(analysis: ShortlistAnalysis): Table {
  const columns = [
    "Sequence", "Arm", "Arm revision", "Cycle time (s)", "Required cycle time (s)", "Parts per hour (1/h)", "Verdict",
    "Estimate (assumed acceleration)", "Joints with assumed acceleration", "Steps (count)", "Reason",
  ];
  const rows: Cell[][] = [];
  (analysis.requirementSet.sequences ?? []).forEach((name, i) => {
    for (const a of analysis.arms) {
      const c = a.cycles?.[i];
      if (!c) { rows.push([name, a.name, a.revision, null, null, null, "unknown", null, null, null, a.error ? `not analysed: ${a.error}` : "not in this result"]); continue; }
      rows.push([
        name, a.name, a.revision, c.time === null ? null : round(c.time, 3), c.required === null ? null : round(c.required, 3),
        c.partsPerHour === null ? null : round(c.partsPerHour, 1), c.verdict, c.estimate ? "yes" : "no",
        c.assumedAcceleration.length ? c.assumedAcceleration.map((j) => `joint ${j}`).join(", ") : null, c.steps.length, c.reason,
      ]);
    }
  });
  return { title: "Cycle time", columns, rows };
}

/**
 * Each arm at its own best placement in the mounting region against the nominal base
 * (docs/design.md#mount-placement): ranks, scores, the placement in mm and degrees, what it
 * reaches there, the placements evaluated and the base pose (row-major, m). Ranked with the
 * requirement set's weights. Empty without a mounting region (and in results made before it).
 */
export function placementTable(analysis: ShortlistAnalysis): Table {
  const columns = [
    "Arm", "Arm revision", "Rank at its placement", "Score at its placement", "Rank at the nominal base", "Score at the nominal base", "Rank change (places up)",
    "x (mm)", "y (mm)", "z (mm)", "Yaw (°)", "Targets reached at its placement", "Targets reached at the nominal base",
    "Paths followed at its placement", "Paths followed at the nominal base", "Placements evaluated", "Base pose (row-major 4×4, m)", "Note",
  ];
  const p = analysis.placement;
  if (!p) return { title: "Placement", columns, rows: [] };
  const reached = (a: ShortlistAnalysis["arms"][number]) => a.targets.filter((t) => t.reached).length;
  const followed = (a: ShortlistAnalysis["arms"][number]) => a.paths.filter((t) => t.verdict === "meets" || t.verdict === "marginal").length;
  const rows = p.ranking.map((placed): Cell[] => {
    const arm = analysis.arms.find((a) => a.id === placed.armId)!;
    const nominal = analysis.ranking.find((r) => r.armId === placed.armId)!;
    const r = p.arms.find((a) => a.id === placed.armId)!;
    const at = r.analysis, pl = r.placement;
    return [
      arm.name, arm.revision, placed.rank, round(placed.score, 4), nominal.rank, round(nominal.score, 4), nominal.rank - placed.rank,
      pl ? round(pl.x * 1000, 1) : null, pl ? round(pl.y * 1000, 1) : null, pl ? round(pl.z * 1000, 1) : null, pl ? round((pl.yaw * 180) / Math.PI, 2) : null,
      at ? reached(at) : null, reached(arm), at ? followed(at) : null, followed(arm), r.evaluated,
      r.base ? r.base.map((v) => round(v, 9)).join(" ") : null, r.skipped ?? (placed.disqualified ? `disqualified: ${placed.failedMusts.join("; ")}` : null),
    ];
  });
  return { title: "Placement", columns, rows };
}

/**
 * Each cycle's steps (the breakdown behind the cycle table): one row per (sequence, arm, step)
 * with the step's kind, target or path, time and limiting joint.
 */
export function cycleStepsTable(analysis: ShortlistAnalysis): Table {
  const columns = ["Sequence", "Arm", "Arm revision", "Step", "Kind", "Target or path", "Time (s)", "Limiting joint"];
  const rows: Cell[][] = [];
  (analysis.requirementSet.sequences ?? []).forEach((name, i) => {
    for (const a of analysis.arms) {
      (a.cycles?.[i]?.steps ?? []).forEach((st, k) => {
        rows.push([name, a.name, a.revision, k + 1, st.kind, st.kind === "wait" ? null : st.name, round(st.time, 3), st.limitingJoint]);
      });
    }
  });
  return { title: "Cycle steps", columns, rows };
}

/**
 * Arms × targets and paths (the page's task matrix): one row per arm and, per target then per
 * path, four columns: the verdict word, the dexterity margin D (0–1, dimensionless; the chosen
 * branch at a target, the smallest over the reached samples of a path; empty when not reached),
 * the reason in words, and the clearance in the cell (mm; the smallest distance over the checked
 * pairs at the chosen configuration or along the path, 0 when colliding, empty when nothing is
 * checked or in results made without the cell). An arm that could not be analysed reads "not analysed".
 */
export function taskMatrixTable(analysis: ShortlistAnalysis): Table {
  const tasks = [
    ...analysis.requirementSet.targets.map((name, i) => ({ kind: "Target", name, i })),
    ...analysis.requirementSet.paths.map((name, i) => ({ kind: "Path", name, i })),
  ];
  const columns = [
    "Arm", "Arm revision",
    ...tasks.flatMap((t) => [
      `${t.kind} ${t.name}: verdict`,
      `${t.kind} ${t.name}: ${t.kind === "Path" ? "smallest " : ""}dexterity margin D (0–1)`,
      `${t.kind} ${t.name}: reason`,
      `${t.kind} ${t.name}: clearance (mm)`,
    ]),
  ];
  const rows = analysis.arms.map((a): Cell[] => [
    a.name, a.revision,
    ...tasks.flatMap((t): Cell[] => {
      const r = t.kind === "Target" ? a.targets[t.i] : a.paths[t.i];
      if (!r) return ["not analysed", null, a.error ?? "not analysed", null];
      const margin = t.kind === "Target" ? a.targets[t.i].dexterity?.margin ?? null : a.paths[t.i].minDexterityMargin;
      const clearance = t.kind === "Target"
        ? (a.targets[t.i].cell ? (a.targets[t.i].cell!.collisionFree ? a.targets[t.i].cell!.clearance : 0) : null)
        : (a.paths[t.i].cell ? (a.paths[t.i].cell!.collisionFree ? a.paths[t.i].cell!.clearance : 0) : null);
      return [r.verdict, margin === null ? null : round(margin), r.reason, clearance === null || clearance === undefined ? null : round(clearance * 1000, 1)];
    }),
  ]);
  return { title: "Task matrix", columns, rows };
}

/** The metadata block as (key, value) pairs. */
export function metadataPairs(meta: ExportMeta): [string, string][] {
  return [
    ["Shortlist", `${meta.shortlist.name} (${meta.shortlist.id})`],
    ["Analysis version", meta.analysisVersion],
    ["Analysis run", `${meta.run.id}${meta.run.finishedAt ? `, finished ${meta.run.finishedAt}` : ""}`],
    ["Requirement set", `${meta.requirement.name} (${meta.requirement.id}) revision ${meta.requirement.revision}`],
    ...meta.arms.map((a): [string, string] => ["Arm", `${a.name} (${a.id}) revision ${a.revision}`]),
    ["Weights", SUB_SCORES.keys.map((k) => `${k} ${meta.weights[k]}`).join(", ") + (meta.weightsAdjusted ? " (adjusted on the page, not saved)" : " (the requirement set's)")],
    ["Exported", meta.exportedAt],
    ["Caution", meta.caution],
  ];
}
