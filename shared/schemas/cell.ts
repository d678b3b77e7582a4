import { z } from "zod";
import { finite, mat4, nameText, vec3 } from "./common";

/**
 * Collision geometry in the files (SI units, m; poses row-major 4×4).
 *
 * - Arm capsules `{from, to, radius}`: the points within `radius` of the segment from → to, in the
 *   frame of the body that carries them (a link's frame after its joint transform, or the arm's
 *   base frame for `baseCollision`).
 * - Cell obstacles: named shapes in the cell frame. A box is centred at its pose's origin with
 *   edges along its axes and full side lengths `size`; a cylinder is centred at its pose's origin
 *   with its axis along the pose's z and full `length`; spheres and capsules as above.
 * - Tool and payload shapes: capsules or boxes in the tool-point frame (tool) or the TCP frame
 *   (payload), with an optional name for the reasons.
 */

/** Largest length accepted for a shape dimension (m): a cell is not a warehouse. */
const MAX_SHAPE_SIZE = 100;
/** Most capsules on one body and most obstacles in a cell. */
export const MAX_BODY_SHAPES = 8;
const MAX_OBSTACLES = 200;

const size = finite.gt(0, "must be > 0").max(MAX_SHAPE_SIZE, `must be at most ${MAX_SHAPE_SIZE} m`);
const point = vec3;

/** An arm capsule (link or base). */
export const armCapsuleSchema = z.object({
  /** Segment start (m) in the body's frame. */
  from: point,
  /** Segment end (m) in the body's frame. */
  to: point,
  /** Radius (m, > 0). */
  radius: size,
});
export type ArmCapsule = z.infer<typeof armCapsuleSchema>;

export const OBSTACLE_SHAPES = ["box", "sphere", "cylinder", "capsule"] as const;
export type ObstacleShape = (typeof OBSTACLE_SHAPES)[number];

/** Obstacle and shape names: shown to others, and listed comma-separated in contact lists. */
const obstacleName = nameText(80).refine((s) => !s.includes(","), "must not contain a comma (contact lists separate names with commas)");

const boxObstacleSchema = z.object({
  name: obstacleName,
  shape: z.literal("box"),
  /** Centre and orientation in the cell frame (edges along its axes). */
  pose: mat4,
  /** Full side lengths along the pose's x, y, z (m). */
  size: z.tuple([size, size, size]),
});
const sphereObstacleSchema = z.object({
  name: obstacleName,
  shape: z.literal("sphere"),
  center: point,
  radius: size,
});
const cylinderObstacleSchema = z.object({
  name: obstacleName,
  shape: z.literal("cylinder"),
  /** Centre and orientation in the cell frame; the axis is the pose's z. */
  pose: mat4,
  radius: size,
  /** Full length along the axis (m). */
  length: size,
});
const capsuleObstacleSchema = z.object({
  name: obstacleName,
  shape: z.literal("capsule"),
  from: point,
  to: point,
  radius: size,
});

/** A named obstacle in the cell frame. */
const obstacleSchema = z.discriminatedUnion("shape", [boxObstacleSchema, sphereObstacleSchema, cylinderObstacleSchema, capsuleObstacleSchema], {
  error: "must be a box, sphere, cylinder or capsule",
});
export type Obstacle = z.infer<typeof obstacleSchema>;

/** Tool and payload shapes: capsules (the `shape` key may be left out) or boxes. */
export const bodyShapeSchema = z.preprocess(
  (v) => (v !== null && typeof v === "object" && !Array.isArray(v) && !("shape" in v) && "from" in v ? { ...v, shape: "capsule" } : v),
  z.discriminatedUnion("shape", [
    z.object({ shape: z.literal("capsule"), name: obstacleName.optional(), from: point, to: point, radius: size }),
    z.object({ shape: z.literal("box"), name: obstacleName.optional(), pose: mat4, size: z.tuple([size, size, size]) }),
  ], { error: "must be a capsule or a box" }),
);
export type BodyShape = z.infer<typeof bodyShapeSchema>;

/** Default required clearance (m) between any two checked bodies. */
export const DEFAULT_CLEARANCE = 0.01;

export const cellSchema = z.object({
  /** Named obstacles in the cell frame (names unique). */
  obstacles: z.array(obstacleSchema).max(MAX_OBSTACLES, `at most ${MAX_OBSTACLES} obstacles`).default([]),
  /** Required clearance (m) between every checked pair of bodies. */
  clearance: finite.min(0, "must be ≥ 0").max(0.5, "must be at most 500 mm").default(DEFAULT_CLEARANCE),
});
export type Cell = z.infer<typeof cellSchema>;

/**
 * Obstacles in the earlier form (top-level `obstacles`: axis-aligned boxes by centre and size,
 * spheres, names optional). Still read; converted into `cell.obstacles` by
 * {@link convertLegacyObstacles}.
 */
export const legacyObstacleSchema = z.discriminatedUnion("shape", [
  z.object({ shape: z.literal("box"), name: z.string().max(80).optional(), center: point, size: z.tuple([size, size, size]) }),
  z.object({ shape: z.literal("sphere"), name: z.string().max(80).optional(), center: point, radius: size }),
], { error: "must be a box or a sphere" });
type LegacyObstacle = z.infer<typeof legacyObstacleSchema>;

/**
 * The earlier obstacles as cell obstacles: a box gets the pose of a translation to its centre
 * (axis-aligned as before), a sphere keeps its fields; a missing or repeated name becomes
 * "obstacle k" or "name (k)" so that names are unique next to `taken`.
 */
export function convertLegacyObstacles(legacy: readonly LegacyObstacle[], taken: readonly string[]): Obstacle[] {
  const used = new Set(taken);
  return legacy.map((o, i) => {
    let base = (o.name ?? "").replace(/,/g, " ").replace(/\s+/g, " ").trim() || `obstacle ${i + 1}`;
    if (base.length > 76) base = base.slice(0, 76);
    let name = base;
    for (let k = 2; used.has(name); k++) name = `${base} (${k})`;
    used.add(name);
    if (o.shape === "sphere") return { name, shape: "sphere", center: [...o.center], radius: o.radius };
    return { name, shape: "box", pose: [1, 0, 0, o.center[0], 0, 1, 0, o.center[1], 0, 0, 1, o.center[2], 0, 0, 0, 1], size: [...o.size] };
  });
}

/** Said once after importing a file with obstacles in the earlier form. */
export const LEGACY_OBSTACLES_NOTICE =
  'The file listed obstacles in the earlier form (top-level "obstacles", axis-aligned boxes and spheres); they were converted into the cell\'s obstacle table below. Check their names and placement.';

/**
 * Notices for a requirement-set file as given (before parsing): what the reader converted. Empty
 * for a file in the current form.
 */
export function requirementNotices(raw: unknown): string[] {
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) return [];
  const legacy = (raw as { obstacles?: unknown }).obstacles;
  if (!Array.isArray(legacy) || legacy.length === 0) return [];
  return [
    `${legacy.length} obstacle${legacy.length === 1 ? "" : "s"} in the earlier form (top-level "obstacles", axis-aligned) ${legacy.length === 1 ? "was" : "were"} converted into the cell's obstacle table ("cell.obstacles"); saving stores the new form`,
  ];
}
