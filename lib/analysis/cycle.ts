/**
 * Cycle time of a task sequence (docs/design.md#cycle-time): synchronised point-to-point joint
 * moves under speed and acceleration limits (trapezoidal, or triangular when too short to reach
 * full speed), path steps at the speed they are actually followed at, waits, over a closed cycle;
 * the branch of every move step chosen over the whole sequence by dynamic programming over a
 * layered graph. Pure: no I/O, SI units (s, rad or m, rad/s or m/s, rad/s² or m/s²).
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet, Sequence } from "@/shared/schemas/requirements";
import type { ArmAnalysis } from "./shortlist";
import { fixed } from "@/shared/format";

/**
 * Time a joint without an acceleration limit is assumed to take to reach full speed (s): an
 * assumed value, no source (docs/design.md#cycle-time). Results resting on it are estimates.
 */
export const ASSUMED_ACCELERATION_TIME = 0.5;

/** Joint limits the model uses: NaN (or ≤ 0) where the arm states none. */
interface CycleLimits {
  n: number;
  maxSpeed: ArrayLike<number>;
  maxAcceleration: ArrayLike<number>;
}

/** Speed and acceleration per joint with the assumed values filled in. */
interface EffectiveLimits {
  n: number;
  speed: Float64Array;
  acceleration: Float64Array;
  /** 1-based joints whose acceleration was assumed. */
  assumedAcceleration: number[];
  /** 1-based joints with no speed limit (the cycle is then unknown). */
  missingSpeed: number[];
}

export function effectiveLimits(limits: CycleLimits): EffectiveLimits {
  const { n } = limits;
  const speed = new Float64Array(n), acceleration = new Float64Array(n);
  const assumedAcceleration: number[] = [], missingSpeed: number[] = [];
  for (let j = 0; j < n; j++) {
    const v = limits.maxSpeed[j], a = limits.maxAcceleration[j];
    speed[j] = v > 0 ? v : NaN;
    if (!(v > 0)) missingSpeed.push(j + 1);
    if (a > 0) acceleration[j] = a;
    else {
      acceleration[j] = v > 0 ? v / ASSUMED_ACCELERATION_TIME : NaN;
      assumedAcceleration.push(j + 1);
    }
  }
  return { n, speed, acceleration, assumedAcceleration, missingSpeed };
}

/**
 * Rest-to-rest time of one joint moving d ≥ 0 with speed limit v and acceleration limit a:
 * d/v + v/a when d ≥ v²/a (trapezoidal), else 2·√(d/a) (triangular)
 * (docs/references.md#biagiotti-and-melchiorri-trajectory-planning).
 */
export function jointMoveTime(d: number, v: number, a: number): number {
  if (d <= 0) return 0;
  return d >= (v * v) / a ? d / v + v / a : 2 * Math.sqrt(d / a);
}

/** Out-parameter of {@link moveTime}: the 1-based limiting joint (null when nothing moves). */
interface MoveOut {
  limitingJoint: number | null;
}

/**
 * Time of the synchronised move qa → qb (all joints end together): maxⱼ tⱼ. Allocation-free;
 * writes the joint with the largest tⱼ (the lowest on a tie) into `out` when given.
 */
export function moveTime(lim: EffectiveLimits, qa: ArrayLike<number>, qb: ArrayLike<number>, out?: MoveOut): number {
  let best = 0, joint: number | null = null;
  for (let j = 0; j < lim.n; j++) {
    const t = jointMoveTime(Math.abs(qb[j] - qa[j]), lim.speed[j], lim.acceleration[j]);
    if (t > best) { best = t; joint = j + 1; }
  }
  if (out) out.limitingJoint = joint;
  return best;
}

/** A path as the model needs it: its end configurations and the time to follow it. */
export interface CyclePath {
  /** Joint values at the first and last samples, or null when the path is not followed. */
  first: number[] | null;
  last: number[] | null;
  /** Path length (m). */
  length: number;
  /** Speed it is followed at (m/s): required × achievable fraction (≤ 1); null when unknown. */
  followedSpeed: number | null;
  /** 1-based joint limiting the path speed when it is slowed below the required speed, else null. */
  limitingJoint: number | null;
}

