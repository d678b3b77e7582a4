/**
 * Turns a stored analysis into what the page components draw (display units: mm, degrees, kg, N),
 * keeping the client payload small (profiles thinned to at most 200 points).
 */
import type { ArmAnalysis, ArmPlacementResult, ShortlistAnalysis, ShortlistPlacement } from "@/lib/analysis/shortlist";
import type { RankedArm } from "@/lib/analysis/ranking";
import type { TargetAnalysis } from "@/lib/analysis/targets";
import type { PathAnalysis } from "@/lib/analysis/paths";
import type { MatrixCell, MatrixRow } from "./TaskMatrix";
import type { PathProfileData, WorkspaceData } from "./Charts";
import { fixed } from "@/shared/format";

const mm = (m: number) => m * 1000;
const deg = (r: number) => (r * 180) / Math.PI;

function limitingText(t: TargetAnalysis): string {
  if (t.cell && !t.cell.collisionFree) return `collision: ${t.cell.collision!.a} hits ${t.cell.collision!.b}`;
  if (!t.reached || !t.dexterity) return `not reached: ${t.reason}`;
  const l = t.dexterity.limiting;
  const what = l.factor === "translation" ? "translational conditioning (position singularity nearby)"
    : l.factor === "orientation" ? "orientation conditioning (wrist singularity nearby)"
    : `joint ${l.joint ?? "?"} near its limit`;
  return `${what}: factor ${fixed(l.value)}`;
}

function targetCell(t: TargetAnalysis): MatrixCell {
  const details: string[] = [`mode ${t.mode}`, `position error ${fixed(mm(t.positionError), 4)} mm` + (t.mode === "point" ? "" : `, rotation error ${fixed(deg(t.rotationError), 4)}°`)];
  if (t.reached) details.push(`${t.solutions.length} distinct branch${t.solutions.length === 1 ? "" : "es"} found; best dexterity margin chosen`);
  if (t.dexterity) {
    const d = t.dexterity;
    const orientation = d.axisOrientation
      ? `orientation ${fixed(d.axisOrientation.inverseCondition, 3)} about the tool x and y axes (the rotations an axis target constrains; ${fixed(d.orientation.inverseCondition, 3)} over all three)`
      : `orientation ${fixed(d.orientation.inverseCondition, 3)}`;
    details.push(`translational inverse condition ${fixed(d.translation.inverseCondition, 3)}, ${orientation}, joint-limit margin ${fixed(d.jointLimits.margin, 3)}`);
  }
  if (t.cell) {
    const c = t.cell;
    details.push(c.collisionFree
      ? `cell: collision-free${c.clearance !== null && c.closest ? `, clearance ${fixed(mm(c.clearance), 1)} mm (${c.closest.a} to ${c.closest.b}; required ${fixed(mm(c.required), 1)} mm)` : ""}; ${c.colliding} of ${c.branches} branch${c.branches === 1 ? "" : "es"} collide`
      : `cell: every branch found collides (${c.branches}); least overlap ${fixed(mm(c.collision!.depth), 1)} mm between ${c.collision!.a} and ${c.collision!.b}`);
    if (c.contact.length) details.push(`contact allowed for the tool and payload with: ${c.contact.join(", ")}`);
  }
  if (t.holding) details.push(`holding: ${t.holding.verdict} — ${t.holding.reason}`);
  if (t.force) details.push(`force: ${t.force.verdict} — ${t.force.reason}`);
  if (t.wrist) details.push(`wrist: ${t.wrist.verdict} — ${t.wrist.reason}`);
  details.push(`inverse kinematics: ${t.ikReason}`);
  return { kind: "target", name: t.name, verdict: t.verdict, margin: t.dexterity?.margin ?? null, limiting: limitingText(t), reason: t.reason, details };
}

