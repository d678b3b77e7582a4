/**
 * The collision geometry of an arm's links: the capsules a file gives (`joints[i].collision`, in
 * link i's frame), or, without them, capsules derived from the kinematic description and the
 * link's `radius`.
 *
 * ## Frames
 * Frame 0 is the arm's first joint frame (the base frame after the file's own `base` transform);
 * frame k (k = 1 … n) is link k's frame, after joint k's transform (the frame `com` is given in).
 * A derived capsule may join a point fixed in frame k−1 to a point fixed in frame k; both lie on
 * joint k's axis or on link k, so the capsule moves rigidly with link k (for a revolute joint it
 * has constant coordinates in frame k; for a prismatic joint the part along the joint's travel
 * stretches with q).
 *
 * ## How link k's capsules are derived (all with the link's `radius`)
 * - `dh` (link k = Rz(θ+q)·Tz(d)·Tx(a)·Rx(α)): the body joint k moves runs along joint k's axis
 *   from O₍k−1₎ by d, then along x_k by a to O_k: capsules O₍k−1₎ → (−a, 0, 0)ₖ and
 *   (−a, 0, 0)ₖ → O_k. For the last link also O_n → the tool point (the file's `tool`).
 * - `mdh` (link k = Rx(α)·Tx(a)·Rz(θ+q)·Tz(d), row k holding the a and α of the link before joint
 *   k): link k runs along its own axis from the foot of the common normal, (a_k, 0, 0) in frame
 *   k−1, to O_k, then along x_k by the next row's a to the next axis (the last link: to the tool
 *   point).
 * - `chain` (joint k = T(origin)·Rot(axis, q)): link k runs from O_k to joint k+1's origin (the
 *   last link: to the tool point); a prismatic joint adds the stretch from its origin to O_k.
 * - Segments shorter than 1e-9 m are left out; a link whose segments are all shorter gets a
 *   sphere (a capsule of zero length) of its radius at O_k.
 * The part before joint 1 (from the base frame to the first joint) belongs to the base: give it
 * `baseCollision`.
 *
 * ## Pairs that always touch
 * Two links joined through links shorter in all than the sum of their radii overlap in every
 * configuration (the end of one and the start of the other are never farther apart than the
 * links between them are long); so do two links whose shapes both hold a point that the joints
 * between them cannot move relative to either (a spherical wrist's centre). Checking such pairs
 * says nothing, so they are set aside ({@link alwaysTouchingPairs}), like the pairs an
 * `ignoredPairs` list names.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import type { ArmCapsule } from "@/shared/schemas/cell";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";

type Vec3Tuple = [number, number, number];

/** A point fixed in one of the arm's frames (0 = first joint frame, k = link k). */
interface FramePoint {
  frame: number;
  point: Vec3Tuple;
}

/** A capsule whose ends are fixed in (possibly different) frames of the arm. */
interface AttachedCapsule {
  from: FramePoint;
  to: FramePoint;
  radius: number;
}

/** The collision geometry of one link. */
export interface LinkGeometry {
  /** Link number, 1 … n. */
  link: number;
  /** Where the capsules come from: the file's `collision`, derived from the `radius`, or none. */
  source: "collision" | "derived" | "none";
  /** The capsules with their ends in the arm's frames (for the analysis). */
  attached: AttachedCapsule[];
  /**
   * The same capsules in the link's own frame (for showing and overriding them). For a derived
   * capsule of a prismatic joint these are at q = 0 (or the nearer limit), and `stretches` is set.
   */
  capsules: ArmCapsule[];
  stretches: boolean;
  /** Largest distance between the link's start and end over the joint's travel (m): the kinematic length. */
  length: number;
  /** The link's `radius` (m), or null. */
  radius: number | null;
}

const SHORT = 1e-9;

type AnyJoint = ArmDocument["joints"][number];
type ArmLike = Pick<ArmDocument, "convention" | "joints" | "tool"> & { name?: string; base?: number[] };