/** A move or path step as the cell sees it: its kind and its target's or path's name. */
export interface StepRef {
  kind: "move" | "path";
  name: string;
}

/** The outcome of checking one move in the cell (cycle-cell.ts). */
export interface MoveCheck {
  /** No collision along the move (proven by the motion bound, or found by evaluation). */
  free: boolean;
  /** Smallest distance along the move over the counted pairs (m): exact where evaluated, else the proven bound; 0 when blocked; null when nothing is counted. */
  clearance: number | null;
  /** The pair at that distance. */
  closest: { a: string; b: string } | null;
  /** When blocked: what hits what, and where along the move (0…1). */
  hit: { a: string; b: string; fraction: number } | null;
  /** Configurations evaluated. */
  evaluations: number;
}

/** Checks the joint-space move qa → qb from one step's configuration to the next one's. */
export interface MoveChecker {
  /** The cell's required clearance (m): reported along the moves, it does not block them. */
  required: number;
  check(qa: readonly number[], qb: readonly number[], from: StepRef, to: StepRef): MoveCheck;
}

/** What the sequence refers to: the reached branches of each target and the paths. */
export interface CycleInputs {
  /** Reached collision-free branches (IK solutions) of each target by name; empty when not reached. */
  targets: ReadonlyMap<string, readonly (readonly number[])[]>;
  paths: ReadonlyMap<string, CyclePath>;
  /** The cell along the moves; absent when nothing is checked (every move is then taken as free). */
  moves?: MoveChecker;
}

interface CycleStep {
  kind: "move" | "path" | "wait";
  /** The target's or the path's name; "wait" for a wait. */
  name: string;
  /** Configuration at the end of the step (rad or m). */
  q: number[];
  /** Time of the step (s). */
  time: number;
  /** 1-based joint the step's time rests on, or null (waits, no motion, a path at full speed). */
  limitingJoint: number | null;
  /** Index into the target's branches used (move steps), else null. */
  branch: number | null;
  /** Smallest distance along the step's move in the cell (m; the proven bound where not evaluated); null without the cell, for waits and when nothing moves. */
  clearance: number | null;
}

export interface CycleResult {
  name: string;
  /** Cycle time (s), null when unknown. */
  time: number | null;
  /** Parts per hour, 3600 / time; null when unknown. */
  partsPerHour: number | null;
  required: number | null;
  verdict: "meets" | "fails" | "unknown";
  /** True when the time rests on an assumed acceleration of a joint. */
  estimate: boolean;
  /** 1-based joints whose acceleration was assumed. */
  assumedAcceleration: number[];
  reason: string;
  /** The steps (empty when unknown). */
  steps: CycleStep[];
  /**
   * Set when every combination of branches has a move blocked by a collision: the step (1-based)
   * by which every combination is blocked at the latest, its kind and target or path, and what
   * hits what on a blocked move into it. The time is then unknown and the verdict `fails`.
   */
  blocked: { step: number; kind: "move" | "path"; name: string; a: string; b: string } | null;
  /** Moves between branches checked in the cell, and how many of them collide (left out of the choice). */
  movesChecked: number;
  movesBlocked: number;
}

/** A layer of the graph: one node per option, each with its entry and exit configuration and a fixed time. */
interface Layer {
  step: number;
  ref: StepRef;
  entry: (readonly number[])[];
  exit: (readonly number[])[];
  fixed: number[];
}

const fmtS = (t: number) => `${fixed(t, 2)} s`;

/**
 * Evaluates a sequence for the given branch of each layer (one index per move or path step, in
 * order; paths have the one option 0). Used to build the returned steps and by tests as the
 * brute-force reference.
 */
