/**
 * The cell as the analysis sees it: the arm's bodies (base, link 1 … link n, tool, payload) with
 * their collision shapes, the obstacles, the pairs that are checked, and the checks themselves:
 * at one configuration, and over the motion between two configurations. Model/data split: the
 * {@link CellModel} is built once per (arm, requirement set) and never changed; a
 * {@link CellData} holds every buffer the checks write, so a check allocates nothing.
 *
 * ## Frames (all placed in the cell frame, the model's world)
 * - base: the requirement set's `base` pose (before the arm file's own `base` transform);
 * - link k: the kinematic frame after joint k (data.frames[k]); derived capsules may join a point
 *   of frame k−1 to a point of frame k (lib/geometry/arm.ts);
 * - tool: the arm's tool point, flange · arm `tool` (the frame of `tool.cog`);
 * - payload: the TCP, flange · arm `tool` · `tool.tcp` (the frame of `payload.cog`).
 *
 * ## Pairs checked
 * Every body with shapes against every obstacle (less a target's or path's `contact` list for the
 * tool and the payload); links two or more apart, the base counting as link 0; the tool and the
 * payload against the base … link n−1; less the arm's `ignoredPairs` and less the pairs of links
 * that touch in every configuration ({@link alwaysTouchingPairs}, and the derived-geometry rule
 * for the tool and the payload against derived links).
 *
 * ## The clearance
 * The clearance of a configuration is the smallest distance over the checked pairs, except the
 * base against the obstacles: that pair does not depend on the configuration (an arm stands on
 * its bench), so it counts for collisions but not for the clearance.
 *
 * ## Motion between configurations
 * Between two configurations the joints are taken to move along the straight line in joint
 * space. During that motion no point of body b moves farther than
 * M_b = Σ_j R_{j,b}·|Δq_j| (revolute joints) + Σ_j |Δq_j| (prismatic joints), where R_{j,b} bounds
 * the distance of b's points from joint j's axis over all configurations. A pair whose distances
 * d₀, d₁ at the two ends satisfy (d₀ + d₁ − M)/2 ≥ c keeps a distance of at least c all along
 * (the distance changes no faster than the points move), with M = M_a + M_b for a body against an
 * obstacle and, for two bodies of the arm, the bound of their relative motion: only the joints
 * between them count, since the joints before both move them together and keep their distance.
 * Otherwise the motion is halved and both halves checked, to a tolerance of 0.1 mm. This is the conservative-advancement idea of Mirtich ("Impulse-based dynamic
 * simulation of rigid body systems", PhD thesis, Berkeley 1996) with the per-joint motion bound of
 * Schwarzer, Saha and Latombe ("Adaptive dynamic collision checking for single and multiple
 * articulated robots in complex environments", IEEE T-RO 21(3), 2005); both from memory. It
 * cannot step over a thin obstacle between samples.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { BodyShape, Obstacle } from "@/shared/schemas/cell";
import type { RequirementSet } from "@/shared/schemas/requirements";
import { forwardKinematics, mat4MulRigid, type ArmData, type ArmModel } from "@/lib/kinematics";
import { createDistanceResult, type DistanceResult, type Shape } from "@/lib/geometry";
import { distancePacked as distancePackedImport } from "@/lib/geometry/distance";
import { packShape, placeShape as placeShapeImport, updateBound as updateBoundImport } from "@/lib/geometry/packed";
import { alwaysTouchingPairs, linkGeometry, type LinkGeometry } from "@/lib/geometry/arm";
import { IDENTITY_4, invertRigid, mul4 } from "./geometry";

// Packed-layout constants (lib/geometry/packed.ts) and the hot functions as local bindings, so the
// hot loops read literals and call functions directly (an imported binding is a property load, or
// a getter through a re-export, on every use).
const STRIDE = 24;
const distancePacked = distancePackedImport;
const placeShape = placeShapeImport;
const updateBound = updateBoundImport;
const O_RADIUS = 1;
const O_A = 2;
const O_B = 5;
const O_BC = 20;
const O_BR = 23;
const O_R = 8;
const O_H = 17;
const KIND_CAPSULE = 1;
const KIND_BOX = 2;

/**
 * Tolerance of the motion check (m): a stretch of motion counts as keeping the threshold when its
 * bound is within this of it, and halving stops when the bodies move less than this.
 */
const MOTION_TOLERANCE = 1e-4;
/** Most configurations evaluated between two samples before the motion check settles for its bound. */
const MOTION_MAX_EVALUATIONS = 64;