/** Segments of link k (1-based) by the rules above, with the kinematic length. */
function derivedSegments(arm: ArmLike, k: number): { segments: [FramePoint, FramePoint][]; length: number } {
  const n = arm.joints.length;
  const j = arm.joints[k - 1] as AnyJoint;
  const tool = arm.tool;
  const toolPoint: Vec3Tuple = tool ? [tool[3], tool[7], tool[11]] : [0, 0, 0];
  const O = (frame: number): FramePoint => ({ frame, point: [0, 0, 0] });
  const P = (frame: number, point: Vec3Tuple): FramePoint => ({ frame, point });
  const travel = (d: number) => (j.type === "prismatic" ? Math.max(Math.abs(d + j.min), Math.abs(d + j.max)) : Math.abs(d));
  const segments: [FramePoint, FramePoint][] = [];
  let length = 0;
  const add = (a: FramePoint, b: FramePoint, len: number) => {
    length += len;
    if (len > SHORT) segments.push([a, b]);
  };
  if (arm.convention === "dh") {
    const r = j as Extract<AnyJoint, { a: number }>;
    add(O(k - 1), P(k, [-r.a, 0, 0]), travel(r.d));
    add(P(k, [-r.a, 0, 0]), O(k), Math.abs(r.a));
    if (k === n) add(O(n), P(n, toolPoint), Math.hypot(...toolPoint));
  } else if (arm.convention === "mdh") {
    const r = j as Extract<AnyJoint, { a: number }>;
    add(P(k - 1, [r.a, 0, 0]), O(k), travel(r.d));
    if (k < n) {
      const next = arm.joints[k] as Extract<AnyJoint, { a: number }>;
      add(O(k), P(k, [next.a, 0, 0]), Math.abs(next.a));
    } else add(O(n), P(n, toolPoint), Math.hypot(...toolPoint));
  } else {
    const r = j as Extract<AnyJoint, { origin: unknown }>;
    if (r.type === "prismatic") add(P(k - 1, [...r.origin.xyz] as Vec3Tuple), O(k), Math.max(Math.abs(r.min), Math.abs(r.max)));
    if (k < n) {
      const next = arm.joints[k] as Extract<AnyJoint, { origin: unknown }>;
      add(O(k), P(k, [...next.origin.xyz] as Vec3Tuple), Math.hypot(...next.origin.xyz));
    } else add(O(n), P(n, toolPoint), Math.hypot(...toolPoint));
  }
  return { segments, length };
}

/**
 * The collision geometry of every link (index k−1 for link k). Throws RangeError (from the
 * kinematics) when the arm's kinematic description is invalid.
 */
export function linkGeometry(arm: ArmLike): LinkGeometry[] {
  const n = arm.joints.length;
  // Frames at a reference configuration (q = 0, or the nearer limit) to express frame k−1 points in frame k.
  const model = createModel({ name: arm.name ?? "", convention: arm.convention, joints: arm.joints, tool: arm.tool } as Parameters<typeof createModel>[0]);
  const data = createData(model);
  const q0 = arm.joints.map((j) => Math.min(j.max, Math.max(j.min, 0)));
  forwardKinematics(model, data, q0);
  const toFrame = (p: FramePoint, k: number): Vec3Tuple => {
    if (p.frame === k) return [...p.point] as Vec3Tuple;
    const F = data.frames, a = 16 * p.frame, b = 16 * k;
    // world point of p, then into frame k: R_kᵀ (x − o_k)
    const x = [0, 1, 2].map((r) => F[a + 4 * r] * p.point[0] + F[a + 4 * r + 1] * p.point[1] + F[a + 4 * r + 2] * p.point[2] + F[a + 4 * r + 3]);
    const d = [x[0] - F[b + 3], x[1] - F[b + 7], x[2] - F[b + 11]];
    return [0, 1, 2].map((c) => clean(F[b + c] * d[0] + F[b + 4 + c] * d[1] + F[b + 8 + c] * d[2])) as Vec3Tuple;
  };
  const out: LinkGeometry[] = [];
  for (let k = 1; k <= n; k++) {
    const j = arm.joints[k - 1] as AnyJoint;
    const { segments, length } = derivedSegments(arm, k);
    const radius = j.radius ?? null;
    if (j.collision && j.collision.length > 0) {
      out.push({
        link: k, source: "collision", radius, length, stretches: false,
        capsules: j.collision.map((c) => ({ from: [...c.from], to: [...c.to], radius: c.radius })),
        attached: j.collision.map((c) => ({ from: { frame: k, point: [...c.from] as Vec3Tuple }, to: { frame: k, point: [...c.to] as Vec3Tuple }, radius: c.radius })),
      });
      continue;
    }
    if (radius === null || !(radius > 0)) {
      out.push({ link: k, source: "none", radius, length, stretches: false, capsules: [], attached: [] });
      continue;
    }
    const segs: [FramePoint, FramePoint][] = segments.length > 0 ? segments : [[{ frame: k, point: [0, 0, 0] }, { frame: k, point: [0, 0, 0] }]];
    const attached = segs.map(([a, b]) => ({ from: a, to: b, radius }));
    out.push({
      link: k, source: "derived", radius, length,
      stretches: j.type === "prismatic" && segs.some(([a, b]) => a.frame !== b.frame),
      attached,
      capsules: attached.map((c) => ({ from: toFrame(c.from, k), to: toFrame(c.to, k), radius })),
    });
  }
  return out;
}

/** Rounds away the last bits of a coordinate computed through two transforms (m). */
function clean(v: number): number {
  const r = Math.round(v * 1e12) / 1e12;
  return Object.is(r, -0) ? 0 : r;
}