export function evaluateChoice(lim: EffectiveLimits, seq: Sequence, inputs: CycleInputs, choice: readonly number[], clearanceOf?: (k: number, from: number, to: number) => number | null): CycleStep[] {
  const layers = buildLayers(seq, inputs);
  if (!layers) throw new RangeError(`sequence "${seq.name}" has a target not reached or a path not followed`);
  if (choice.length !== layers.length) throw new RangeError(`expected ${layers.length} branch choices, got ${choice.length}`);
  let current: readonly number[] = layers.length ? layers[layers.length - 1].exit[choice[layers.length - 1]] : [];
  const steps: CycleStep[] = [];
  const out: MoveOut = { limitingJoint: null };
  let k = 0;
  for (const st of seq.steps) {
    if (st.kind === "wait") {
      steps.push({ kind: "wait", name: "wait", q: [...current], time: st.seconds, limitingJoint: null, branch: null, clearance: null });
      continue;
    }
    const layer = layers[k], o = choice[k];
    const clearance = clearanceOf ? clearanceOf(k, choice[(k + layers.length - 1) % layers.length], o) : null;
    k++;
    const approach = moveTime(lim, current, layer.entry[o], out);
    if (st.kind === "move") {
      steps.push({ kind: "move", name: st.target, q: [...layer.exit[o]], time: approach + (st.dwell ?? 0), limitingJoint: out.limitingJoint, branch: o, clearance });
    } else {
      const p = inputs.paths.get(st.path)!;
      const follow = layer.fixed[o];
      const limiting = follow > approach && p.limitingJoint !== null ? p.limitingJoint : out.limitingJoint;
      steps.push({ kind: "path", name: st.path, q: [...layer.exit[o]], time: approach + follow, limitingJoint: limiting, branch: null, clearance });
    }
    current = layer.exit[o];
  }
  return steps;
}

/** The layers of the sequence, or null when a target has no branch or a path is not followed. */
function buildLayers(seq: Sequence, inputs: CycleInputs): Layer[] | null {
  const layers: Layer[] = [];
  for (let i = 0; i < seq.steps.length; i++) {
    const st = seq.steps[i];
    if (st.kind === "move") {
      const b = inputs.targets.get(st.target);
      if (!b || b.length === 0) return null;
      layers.push({ step: i, ref: { kind: "move", name: st.target }, entry: [...b], exit: [...b], fixed: b.map(() => st.dwell ?? 0) });
    } else if (st.kind === "path") {
      const p = inputs.paths.get(st.path);
      if (!p || !p.first || !p.last || p.followedSpeed === null || !(p.followedSpeed > 0)) return null;
      layers.push({ step: i, ref: { kind: "path", name: st.path }, entry: [p.first], exit: [p.last], fixed: [p.length / p.followedSpeed] });
    }
  }
  return layers;
}

/**
 * What is known of each edge of the graph: edges[k] holds the moves into layer k, from layer k−1
 * (layer m−1 for k = 0, which closes the cycle), at index p · |layer k| + o; 0 not checked, 1 free,
 * 2 blocked by a collision (left out of the choice).
 */
type EdgeStates = Uint8Array[];
const EDGE_FREE = 1, EDGE_BLOCKED = 2;

/**
 * The branch choice minimising the closed cycle: for each option s of the last layer (where the
 * cycle starts), a shortest path through layers 0 … m−1 ending at s, by dynamic programming,
 * leaving out the edges known to be blocked. Ties go to the lowest indices. Returns the choice and
 * its motion time (waits excluded); time Infinity when every combination is blocked.
 */