/** A pair of bodies that is checked. */
interface CellPair {
  /** Arm body index (0 base, 1 … n links, n+1 tool, n+2 payload). */
  a: number;
  /** Arm body index, or −1 − k for obstacle k. */
  b: number;
  /** Shape indices into the arm shapes (A) and the arm shapes or obstacles (B), one entry per shape pair. */
  shapesA: Int32Array;
  shapesB: Int32Array;
  /** The pair is the tool or the payload against an obstacle (a `contact` list can lift it). */
  contactable: boolean;
  /** Does not depend on the configuration (the base against an obstacle): not counted in the clearance. */
  fixed: boolean;
}

/** A pair that is not checked, and why. */
interface SkippedPair {
  a: string;
  b: string;
  why: "ignored" | "always touching";
}

/** The cell, built once per arm and requirement set (read-only after {@link createCellModel}). */
export interface CellModel {
  readonly n: number;
  /** Body names: "base", "link 1" … "link n", "tool", "payload". */
  readonly bodyNames: readonly string[];
  readonly obstacleNames: readonly string[];
  /** Required clearance (m). */
  readonly clearance: number;
  /** Arm shapes: body, and either a rigid local shape in one frame or a capsule spanning two frames. */
  readonly shapeBody: Int32Array;
  /** Frame of a rigid shape: 0 … n link frames, n+1 tool point, n+2 TCP, −1 the base (fixed); −2 a spanning capsule. */
  readonly shapeFrame: Int32Array;
  /** Local packed shapes (STRIDE each). */
  readonly shapeLocal: Float64Array;
  /** Spanning capsules: frames (2 per shape) and points (6 per shape), radius in shapeLocal. */
  readonly spanFrames: Int32Array;
  readonly spanPoints: Float64Array;
  /** Obstacles, packed in the cell frame. */
  readonly obstacles: Float64Array;
  readonly pairs: readonly CellPair[];
  /**
   * The pairs flattened for the hot loops: pair p's shape pairs are spA/spB[pairStart[p] …
   * pairStart[p+1]), against an obstacle when pairObstacle[p] ≥ 0 (its index), fixed (the base
   * against an obstacle) when pairFixed[p] = 1, liftable by a contact list when pairContact[p] = 1.
   */
  readonly pairStart: Int32Array;
  readonly spA: Int32Array;
  readonly spB: Int32Array;
  readonly pairObstacle: Int32Array;
  readonly pairFixed: Uint8Array;
  readonly pairContact: Uint8Array;
  readonly skipped: readonly SkippedPair[];
  /** Bodies without collision geometry (their pairs are not checked). */
  readonly unmodelled: readonly string[];
  /** True when anything is checked at all. */
  readonly active: boolean;
  /** R_{j,b}: the motion bound factors, (n+3) × n, row b (m per rad for revolute, 1 for prismatic, 0 when j does not move b). */
  readonly motion: Float64Array;
  /** The arm's tool transform (flange → tool point), row-major. */
  readonly armTool: Float64Array;
  /** Link collision geometry as derived or entered (for showing). */
  readonly links: readonly LinkGeometry[];
}

/** Buffers of the checks for one cell model. */
export interface CellData {
  readonly model: CellModel;
  /** Arm shapes in the cell frame at the last configuration checked. */
  readonly world: Float64Array;
  /** Tool-point pose at the last configuration. */
  readonly toolPoint: Float64Array;
  readonly result: DistanceResult;
  /** Per pair: the smallest distance found (exact) or a lower bound (when not needed exactly); m. */
  readonly pairDistance: Float64Array;
  /** Per pair: 1 when pairDistance is exact. */
  readonly pairExact: Uint8Array;
  /** Per pair: the penetration depth when the pair overlaps (m), else 0. */
  readonly pairDepth: Float64Array;
  /** Per pair: the closest points (6 numbers) when exact. */
  readonly pairPoints: Float64Array;
  /** Per arm body: the motion bound of the last motion check (m). */
  readonly bodyMotion: Float64Array;
  /** Motion-check scratch: the per-pair distances at the two ends. */
  readonly d0: Float64Array;
  readonly d1: Float64Array;
  readonly qa: Float64Array;
  readonly qb: Float64Array;
  readonly qm: Float64Array;
}

/** The outcome of a check at one configuration (written into a reused object). */
export interface CellCheck {
  /** No checked pair is at distance 0. */
  collisionFree: boolean;
  /** Smallest distance over the pairs counted in the clearance (m; 0 when colliding; Infinity when none). */
  clearance: number;
  /** Index of that pair, or −1. */
  clearancePair: number;
  /** The overlapping pair with the largest depth, or −1, and that depth (m). */
  collisionPair: number;
  collisionDepth: number;
}