function pathCell(p: PathAnalysis): MatrixCell {
  const details = [`${p.reached} of ${p.samples} samples reached (step ${fixed(mm(p.step), 1)} mm over ${fixed(mm(p.length), 0)} mm)`, `speed: ${p.speed.note}`];
  if (p.firstUnreached) details.push(`first sample not reached at ${fixed(mm(p.firstUnreached.s), 0)} mm: ${p.firstUnreached.detail}`);
  for (const f of p.flips.slice(0, 5)) details.push(`configuration flip at ${fixed(mm(f.s), 0)} mm: ${f.detail}`);
  // the stored result keeps the first few events; eventCounts has how many there were
  const limitHits = p.eventCounts?.limitHits ?? p.limitHits.length;
  if (limitHits) details.push(`${limitHits} sample${limitHits === 1 ? "" : "s"} at a joint limit`);
  if (p.cell) {
    const c = p.cell;
    if (c.firstCollision) details.push(`cell: collides ${c.firstCollision.between ? "between samples" : "at a sample"} at ${fixed(mm(c.firstCollision.s), 0)} mm: ${c.firstCollision.a} hits ${c.firstCollision.b}`);
    else details.push(`cell: collision-free at every sample and between them${c.clearance !== null && c.closest ? `; clearance ${fixed(mm(c.clearance), 1)} mm (${c.closest.a} to ${c.closest.b}) at ${fixed(mm(c.closest.s), 0)} mm` : ""}`);
  }
  const limiting = p.reached < p.samples ? "part of the path is not reached"
    : p.cell?.firstCollision ? `collision: ${p.cell.firstCollision.a} hits ${p.cell.firstCollision.b}`
    : p.flips.length ? "configuration flip along the path"
    : p.speed.limitingJoint !== null ? `joint ${p.speed.limitingJoint} ${p.speed.limitingAtPositionLimit ? "at its position limit" : "speed"} (${p.speed.achievableFraction !== null ? `${fixed(p.speed.achievableFraction * 100, 0)} % of the required tool speed possible` : "unknown"})`
    : p.speed.note;
  return { kind: "path", name: p.name, verdict: p.verdict, margin: p.minDexterityMargin, limiting, reason: p.reason, details };
}

/** One arm's row of matrix cells, targets then paths, with their reasons and details. */
export function armMatrixCells(req: Pick<ShortlistAnalysis["requirementSet"], "targets" | "paths">, arm: ArmAnalysis): MatrixCell[] {
  return arm.error
    ? [...req.targets.map((name) => ({ kind: "target" as const, name })), ...req.paths.map((name) => ({ kind: "path" as const, name }))].map((c) => ({
        ...c, verdict: "unknown" as const, margin: null, limiting: "arm not analysed", reason: arm.summary, details: [],
      }))
    : [...arm.targets.map(targetCell), ...arm.paths.map(pathCell)];
}

export function matrixRows(a: ShortlistAnalysis): MatrixRow[] {
  return a.arms.map((arm) => ({ armId: arm.id, armName: arm.name, cells: armMatrixCells(a.requirementSet, arm) }));
}

/**
 * The matrix as the page sends it: each cell's verdict, margin and limiting factor; the reason
 * and the details are left out (the matrix loads them with the arm when a cell is opened), so a
 * large shortlist's page does not carry them for every cell.
 */
export function matrixSummaryRows(a: ShortlistAnalysis): MatrixRow[] {
  return matrixRows(a).map((r) => ({ ...r, cells: r.cells.map(({ reason: _reason, details: _details, ...c }) => c) }));
}

export function matrixColumns(a: ShortlistAnalysis): { kind: "target" | "path"; name: string }[] {
  return [...a.requirementSet.targets.map((name) => ({ kind: "target" as const, name })), ...a.requirementSet.paths.map((name) => ({ kind: "path" as const, name }))];
}

const MAX_POINTS = 200;