/**
 * Pairs of links (i < j, j − i ≥ 2) that overlap in every configuration, link numbers as in
 * `ignoredPairs`, by either of two rules:
 * - derived geometry (both links from `radius`): the links between them are shorter in all than
 *   r_i + r_j;
 * - any geometry: a point held still relative to both links whatever the joints between them do
 *   (the centre of a spherical wrist, where the forearm's and the hand's housings meet) lies
 *   inside a shape of each. The candidates are the frame origins from link i to link j; one is
 *   held still when its coordinates in link j's frame stay the same (to 1e-9 m) as the joints
 *   i+1 … j move through three other configurations.
 */
export function alwaysTouchingPairs(links: readonly LinkGeometry[], arm: ArmLike): [number, number][] {
  const out: [number, number][] = [];
  let frames: Float64Array[] | null = null;
  for (let i = 0; i < links.length; i++) {
    for (let j = i + 2; j < links.length; j++) {
      const a = links[i], b = links[j];
      if (a.source === "none" || b.source === "none") continue;
      if (a.source === "derived" && b.source === "derived") {
        let between = 0;
        for (let k = i + 1; k < j; k++) between += links[k].length;
        if (between < a.radius! + b.radius!) out.push([a.link, b.link]);
        continue;
      }
      if (a.stretches || b.stretches) continue;
      frames ??= poseSamples(arm);
      if (sharesHeldPointInside(frames, a, b)) out.push([a.link, b.link]);
    }
  }
  return out;
}

/** Joint frames at the reference configuration and three others (every joint moved). */
function poseSamples(arm: ArmLike): Float64Array[] {
  const model = createModel({ name: arm.name ?? "", convention: arm.convention, joints: arm.joints, tool: arm.tool } as Parameters<typeof createModel>[0]);
  const data = createData(model);
  const q0 = arm.joints.map((j) => Math.min(j.max, Math.max(j.min, 0)));
  const frames: Float64Array[] = [];
  for (const step of [0, 0.7, -1.3, 2.1]) {
    forwardKinematics(model, data, q0.map((q, k) => q + step * (arm.joints[k].type === "prismatic" ? 0.1 : 1) * (1 + 0.17 * k)));
    frames.push(Float64Array.from(data.frames));
  }
  return frames;
}

/** x in frame f's coordinates for a world point w (frames row-major 4×4, f the frame index). */
function toLocal(F: Float64Array, f: number, w: readonly number[]): Vec3Tuple {
  const o = 16 * f, d = [w[0] - F[o + 3], w[1] - F[o + 7], w[2] - F[o + 11]];
  return [0, 1, 2].map((c) => F[o + c] * d[0] + F[o + 4 + c] * d[1] + F[o + 8 + c] * d[2]) as Vec3Tuple;
}

/** The world point of local point p of frame f. */
function toWorld(F: Float64Array, f: number, p: readonly number[]): Vec3Tuple {
  const o = 16 * f;
  return [0, 1, 2].map((r) => F[o + 4 * r] * p[0] + F[o + 4 * r + 1] * p[1] + F[o + 4 * r + 2] * p[2] + F[o + 4 * r + 3]) as Vec3Tuple;
}

/** Whether local point p lies inside (or on) one of the capsules given in the same frame. */
function insideCapsules(capsules: readonly ArmCapsule[], p: Vec3Tuple): boolean {
  return capsules.some((c) => {
    const ab = [c.to[0] - c.from[0], c.to[1] - c.from[1], c.to[2] - c.from[2]];
    const ap = [p[0] - c.from[0], p[1] - c.from[1], p[2] - c.from[2]];
    const len2 = ab[0] * ab[0] + ab[1] * ab[1] + ab[2] * ab[2];
    const t = len2 > 0 ? Math.min(1, Math.max(0, (ap[0] * ab[0] + ap[1] * ab[1] + ap[2] * ab[2]) / len2)) : 0;
    return Math.hypot(ap[0] - t * ab[0], ap[1] - t * ab[1], ap[2] - t * ab[2]) <= c.radius;
  });
}

/** The second rule of {@link alwaysTouchingPairs} for links a and b (frames = poseSamples). */
function sharesHeldPointInside(frames: readonly Float64Array[], a: LinkGeometry, b: LinkGeometry): boolean {
  const [F0] = frames;
  for (let f = a.link; f <= b.link; f++) {
    const world = toWorld(F0, f, [0, 0, 0]);
    const inA = toLocal(F0, a.link, world), inB = toLocal(F0, b.link, world);
    const held = frames.slice(1).every((F) => {
      const moved = toLocal(F, b.link, toWorld(F, a.link, inA));
      return Math.hypot(moved[0] - inB[0], moved[1] - inB[1], moved[2] - inB[2]) <= 1e-9;
    });
    if (held && insideCapsules(a.capsules, inA) && insideCapsules(b.capsules, inB)) return true;
  }
  return false;
}