export function createCellCheck(): CellCheck {
  return { collisionFree: true, clearance: Infinity, clearancePair: -1, collisionPair: -1, collisionDepth: 0 };
}

type AnyJoint = ArmDocument["joints"][number];

/** Largest distance between consecutive frame origins O₍k−1₎ and O_k over the joint's travel (m), k = 1 … n. */
function linkOffsets(arm: ArmDocument): number[] {
  return arm.joints.map((j0) => {
    const j = j0 as AnyJoint;
    const travel = j.type === "prismatic" ? Math.max(Math.abs(j.min), Math.abs(j.max)) : 0;
    if ("origin" in j) return Math.hypot(j.origin.xyz[0], j.origin.xyz[1], j.origin.xyz[2]) + travel;
    const r = j as Extract<AnyJoint, { a: number }>;
    const dmax = r.type === "prismatic" ? Math.max(Math.abs(r.d + r.min), Math.abs(r.d + r.max)) : Math.abs(r.d);
    return Math.hypot(r.a, dmax);
  });
}

/** Largest distance of the packed shape's points from the origin of its frame (m). */
function extentFromOrigin(buf: Float64Array, o: number): number {
  const c = Math.hypot(buf[o + O_BC], buf[o + O_BC + 1], buf[o + O_BC + 2]);
  return c + buf[o + O_BR];
}

const asShape = (s: BodyShape | Obstacle): Shape => s as Shape;

/**
 * Builds the cell for `arm` placed by `req`. `model` is the analysis model (its world is the cell
 * frame). Throws RangeError on an arm whose kinematic description is invalid.
 */