export function pathProfile(p: PathAnalysis): PathProfileData {
  const n = p.profile.s.length;
  const stride = Math.max(1, Math.ceil(n / MAX_POINTS));
  const points: PathProfileData["points"] = [];
  for (let i = 0; i < n; i += stride) {
    const sig = p.profile.sigmaMinTranslation[i];
    const ratio = p.profile.speedRatio[i];
    const traj = p.profile.trajectorySpeedRatio?.[i] ?? null;
    points.push({
      s: Math.round(mm(p.profile.s[i]) * 10) / 10,
      sigma: sig === null ? null : Math.round(mm(sig) * 10) / 10,
      speedUse: ratio === null || !(ratio > 0) ? null : Math.round((100 / ratio) * 10) / 10,
      trajectoryUse: traj === null || !(traj > 0) ? null : Math.round((100 / traj) * 10) / 10,
    });
  }
  return { name: p.name, points, rotationOnly: p.speed.rotationOnlySegments ?? false };
}

export function workspaceData(arm: ArmAnalysis): WorkspaceData | null {
  const w = arm.workspace;
  if (!w) return null;
  const r1 = (v: number) => Math.round(mm(v));
  return {
    side: w.side.map(([r, z]) => ({ r: r1(r), z: r1(z) })),
    top: w.top.map(([x, y]) => ({ x: r1(x), y: r1(y) })),
    targets: w.targets.map((t) => ({ name: t.name, r: r1(t.r), z: r1(t.z), x: r1(t.x), y: r1(t.y), reached: t.reached })),
    note: w.note,
  };
}

/** One arm's row: the two ranks and what the placement changed (props only; no data access). */
export interface PlacementRow {
  id: string;
  name: string;
  nominal: RankedArm;
  placed: RankedArm;
  nominalArm: ArmAnalysis;
  result: ArmPlacementResult;
}

/** Rows of the placement table from a result, in the order of the ranking at the placements. */
export function placementRows(arms: readonly ArmAnalysis[], ranking: readonly RankedArm[], placement: ShortlistPlacement): PlacementRow[] {
  return placement.ranking.map((placed) => {
    const nominalArm = arms.find((a) => a.id === placed.armId)!;
    return {
      id: placed.armId, name: nominalArm.name, placed, nominalArm,
      nominal: ranking.find((r) => r.armId === placed.armId)!,
      result: placement.arms.find((a) => a.id === placed.armId)!,
    };
  });
}

/** One sequence across the arms, for the stacked-bar chart (s). */
export interface CycleChartData {
  sequence: string;
  /** Required cycle time (s), or null. */
  required: number | null;
  /** The sequence's steps in order (the same for every arm); `key` names the data field. */
  steps: { key: string; label: string; kind: "move" | "path" | "wait" }[];
  /** One row per arm, in the analysis's order: the step times under the steps' keys (s). */
  rows: ({ arm: string; armId: string; time: number | null; estimate: boolean; blocked: boolean } & Record<string, number | string | boolean | null>)[];
}

const ms = (t: number) => Math.round(t * 1000) / 1000;

/**
 * The cycle of sequence `index` for every arm: each arm's step times as one row (null time for an
 * arm whose cycle is unknown). Null when no arm has a known cycle for it.
 */
export function cycleChartData(a: ShortlistAnalysis, index: number): CycleChartData | null {
  const cycles = a.arms.map((arm) => arm.cycles?.[index]);
  const known = cycles.find((c) => c && c.time !== null && c.steps.length > 0);
  if (!known) return null;
  const steps = known.steps.map((s, k) => ({ key: `s${k}`, label: `${k + 1}. ${s.kind === "wait" ? "wait" : s.kind === "path" ? `path ${s.name}` : s.name}`, kind: s.kind }));
  const rows = a.arms.map((arm, i) => {
    const c = cycles[i];
    const row: CycleChartData["rows"][number] = { arm: arm.name, armId: arm.id, time: c?.time ?? null, estimate: c?.estimate ?? false, blocked: !!c?.blocked };
    if (c && c.time !== null) c.steps.forEach((s, k) => (row[`s${k}`] = ms(s.time)));
    return row;
  });
  return { sequence: known.name, required: known.required, steps, rows };
}