function bestChoice(lim: EffectiveLimits, layers: readonly Layer[], edges: EdgeStates): { choice: number[]; time: number } {
  const m = layers.length;
  if (m === 0) return { choice: [], time: 0 };
  const last = layers[m - 1];
  let bestTime = Infinity, bestChoiceList: number[] = [];
  for (let s = 0; s < last.exit.length; s++) {
    if (m === 1) {
      if (edges[0][s * last.entry.length + s] === EDGE_BLOCKED) continue;
      const t = moveTime(lim, last.exit[s], last.entry[s]) + last.fixed[s];
      if (t < bestTime) { bestTime = t; bestChoiceList = [s]; }
      continue;
    }
    // dist[k][o]: least time from the start (last layer's option s) through layer k ending at option o.
    const dist: Float64Array[] = [], from: Int32Array[] = [];
    const l0 = layers[0], e0 = edges[0];
    dist.push(Float64Array.from(l0.entry, (e, o) => (e0[s * l0.entry.length + o] === EDGE_BLOCKED ? Infinity : moveTime(lim, last.exit[s], e) + l0.fixed[o])));
    from.push(new Int32Array(l0.entry.length).fill(-1));
    for (let k = 1; k < m; k++) {
      const L = layers[k], P = layers[k - 1], ek = edges[k], width = L.entry.length;
      const d = new Float64Array(width).fill(Infinity), f = new Int32Array(width).fill(-1);
      for (let o = k === m - 1 ? s : 0; o < (k === m - 1 ? s + 1 : width); o++) {
        for (let p = 0; p < P.exit.length; p++) {
          if (!(dist[k - 1][p] < Infinity) || ek[p * width + o] === EDGE_BLOCKED) continue;
          const t = dist[k - 1][p] + moveTime(lim, P.exit[p], L.entry[o]) + L.fixed[o];
          if (t < d[o]) { d[o] = t; f[o] = p; }
        }
      }
      dist.push(d); from.push(f);
    }
    const t = dist[m - 1][s];
    if (t < bestTime) {
      bestTime = t;
      const choice = new Array<number>(m);
      choice[m - 1] = s;
      for (let k = m - 1; k > 0; k--) choice[k - 1] = from[k][choice[k]];
      bestChoiceList = choice;
    }
  }
  return { choice: bestChoiceList, time: bestTime };
}

/**
 * The layer no combination gets past when every combination is blocked, counting the moves not
 * checked as free: for each start s, the first layer whose options are all cut off by blocked
 * moves; the latest such layer over the starts. (With every move checked none would get further.)
 */
function deadLayer(layers: readonly Layer[], edges: EdgeStates): number {
  const m = layers.length, last = layers[m - 1];
  const open = (k: number, idx: number) => edges[k][idx] !== EDGE_BLOCKED;
  let furthest = 0;
  for (let s = 0; s < last.exit.length; s++) {
    let reach = layers[0].entry.map((_, o) => (m === 1 ? o === s : true) && open(0, s * layers[0].entry.length + o));
    let k = 0;
    while (reach.some(Boolean) && k < m - 1) {
      const L = layers[k + 1], width = L.entry.length, prevReach = reach;
      reach = L.entry.map((_, o) => (k + 1 === m - 1 ? o === s : true) && prevReach.some((r, p) => r && open(k + 1, p * width + o)));
      k++;
    }
    if (!reach.some(Boolean)) furthest = Math.max(furthest, k);
  }
  return furthest;
}

const sameConfiguration = (a: readonly number[], b: readonly number[]) => a.every((x, j) => x === b[j]);

/** The result for a sequence whose cycle cannot be estimated, with the reason. */
export function unknownCycle(seq: Sequence, reason: string): CycleResult {
  return { name: seq.name, time: null, partsPerHour: null, required: seq.required ?? null, verdict: "unknown", estimate: false, assumedAcceleration: [], reason, steps: [], blocked: null, movesChecked: 0, movesBlocked: 0 };
}

const mmText = (m: number) => `${fixed(m * 1000, 1)} mm`;
/** A move's clearance counts as below the required one only by more than the motion check's tolerance (m, cell.ts). */
const CLEARANCE_TOLERANCE = 1e-4;

/**
 * Cycle time of one sequence for one arm (docs/design.md#cycle-time). With a move checker, the
 * moves of the best choice are checked in the cell; a blocked one is left out and the choice made
 * again, until every move of the choice is free (the least cycle over the free moves: a blocked
 * edge is only ever removed, so the choice found is optimal over the moves that are free) or
 * none is left.
 */