export function createCellModel(arm: ArmDocument, req: RequirementSet, model: ArmModel): CellModel {
  const n = arm.joints.length;
  const bodyNames = ["base", ...arm.joints.map((_, i) => `link ${i + 1}`), "tool", "payload"];
  const TOOL = n + 1, PAYLOAD = n + 2;
  const links = linkGeometry(arm);
  const armTool = Float64Array.from(arm.tool ?? IDENTITY_4);
  const tcp = req.tool.tcp;

  // ---- arm shapes
  const bodyOf: number[] = [], frameOf: number[] = [];
  const local: Float64Array[] = [];
  const spans: { frames: [number, number]; points: number[] }[] = [];
  const addRigid = (body: number, frame: number, shape: Shape) => {
    const buf = new Float64Array(STRIDE);
    packShape(shape, buf, 0);
    bodyOf.push(body); frameOf.push(frame); local.push(buf); spans.push({ frames: [0, 0], points: [0, 0, 0, 0, 0, 0] });
  };
  for (const c of arm.baseCollision ?? []) addRigid(0, -1, { shape: "capsule", from: c.from, to: c.to, radius: c.radius });
  for (const g of links) {
    for (const c of g.attached) {
      if (c.from.frame === c.to.frame) addRigid(g.link, c.from.frame, { shape: "capsule", from: c.from.point, to: c.to.point, radius: c.radius });
      else {
        const buf = new Float64Array(STRIDE);
        packShape({ shape: "capsule", from: [0, 0, 0], to: [0, 0, 0], radius: c.radius }, buf, 0);
        bodyOf.push(g.link); frameOf.push(-2); local.push(buf);
        spans.push({ frames: [c.from.frame, c.to.frame], points: [...c.from.point, ...c.to.point] });
      }
    }
  }
  for (const s of req.tool.collision ?? []) addRigid(TOOL, n + 1, asShape(s));
  for (const s of req.payload.collision ?? []) addRigid(PAYLOAD, n + 2, asShape(s));
  const count = bodyOf.length;
  const shapeLocal = new Float64Array(STRIDE * count);
  local.forEach((b, i) => shapeLocal.set(b, STRIDE * i));
  const spanFrames = new Int32Array(2 * count), spanPoints = new Float64Array(6 * count);
  spans.forEach((s, i) => { spanFrames[2 * i] = s.frames[0]; spanFrames[2 * i + 1] = s.frames[1]; spanPoints.set(s.points, 6 * i); });

  // ---- obstacles in the cell frame
  const obs = req.cell.obstacles;
  const obstacles = new Float64Array(STRIDE * obs.length);
  obs.forEach((o, k) => packShape(asShape(o), obstacles, STRIDE * k));

  // ---- pairs
  const shapesOfBody = (b: number) => bodyOf.map((x, i) => (x === b ? i : -1)).filter((i) => i >= 0);
  const hasShapes = bodyNames.map((_, b) => shapesOfBody(b).length > 0);
  const ignored = new Set((arm.ignoredPairs ?? []).map(([a, b]) => `${Math.min(a, b)}-${Math.max(a, b)}`));
  const touching = new Set(alwaysTouchingPairs(links, arm).map(([a, b]) => `${a}-${b}`));
  // the tool and the payload against derived links they cannot leave (same rule as alwaysTouchingPairs)
  const offsets = links.map((g) => g.length);
  const toolPointInTcp = mul4(invertRigid(tcp), IDENTITY_4);
  const gapFromPoint = (shapes: number[], pointFrameToShapeFrame: Float64Array | null): number => {
    let best = Infinity;
    const probe = new Float64Array(STRIDE), res = createDistanceResult();
    const p = pointFrameToShapeFrame ? [pointFrameToShapeFrame[3], pointFrameToShapeFrame[7], pointFrameToShapeFrame[11]] : [0, 0, 0];
    packShape({ shape: "sphere", center: p, radius: 0 }, probe, 0);
    for (const i of shapes) best = Math.min(best, distancePacked(probe, 0, shapeLocal, STRIDE * i, res));
    return best;
  };
  const reachGap = { [TOOL]: gapFromPoint(shapesOfBody(TOOL), null), [PAYLOAD]: gapFromPoint(shapesOfBody(PAYLOAD), toolPointInTcp) } as Record<number, number>;
  const pairs: CellPair[] = [];
  const skipped: SkippedPair[] = [];
  const mk = (a: number, b: number, shapesB: number[], contactable: boolean, fixed: boolean) => {
    const sa = shapesOfBody(a);
    const A = new Int32Array(sa.length * shapesB.length), B = new Int32Array(sa.length * shapesB.length);
    let k = 0;
    for (const i of sa) for (const j of shapesB) { A[k] = i; B[k] = j; k++; }
    pairs.push({ a, b, shapesA: A, shapesB: B, contactable, fixed });
  };
  for (let a = 0; a <= PAYLOAD; a++) {
    if (!hasShapes[a]) continue;
    for (let b = a + 1; b <= PAYLOAD; b++) {
      if (!hasShapes[b]) continue;
      const armPair = b <= n;
      if (armPair && b - a < 2) continue;
      if (!armPair && (a > n - 1)) continue; // tool/payload: only against base … link n−1; never with each other
      const key = `${a}-${b}`;
      if (armPair && ignored.has(key)) { skipped.push({ a: bodyNames[a], b: bodyNames[b], why: "ignored" }); continue; }
      if (armPair && touching.has(key)) { skipped.push({ a: bodyNames[a], b: bodyNames[b], why: "always touching" }); continue; }
      if (!armPair && a >= 1 && links[a - 1].source === "derived") {
        let between = 0;
        for (let k = a; k < n; k++) between += offsets[k];
        if (between + reachGap[b] < links[a - 1].radius!) { skipped.push({ a: bodyNames[a], b: bodyNames[b], why: "always touching" }); continue; }
      }
      mk(a, b, shapesOfBody(b), false, false);
    }
    for (let k = 0; k < obs.length; k++) mk(a, -1 - k, [k], a === TOOL || a === PAYLOAD, a === 0);
  }
  const unmodelled = bodyNames.filter((_, b) => !hasShapes[b] && b >= 1 && b <= n);

  // ---- motion bounds R_{j,b}
  const offs = linkOffsets(arm);
  const axisFrame = (j: number) => (arm.convention === "dh" ? j - 1 : j); // joint j (1-based) turns about an axis through this frame's origin
  const ext = new Float64Array(PAYLOAD + 1);
  for (let i = 0; i < count; i++) {
    const b = bodyOf[i];
    let e: number;
    if (frameOf[i] === -2) {
      const r = shapeLocal[STRIDE * i + O_RADIUS];
      const f0 = spanFrames[2 * i], f1 = spanFrames[2 * i + 1];
      const d = (f: number, o: number) => Math.hypot(spanPoints[6 * i + o], spanPoints[6 * i + o + 1], spanPoints[6 * i + o + 2]) + (f === b ? 0 : offs[b - 1]);
      e = Math.max(d(f0, 0), d(f1, 3)) + r;
    } else e = extentFromOrigin(shapeLocal, STRIDE * i);
    if (b === TOOL) e += Math.hypot(armTool[3], armTool[7], armTool[11]);
    if (b === PAYLOAD) e += Math.hypot(model.tool[3], model.tool[7], model.tool[11]);
    ext[b] = Math.max(ext[b], e);
  }
  const motion = new Float64Array((PAYLOAD + 1) * n);
  for (let b = 1; b <= PAYLOAD; b++) {
    const frame = b <= n ? b : n;
    for (let j = 1; j <= Math.min(frame, n); j++) {
      if (model.prismatic[j - 1] === 1) { motion[b * n + j - 1] = 1; continue; }
      let r = ext[b];
      for (let k = axisFrame(j) + 1; k <= frame; k++) r += offs[k - 1];
      motion[b * n + j - 1] = r;
    }
  }

  const pairStart = new Int32Array(pairs.length + 1);
  pairs.forEach((pr, i) => { pairStart[i + 1] = pairStart[i] + pr.shapesA.length; });
  const spA = new Int32Array(pairStart[pairs.length]), spB = new Int32Array(pairStart[pairs.length]);
  pairs.forEach((pr, i) => { spA.set(pr.shapesA, pairStart[i]); spB.set(pr.shapesB, pairStart[i]); });
  return Object.freeze({
    pairStart, spA, spB,
    pairObstacle: Int32Array.from(pairs.map((pr) => (pr.b < 0 ? -1 - pr.b : -1))),
    pairFixed: Uint8Array.from(pairs.map((pr) => (pr.fixed ? 1 : 0))),
    pairContact: Uint8Array.from(pairs.map((pr) => (pr.contactable ? 1 : 0))),
    n, bodyNames: Object.freeze(bodyNames), obstacleNames: Object.freeze(obs.map((o) => o.name)), clearance: req.cell.clearance,
    shapeBody: Int32Array.from(bodyOf), shapeFrame: Int32Array.from(frameOf), shapeLocal, spanFrames, spanPoints, obstacles,
    pairs: Object.freeze(pairs), skipped: Object.freeze(skipped), unmodelled: Object.freeze(unmodelled), active: pairs.length > 0,
    motion, armTool, links,
  });
}

/** Makes the buffers for `cell`; places the fixed base shapes once. */
export function createCellData(cell: CellModel, base: ArrayLike<number>): CellData {
  const count = cell.shapeBody.length, np = cell.pairs.length;
  const world = new Float64Array(STRIDE * count);
  for (let i = 0; i < count; i++) if (cell.shapeFrame[i] === -1) placeShape(cell.shapeLocal, STRIDE * i, base, world, STRIDE * i);
  return Object.freeze({
    model: cell, world, toolPoint: new Float64Array(16), result: createDistanceResult(),
    pairDistance: new Float64Array(np), pairExact: new Uint8Array(np), pairDepth: new Float64Array(np), pairPoints: new Float64Array(6 * np),
    bodyMotion: new Float64Array(cell.n + 3), d0: new Float64Array(np), d1: new Float64Array(np),
    qa: new Float64Array(cell.n), qb: new Float64Array(cell.n), qm: new Float64Array(cell.n),
  });
}

/** Places every moving shape at q (runs forward kinematics into `data`). Allocates nothing. */
export function placeCell(cell: CellModel, cd: CellData, model: ArmModel, data: ArmData, q: ArrayLike<number>): void {
  forwardKinematics(model, data, q);
  const F = data.frames, n = cell.n, tp = cd.toolPoint, t = cell.armTool, fo = 16 * n;
  mat4MulRigid(tp, F, t, 0, fo, 0);
  const count = cell.shapeBody.length, W = cd.world, L = cell.shapeLocal;
  for (let i = 0; i < count; i++) {
    const f = cell.shapeFrame[i], o = STRIDE * i;
    if (f === -1) continue;
    if (f >= 0 && f <= n) placeShapeAt(L, o, F, 16 * f, W);
    else if (f === n + 1) placeShape(L, o, tp, W, o);
    else if (f === n + 2) placeShape(L, o, data.toolPose, W, o);
    else {
      // a capsule spanning two frames: its ends placed each by its own frame
      const fa = 16 * cell.spanFrames[2 * i], fb = 16 * cell.spanFrames[2 * i + 1], P = cell.spanPoints, p = 6 * i;
      W[o] = KIND_CAPSULE;
      W[o + O_RADIUS] = L[o + O_RADIUS];
      for (let r = 0; r < 3; r++) {
        W[o + O_A + r] = F[fa + 4 * r] * P[p] + F[fa + 4 * r + 1] * P[p + 1] + F[fa + 4 * r + 2] * P[p + 2] + F[fa + 4 * r + 3];
        W[o + O_B + r] = F[fb + 4 * r] * P[p + 3] + F[fb + 4 * r + 1] * P[p + 4] + F[fb + 4 * r + 2] * P[p + 5] + F[fb + 4 * r + 3];
      }
      updateBound(W, o);
    }
  }
}

/** placeShape with the pose read from frames[fo …] (no subarray). */
function placeShapeAt(src: Float64Array, o: number, F: Float64Array, fo: number, dst: Float64Array): void {
  const P = poseScratch;
  for (let k = 0; k < 16; k++) P[k] = F[fo + k];
  placeShape(src, o, P, dst, o);
}
const poseScratch = new Float64Array(16);