export function analyzeCycle(limits: CycleLimits, seq: Sequence, inputs: CycleInputs): CycleResult {
  const lim = effectiveLimits(limits);
  const required = seq.required ?? null;
  const base = { name: seq.name, required, assumedAcceleration: lim.assumedAcceleration, blocked: null, movesChecked: 0, movesBlocked: 0 };
  const unknown = (reason: string): CycleResult => ({ ...base, time: null, partsPerHour: null, verdict: "unknown", estimate: false, reason, steps: [] });
  const moves = seq.steps.some((s) => s.kind !== "wait");
  if (moves && lim.missingSpeed.length) return unknown(`joint${lim.missingSpeed.length > 1 ? "s" : ""} ${lim.missingSpeed.join(", ")} without a speed limit: the cycle time is unknown`);
  for (const st of seq.steps) {
    if (st.kind === "move" && !(inputs.targets.get(st.target)?.length)) return unknown(`target "${st.target}" is not reached: the cycle time is unknown`);
    if (st.kind === "path") {
      const p = inputs.paths.get(st.path);
      if (!p || !p.first || !p.last) return unknown(`path "${st.path}" is not followed: the cycle time is unknown`);
      if (p.followedSpeed === null || !(p.followedSpeed > 0)) return unknown(`the speed path "${st.path}" is followed at is unknown, so is the cycle time`);
    }
  }
  const layers = buildLayers(seq, inputs)!;
  const m = layers.length;
  const prevOf = (k: number) => layers[(k + m - 1) % m];
  const edges: EdgeStates = layers.map((L, k) => new Uint8Array(prevOf(k).exit.length * L.entry.length));
  const found = new Map<number, MoveCheck>();
  let movesChecked = 0, movesBlocked = 0;
  const key = (k: number, p: number, o: number) => (k * 4096 + p) * 4096 + o;
  /** Checks the move p → o into layer k once; true when free. */
  const verify = (k: number, p: number, o: number): boolean => {
    const L = layers[k], P = prevOf(k), idx = p * L.entry.length + o;
    if (edges[k][idx]) return edges[k][idx] === EDGE_FREE;
    const qa = P.exit[p], qb = L.entry[o];
    if (!inputs.moves || sameConfiguration(qa, qb)) { edges[k][idx] = EDGE_FREE; return true; }
    const r = inputs.moves.check(qa, qb, P.ref, L.ref);
    found.set(key(k, p, o), r);
    movesChecked++;
    if (!r.free) movesBlocked++;
    edges[k][idx] = r.free ? EDGE_FREE : EDGE_BLOCKED;
    return r.free;
  };
  let choice: number[] | null = null;
  for (;;) {
    const best = bestChoice(lim, layers, edges);
    if (!(best.time < Infinity)) break;
    // check the choice's moves in order and make the choice again at the first blocked one (checks cost
    // far more than the dynamic programme)
    let free = true;
    for (let k = 0; k < m && free; k++) free = verify(k, best.choice[(k + m - 1) % m], best.choice[k]);
    if (free) { choice = best.choice; break; }
  }
  const estimate = moves && lim.assumedAcceleration.length > 0;
  const tally = { movesChecked, movesBlocked };
  if (choice === null) {
    // Every combination has a blocked move. Counting the moves not checked as free, no combination gets
    // past layer k: with them checked, none would get further. Named with a blocked move into it.
    const k = deadLayer(layers, edges);
    const L = layers[k];
    let hit: MoveCheck["hit"] = null;
    for (let p = 0; p < prevOf(k).exit.length && !hit; p++) for (let o = 0; o < L.entry.length && !hit; o++) hit = found.get(key(k, p, o))?.hit ?? null;
    const what = L.ref.kind === "move" ? `the move to target "${L.ref.name}"` : `the move to the start of path "${L.ref.name}"`;
    return {
      ...base, movesChecked, movesBlocked, time: null, partsPerHour: null, verdict: "fails", estimate, steps: [],
      blocked: { step: L.step + 1, kind: L.ref.kind, name: L.ref.name, a: hit?.a ?? "", b: hit?.b ?? "" },
      reason: `no collision-free combination of branches: every combination has a move that collides, at ${what} (step ${L.step + 1}) at the latest` +
        (hit ? ` (${hit.a} hits ${hit.b})` : "") + `; ${movesBlocked} of ${movesChecked} moves checked collide`,
    };
  }
  const steps = evaluateChoice(lim, seq, inputs, choice, (k, p, o) => found.get(key(k, p, o))?.clearance ?? null);
  let time = 0;
  for (const s of steps) time += s.time;
  const verdict = required === null ? "unknown" : time <= required ? "meets" : "fails";
  let reason = required === null ? `cycle ${fmtS(time)}, no required time` : `cycle ${fmtS(time)} ${time <= required ? "within" : "over"} the required ${fmtS(required)}`;
  if (estimate) reason += `; an estimate: joint${lim.assumedAcceleration.length > 1 ? "s" : ""} ${lim.assumedAcceleration.join(", ")} without an acceleration limit, assumed to reach full speed in ${ASSUMED_ACCELERATION_TIME} s`;
  if (inputs.moves) {
    reason += movesBlocked ? `; ${movesBlocked} of ${movesChecked} moves checked in the cell collide and were left out` : `; moves checked in the cell: none collides`;
    let low: { clearance: number; step: number } | null = null;
    steps.forEach((s, i) => { if (s.clearance !== null && (low === null || s.clearance < low.clearance)) low = { clearance: s.clearance, step: i + 1 }; });
    const lowest = low as { clearance: number; step: number } | null;
    if (lowest && lowest.clearance < inputs.moves.required - CLEARANCE_TOLERANCE) reason += `; clearance along the move of step ${lowest.step} drops to ${mmText(lowest.clearance)}, below the required ${mmText(inputs.moves.required)}`;
  }
  return { ...base, ...tally, time, partsPerHour: time > 0 ? 3600 / time : null, verdict, estimate, reason, steps };
}