/**
 * Exact distance of pair p at the placed configuration (minimum over its shape pairs) into
 * cd.pairDistance / pairDepth / pairPoints; returns the distance.
 */
function exactPair(cell: CellModel, cd: CellData, p: number): number {
  const W = cd.world, B = cell.pairObstacle[p] < 0 ? W : cell.obstacles, res = cd.result;
  const A = cell.spA, S = cell.spB, end = cell.pairStart[p + 1];
  let best = Infinity, depth = 0;
  for (let k = cell.pairStart[p]; k < end; k++) {
    const d = distancePacked(W, STRIDE * A[k], B, STRIDE * S[k], res);
    if (d < best || (d === 0 && res.depth > depth)) {
      if (d < best) best = d;
      if (d === 0) depth = Math.max(depth, res.depth);
      const pp = 6 * p;
      cd.pairPoints[pp] = res.pointA[0]; cd.pairPoints[pp + 1] = res.pointA[1]; cd.pairPoints[pp + 2] = res.pointA[2];
      cd.pairPoints[pp + 3] = res.pointB[0]; cd.pairPoints[pp + 4] = res.pointB[1]; cd.pairPoints[pp + 5] = res.pointB[2];
    }
  }
  cd.pairDistance[p] = best;
  cd.pairDepth[p] = depth;
  cd.pairExact[p] = 1;
  return best;
}

/**
 * Lower bound of pair p's distance (m; may be < 0): from the bounding spheres of its shapes, or,
 * when one shape is a box, from the other's bounding sphere to the box itself (tight for the
 * large flat boxes cells are made of: table tops, guards).
 */
function pairLowerBound(cell: CellModel, cd: CellData, p: number): number {
  const W = cd.world, B = cell.pairObstacle[p] < 0 ? W : cell.obstacles, A = cell.spA, S = cell.spB, end = cell.pairStart[p + 1];
  let lower = Infinity;
  for (let k = cell.pairStart[p]; k < end; k++) {
    const ao = STRIDE * A[k], bo = STRIDE * S[k];
    let g: number;
    if (B[bo] === KIND_BOX) g = sphereBoxGap(W, ao, B, bo);
    else if (W[ao] === KIND_BOX) g = sphereBoxGap(B, bo, W, ao);
    else {
      const dx = W[ao + O_BC] - B[bo + O_BC], dy = W[ao + O_BC + 1] - B[bo + O_BC + 1], dz = W[ao + O_BC + 2] - B[bo + O_BC + 2];
      g = Math.sqrt(dx * dx + dy * dy + dz * dz) - W[ao + O_BR] - B[bo + O_BR];
    }
    if (g < lower) lower = g;
  }
  return lower;
}

/** Distance from the bounding sphere of the shape at S[so] to the box at X[xo] (a lower bound of their distance). */
function sphereBoxGap(S: Float64Array, so: number, X: Float64Array, xo: number): number {
  const dx = S[so + O_BC] - X[xo + O_A], dy = S[so + O_BC + 1] - X[xo + O_A + 1], dz = S[so + O_BC + 2] - X[xo + O_A + 2];
  const r = xo + O_R;
  // into the box frame (Rᵀ d), then the distance outside the half sides
  const lx = X[r] * dx + X[r + 3] * dy + X[r + 6] * dz, ly = X[r + 1] * dx + X[r + 4] * dy + X[r + 7] * dz, lz = X[r + 2] * dx + X[r + 5] * dy + X[r + 8] * dz;
  const gx = Math.abs(lx) - X[xo + O_H], gy = Math.abs(ly) - X[xo + O_H + 1], gz = Math.abs(lz) - X[xo + O_H + 2];
  const ox = gx > 0 ? gx : 0, oy = gy > 0 ? gy : 0, oz = gz > 0 ? gz : 0;
  return Math.sqrt(ox * ox + oy * oy + oz * oz) - S[so + O_BR];
}

/**
 * Checks the cell at q: every pair's distance (exact where it can decide the clearance or a
 * collision, a lower bound elsewhere), the clearance and the deepest overlap. `exempt[k] = 1`
 * lifts the tool's and the payload's pairs with obstacle k (a contact list). Allocates nothing.
 */
export function checkCell(cell: CellModel, cd: CellData, model: ArmModel, data: ArmData, q: ArrayLike<number>, exempt: Uint8Array | null, out: CellCheck): CellCheck {
  placeCell(cell, cd, model, data, q);
  return checkPlaced(cell, cd, exempt, out);
}

/** {@link checkCell} on the configuration already placed. */
function checkPlaced(cell: CellModel, cd: CellData, exempt: Uint8Array | null, out: CellCheck): CellCheck {
  const np = cell.pairs.length, fixed = cell.pairFixed;
  out.collisionFree = true; out.clearance = Infinity; out.clearancePair = -1; out.collisionPair = -1; out.collisionDepth = 0;
  // pass 1: lower bounds; the counted pair with the smallest is likely the closest
  let first = -1, firstLower = Infinity;
  for (let p = 0; p < np; p++) {
    cd.pairExact[p] = 0; cd.pairDepth[p] = 0;
    if (exempt !== null && cell.pairContact[p] === 1 && exempt[cell.pairObstacle[p]] === 1) { cd.pairDistance[p] = Infinity; continue; }
    const lower = pairLowerBound(cell, cd, p);
    cd.pairDistance[p] = lower;
    if (fixed[p] === 0 && lower < firstLower) { firstLower = lower; first = p; }
  }
  if (first >= 0) take(cell, cd, first, out);
  // pass 2: exact distances where the bound does not decide (a possible overlap, or closer than the best so far)
  for (let p = 0; p < np; p++) {
    if (p === first) continue;
    const lower = cd.pairDistance[p];
    if (lower === Infinity) continue;
    if (lower > 0 && (fixed[p] === 1 || lower > out.clearance)) continue;
    take(cell, cd, p, out);
  }
  return out;
}

/** Exact distance of pair p, entered into the check's collision and clearance. */
function take(cell: CellModel, cd: CellData, p: number, out: CellCheck): void {
  const d = exactPair(cell, cd, p);
  if (d === 0) {
    out.collisionFree = false;
    if (cd.pairDepth[p] > out.collisionDepth || out.collisionPair < 0) { out.collisionDepth = cd.pairDepth[p]; out.collisionPair = p; }
  }
  // the smallest distance; its pair, the first within 1 nm of it in the pairs' order (so rounding does not pick among ties)
  if (cell.pairFixed[p] === 0 && d < out.clearance + 1e-9) {
    if (out.clearancePair < 0 || d < out.clearance - 1e-9 || (p < out.clearancePair)) out.clearancePair = p;
    if (d < out.clearance) out.clearance = d;
  }
}

function isExempt(pair: CellPair, exempt: Uint8Array | null): boolean {
  return exempt !== null && pair.contactable && exempt[-1 - pair.b] === 1;
}

/** Exact distance of every checked pair at q (the `clearance` command). */
export function allPairDistances(cell: CellModel, cd: CellData, model: ArmModel, data: ArmData, q: ArrayLike<number>, exempt: Uint8Array | null): { pair: number; distance: number }[] {
  placeCell(cell, cd, model, data, q);
  const out: { pair: number; distance: number }[] = [];
  cell.pairs.forEach((pair, p) => {
    if (isExempt(pair, exempt)) return;
    out.push({ pair: p, distance: exactPair(cell, cd, p) });
  });
  return out;
}

/** The contact list of a target or path as an exemption mask over the obstacles (null when empty). */
export function contactMask(cell: CellModel, names: readonly string[] | undefined): Uint8Array | null {
  if (!names || names.length === 0) return null;
  const m = new Uint8Array(cell.obstacleNames.length);
  names.forEach((name) => {
    const k = cell.obstacleNames.indexOf(name);
    if (k >= 0) m[k] = 1;
  });
  return m;
}

/** Names of pair p: [arm body, the other body or obstacle]. */
export function pairNames(cell: CellModel, p: number): [string, string] {
  const pair = cell.pairs[p];
  return [cell.bodyNames[pair.a], pair.b >= 0 ? cell.bodyNames[pair.b] : cell.obstacleNames[-1 - pair.b]];
}

/** The outcome of a motion check between two configurations. */
interface MotionCheck {
  /** The motion keeps at least the threshold everywhere (proven, or found by evaluation). */
  clear: boolean;
  /** A configuration along the motion with a collision: the fraction of the way (0…1), the pair and its depth. */
  collision: { fraction: number; pair: number; depth: number } | null;
  /** Smallest distance known along the motion (exact at evaluated configurations, else the proven bound), and its pair. */
  lowest: number;
  lowestPair: number;
  /** Configurations evaluated between the two ends. */
  evaluations: number;
  /** A stretch where the bound stayed below the threshold after the evaluation budget was spent. */
  unresolved: boolean;
}

/**
 * Conservative check of the straight joint-space motion qa → qb (see the module note):
 * `dA`, `dB` are the per-pair distances at the two ends and `exA`, `exB` whether each is exact
 * (as {@link checkCell} leaves them; a lower bound is made exact here when the pair needs a closer
 * look). Proves that every counted pair keeps at least `threshold`, or finds where it does not.
 * Leaves the cell placed at an unspecified configuration.
 */