/** The joint limits of an arm document, NaN where absent. */
function cycleLimitsOf(arm: Pick<ArmDocument, "joints">): CycleLimits {
  return {
    n: arm.joints.length,
    maxSpeed: arm.joints.map((j) => j.maxSpeed ?? NaN),
    maxAcceleration: arm.joints.map((j) => j.maxAcceleration ?? NaN),
  };
}

/**
 * The model's inputs from an arm's analysis: every reached branch of each target that does not
 * collide in the cell, and each path fully reached without a collision, with its end samples and
 * the speed it is followed at (required × achievable fraction).
 */
function cycleInputsOf(analysis: Pick<ArmAnalysis, "targets" | "paths">, req: Pick<RequirementSet, "targets" | "paths">, moves: MoveChecker | null): CycleInputs {
  const targets = new Map<string, number[][]>();
  req.targets.forEach((t, i) => {
    const a = analysis.targets[i];
    targets.set(t.name, a && a.reached ? a.solutions.filter((s) => s.collisionFree !== false).map((s) => s.q) : []);
  });
  const paths = new Map<string, CyclePath>();
  req.paths.forEach((p, i) => {
    const a = analysis.paths[i];
    const all = a !== undefined && a.samples > 0 && a.reached === a.samples && a.cell?.collisionFree !== false;
    const f = a?.speed.achievableFraction ?? null;
    paths.set(p.name, {
      first: all ? a.q[0] : null,
      last: all ? a.q[a.q.length - 1] : null,
      length: a?.length ?? 0,
      followedSpeed: f === null ? null : a.speed.required * Math.min(1, f),
      limitingJoint: f !== null && f < 1 ? a.speed.limitingJoint : null,
    });
  });
  return moves ? { targets, paths, moves } : { targets, paths };
}

/**
 * Every sequence of the requirement set for one analysed arm, in order; `moves` checks the moves
 * in the cell (cycle-cell.ts; null when nothing is checked).
 */
export function analyzeCycles(arm: Pick<ArmDocument, "joints">, analysis: Pick<ArmAnalysis, "targets" | "paths">, req: Pick<RequirementSet, "targets" | "paths" | "sequences">, moves: MoveChecker | null = null): CycleResult[] {
  const sequences = req.sequences ?? [];
  if (sequences.length === 0) return [];
  const limits = cycleLimitsOf(arm);
  const inputs = cycleInputsOf(analysis, req, moves);
  return sequences.map((s) => analyzeCycle(limits, s, inputs));
}