export function checkMotion(
  cell: CellModel, cd: CellData, model: ArmModel, data: ArmData,
  qa: ArrayLike<number>, qb: ArrayLike<number>,
  dA: ArrayLike<number>, exA: ArrayLike<number>, dB: ArrayLike<number>, exB: ArrayLike<number>,
  exempt: Uint8Array | null, threshold: number,
): MotionCheck {
  const n = cell.n, np = cell.pairs.length, M = cd.bodyMotion;
  for (let b = 0; b < n + 3; b++) {
    let m = 0;
    for (let j = 0; j < n; j++) m += cell.motion[b * n + j] * Math.abs(qb[j] - qa[j]);
    M[b] = m;
  }
  const out: MotionCheck = { clear: true, collision: null, lowest: Infinity, lowestPair: -1, evaluations: 0, unresolved: false };
  const motionOf = (p: number) => {
    const pair = cell.pairs[p];
    if (pair.b < 0) return M[pair.a];
    // relative motion of the higher body seen from the lower one: the joints after the lower body's link
    let m = 0;
    for (let j = Math.min(pair.a, n); j < n; j++) m += cell.motion[pair.b * n + j] * Math.abs(qb[j] - qa[j]);
    return m;
  };
  const todo: number[] = [];
  for (let p = 0; p < np; p++) {
    const pair = cell.pairs[p];
    if (pair.fixed || isExempt(pair, exempt) || !(dA[p] < Infinity)) continue;
    if ((dA[p] + dB[p] - motionOf(p)) / 2 >= accept(threshold)) continue;
    todo.push(p);
  }
  if (todo.length === 0) return out;
  // exact distances at the ends for the pairs that need a closer look
  const ends = [new Float64Array(todo.length), new Float64Array(todo.length)];
  for (let e = 0; e < 2; e++) {
    const d = e === 0 ? dA : dB, ex = e === 0 ? exA : exB;
    let placed = false;
    todo.forEach((p, k) => {
      if (ex[p] === 1) { ends[e][k] = d[p]; return; }
      if (!placed) { placeCell(cell, cd, model, data, e === 0 ? qa : qb); placed = true; }
      ends[e][k] = exactPair(cell, cd, p);
    });
  }
  todo.forEach((p, k) => {
    const a = ends[0][k], b = ends[1][k];
    for (const d of [a, b]) if (d < out.lowest) { out.lowest = d; out.lowestPair = p; }
    refine(cell, cd, model, data, qa, qb, 0, 1, a, b, motionOf(p), p, threshold, out);
  });
  out.clear = out.collision === null && !(out.lowest < threshold) && !out.unresolved;
  return out;
}

/** The bound a stretch of motion must reach to count as keeping `threshold` (see MOTION_TOLERANCE). */
function accept(threshold: number): number {
  return Math.max(threshold - MOTION_TOLERANCE, MOTION_TOLERANCE / 2);
}

function refine(
  cell: CellModel, cd: CellData, model: ArmModel, data: ArmData, qa: ArrayLike<number>, qb: ArrayLike<number>,
  t0: number, t1: number, d0: number, d1: number, motion: number, p: number, threshold: number, out: MotionCheck,
): void {
  const bound = (d0 + d1 - motion) / 2;
  if (bound >= accept(threshold)) return;
  // the bodies move less than the tolerance here: the distance between is that at the ends (counted), within it
  if (motion < MOTION_TOLERANCE && Math.min(d0, d1) > 0) return;
  if (out.evaluations >= MOTION_MAX_EVALUATIONS) {
    // settle for the proven bound
    if (bound < out.lowest) { out.lowest = Math.max(0, bound); out.lowestPair = p; }
    out.unresolved = true;
    return;
  }
  const tm = 0.5 * (t0 + t1);
  const q = cd.qm;
  for (let j = 0; j < cell.n; j++) q[j] = qa[j] + tm * (qb[j] - qa[j]);
  placeCell(cell, cd, model, data, q);
  out.evaluations++;
  const dm = exactPair(cell, cd, p);
  if (dm < out.lowest) { out.lowest = dm; out.lowestPair = p; }
  if (dm === 0 && (out.collision === null || tm < out.collision.fraction)) out.collision = { fraction: tm, pair: p, depth: cd.pairDepth[p] };
  refine(cell, cd, model, data, qa, qb, t0, tm, d0, dm, motion / 2, p, threshold, out);
  refine(cell, cd, model, data, qa, qb, tm, t1, dm, d1, motion / 2, p, threshold, out);
}
