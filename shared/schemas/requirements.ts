import { z } from "zod";
import { finite, nameText, nonNegative, positive, vec3, mat4 } from "./common";
import { SUB_SCORES, type SubScoreKey } from "../sub-scores";
import { cellExtent, mountingSchema, regionOutsideCell } from "./mounting";
import { bodyShapeSchema, cellSchema, convertLegacyObstacles, DEFAULT_CLEARANCE, legacyObstacleSchema, MAX_BODY_SHAPES, type Cell } from "./cell";

/**
 * Requirement set: one cell scenario, SI units (m, rad, kg, N, N·m, m/s).
 *
 * Frames: the cell frame C is the world of the scenario. `base` places the arm's base frame B in
 * C (T_C_B, row-major 4×4). Target positions and orientations are given in C. The tool is
 * attached after the arm's own `tool` transform (flange → arm tool point); `tool.tcp` is
 * arm tool point → TCP. The payload CoG is given in the TCP frame. Forces and moments a target
 * requires are what the tool must apply to the environment, expressed in C.
 *
 * Orientation convention (stated on screen): roll-pitch-yaw about the fixed cell axes X, then Y,
 * then Z, so R = Rz(yaw) · Ry(pitch) · Rx(roll).
 */
export const CONSTRAINT_MODES = ["pose", "axis", "point"] as const;
export type ConstraintMode = (typeof CONSTRAINT_MODES)[number];

/** A list of obstacle names (checked against `cell.obstacles` by the requirement-set schema). */
const contactSchema = z.array(nameText(80)).max(50, "at most 50 names");

const targetSchema = z.object({
  name: nameText(80),
  /** Position of the TCP in the cell frame (m). */
  position: vec3,
  /** Roll, pitch, yaw (rad) about fixed X, Y, Z: R = Rz(yaw)·Ry(pitch)·Rx(roll). */
  rpy: vec3,
  /** pose = full 6-D; axis = position + tool z direction, free spin; point = position only. */
  mode: z.enum(CONSTRAINT_MODES, { error: "must be pose, axis or point" }),
  /** Position tolerance (m). */
  positionTolerance: positive.max(0.1, "must be at most 100 mm").default(1e-5),
  /** Rotation tolerance (rad). */
  rotationTolerance: positive.max(0.5, "must be at most 28.6°").default(1e-4),
  /** Force the tool must apply to the environment, in the cell frame (N). */
  force: vec3.optional(),
  /** Moment the tool must apply, in the cell frame (N·m). */
  moment: vec3.optional(),
  /** Obstacle names the tool and the payload (not the links) may touch at this target. */
  contact: contactSchema.optional(),
  /** `must`: the placement search reaches it before any other target (docs/design.md#mount-placement); default want. */
  priority: z.enum(["must", "want"], { error: "must be must or want" }).optional(),
});
export type Target = z.infer<typeof targetSchema>;

const waypointSchema = z.object({
  position: vec3,
  rpy: vec3,
});

const pathSchema = z.object({
  name: nameText(80),
  /** Ordered waypoints, linearly interpolated (position linear, orientation by slerp). */
  waypoints: z.array(waypointSchema).min(2, "a path needs at least 2 waypoints").max(200),
  mode: z.enum(CONSTRAINT_MODES, { error: "must be pose, axis or point" }).default("axis"),
  /** Sample step along the path (m). */
  step: positive.min(1e-4, "must be at least 0.1 mm").max(1, "must be at most 1000 mm"),
  /** Required TCP speed along the path (m/s). */
  speed: positive.max(10, "must be at most 10 000 mm/s"),
  /** Obstacle names the tool and the payload may touch all along this path (e.g. the part a seam runs on). */
  contact: contactSchema.optional(),
});
export type PathSpec = z.infer<typeof pathSchema>;

/** One step of a task sequence: a move to a target (then a dwell), a path followed, or a wait. */
const sequenceStepSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({
      kind: z.literal("move"),
      /** Name of a target of the set. */
      target: nameText(80),
      /** Time held at the target after the move (s). */
      dwell: nonNegative.max(3600, "must be at most 3600 s").optional(),
    }),
    z.object({
      kind: z.literal("path"),
      /** Name of a path of the set. */
      path: nameText(80),
    }),
    z.object({
      kind: z.literal("wait"),
      /** Time waited (s). */
      seconds: nonNegative.max(3600, "must be at most 3600 s"),
    }),
  ],
  { error: "must be a step of kind move, path or wait" },
);

/** A task sequence: a closed cycle of steps, with an optional required cycle time. */
const sequenceSchema = z.object({
  name: nameText(80),
  steps: z.array(sequenceStepSchema).min(1, "a sequence needs at least 1 step").max(200, "at most 200 steps"),
  /** Required cycle time (s); a required rate in parts per hour is 3600 / rate. */
  required: positive.max(86400, "must be at most 86 400 s").optional(),
});
export type Sequence = z.infer<typeof sequenceSchema>;

/** Datasheet fields a spec requirement can test, with the SI unit they are stored in. */
export const SPEC_FIELDS = {
  ratedPayload: { label: "Rated payload", unit: "kg", kind: "number" },
  reach: { label: "Reach", unit: "m", kind: "number" },
  repeatability: { label: "Pose repeatability (ISO 9283 RP)", unit: "m", kind: "number" },
  armMass: { label: "Arm mass", unit: "kg", kind: "number" },
  axes: { label: "Number of axes", unit: "", kind: "number" },
  price: { label: "Price", unit: "currency", kind: "number" },
  leadTimeWeeks: { label: "Lead time", unit: "weeks", kind: "number" },
  ipCode: { label: "IP code (IEC 60529)", unit: "", kind: "ip" },
  mounting: { label: "Mounting", unit: "", kind: "mounting" },
  collaborative: { label: "Collaborative", unit: "", kind: "boolean" },
} as const;
export type SpecField = keyof typeof SPEC_FIELDS;
export const SPEC_FIELD_NAMES = Object.keys(SPEC_FIELDS) as SpecField[];

export const COMPARATORS = ["atLeast", "atMost", "equals", "includes"] as const;
export type Comparator = (typeof COMPARATORS)[number];
/** How a comparator is written: its symbol (tables, labels, reasons) and its words (exports, the editor). */
export const COMPARATOR_TEXT: Record<Comparator, { symbol: string; words: string }> = {
  atLeast: { symbol: "≥", words: "at least" },
  atMost: { symbol: "≤", words: "at most" },
  equals: { symbol: "=", words: "equals" },
  includes: { symbol: "includes", words: "includes" },
};

export const specRequirementSchema = z
  .object({
    field: z.enum(SPEC_FIELD_NAMES as [SpecField, ...SpecField[]], { error: "is not a known datasheet field" }),
    /** atLeast (≥), atMost (≤), equals (=), includes (mounting). For IP codes atLeast is digit by digit. */
    comparator: z.enum(COMPARATORS, { error: "must be atLeast, atMost, equals or includes" }),
    /** SI number, IP code string, mounting name, or boolean, by field kind. */
    value: z.union([finite, z.string().trim().min(1).max(40), z.boolean()]),
    priority: z.enum(["must", "want"], { error: "must be must or want" }),
    note: z.string().max(400).optional(),
  })
  .superRefine((r, ctx) => {
    const kind = SPEC_FIELDS[r.field].kind;
    const bad = (message: string, path: string[] = ["value"]) => ctx.addIssue({ code: "custom", path, message });
    if (kind === "number" && typeof r.value !== "number") bad(`${r.field} needs a number, got ${JSON.stringify(r.value)}`);
    if (kind === "number" && r.comparator === "includes") bad(`"includes" applies to mounting only`, ["comparator"]);
    if (kind === "ip") {
      if (typeof r.value !== "string" || !/^IP[0-6X][0-9X]$/i.test(r.value)) bad(`ipCode needs a code such as IP54 or IPX7, got ${JSON.stringify(r.value)}`);
      if (r.comparator === "atMost" || r.comparator === "includes") bad(`IP codes compare with atLeast or equals`, ["comparator"]);
    }
    if (kind === "mounting") {
      if (typeof r.value !== "string" || !["floor", "ceiling", "wall", "angled"].includes(r.value)) bad(`mounting must be floor, ceiling, wall or angled, got ${JSON.stringify(r.value)}`);
      if (r.comparator !== "includes") bad(`mounting compares with includes`, ["comparator"]);
    }
    if (kind === "boolean") {
      if (typeof r.value !== "boolean") bad(`collaborative needs true or false, got ${JSON.stringify(r.value)}`);
      if (r.comparator !== "equals") bad(`collaborative compares with equals`, ["comparator"]);
    }
  });
export type SpecRequirement = z.infer<typeof specRequirementSchema>;

/** Ranking weights (≥ 0, any scale; normalised by their sum when scoring), one per sub-score row. */
export type Weights = Record<SubScoreKey, number>;
export const weightsSchema = z.object(
  Object.fromEntries(SUB_SCORES.rows.map((r) => [r.key, nonNegative.default(r.defaultWeight)])) as Record<SubScoreKey, z.ZodDefault<typeof nonNegative>>,
);
export const DEFAULT_WEIGHTS: Weights = { ...SUB_SCORES.defaultWeights };

const toolShapes = z.array(bodyShapeSchema).max(MAX_BODY_SHAPES, `at most ${MAX_BODY_SHAPES} shapes`);

const requirementSetObject = z.object({
  name: nameText(120),
  description: z.string().max(4000).optional(),
  /** Arm base pose in the cell frame, T_C_B (row-major 4×4). */
  base: mat4,
  tool: z.object({
    /** Arm tool point → TCP (row-major 4×4). */
    tcp: mat4,
    /** Tool mass (kg). */
    mass: nonNegative,
    /** Tool CoG in the arm tool-point (flange side) frame (m). */
    cog: vec3,
    /**
     * Principal moments of inertia about the tool CoG (kg·m²), optional, about axes through the CoG
     * parallel to the x, y and z axes of the arm tool-point frame (the frame `cog` is given in).
     */
    inertia: z.tuple([nonNegative, nonNegative, nonNegative]).optional(),
    /** Collision shapes of the tool (capsules or boxes) in the arm tool-point frame, the frame of `cog`. */
    collision: toolShapes.optional(),
  }),
  payload: z.object({
    /** Payload mass (kg). */
    mass: nonNegative,
    /** Payload CoG in the TCP frame (m). */
    cog: vec3,
    /**
     * Principal moments of inertia about the payload CoG (kg·m²), optional, about axes through the
     * CoG parallel to the x, y and z axes of the TCP frame (the frame `cog` is given in).
     */
    inertia: z.tuple([nonNegative, nonNegative, nonNegative]).optional(),
    /** Collision shapes of the payload (capsules or boxes) in the TCP frame, the frame of `cog`. */
    collision: toolShapes.optional(),
  }),
  targets: z.array(targetSchema).max(500, "at most 500 targets"),
  paths: z.array(pathSchema).max(50, "at most 50 paths"),
  specs: z.array(specRequirementSchema).max(100, "at most 100 spec requirements"),
  /** The cell: obstacles and the required clearance. */
  cell: cellSchema.default({ obstacles: [], clearance: DEFAULT_CLEARANCE }),
  /** Obstacles in the earlier form (read and converted into `cell.obstacles`; never written). */
  obstacles: z.array(legacyObstacleSchema).max(100, "at most 100 obstacles").optional(),
  weights: weightsSchema.default(DEFAULT_WEIGHTS),
  /** Task sequences for the cycle time (docs/design.md#cycle-time). */
  sequences: z.array(sequenceSchema).max(20, "at most 20 sequences").optional(),
  /** Where the base may be mounted, for the placement search (docs/design.md#mount-placement); `base` stays the nominal placement. */
  mounting: mountingSchema.optional(),
});

/** Every obstacle name, the converted earlier ones included (as {@link convertLegacyObstacles} names them). */
function allObstacleNames(rs: z.output<typeof requirementSetObject>): string[] {
  const names = rs.cell.obstacles.map((o) => o.name);
  return [...names, ...convertLegacyObstacles(rs.obstacles ?? [], names).map((o) => o.name)];
}

/** The requirement set with the cross-field checks, earlier obstacles converted into `cell.obstacles`. */
export const requirementSetSchema = requirementSetObject
  .superRefine((rs, ctx) => {
    const seen = new Map<string, number>();
    rs.targets.forEach((t, i) => {
      if (seen.has(t.name)) ctx.addIssue({ code: "custom", path: ["targets", i, "name"], message: `target name "${t.name}" is used twice (rows ${seen.get(t.name)! + 1} and ${i + 1})` });
      seen.set(t.name, i);
    });
    // Path names are unique too: comments are anchored to a path by its name.
    const paths = new Map<string, number>();
    rs.paths.forEach((p, i) => {
      if (paths.has(p.name)) ctx.addIssue({ code: "custom", path: ["paths", i, "name"], message: `path name "${p.name}" is used twice (paths ${paths.get(p.name)! + 1} and ${i + 1})` });
      paths.set(p.name, i);
    });
    const obstacles = new Map<string, number>();
    rs.cell.obstacles.forEach((o, i) => {
      if (obstacles.has(o.name)) ctx.addIssue({ code: "custom", path: ["cell", "obstacles", i, "name"], message: `obstacle name "${o.name}" is used twice (rows ${obstacles.get(o.name)! + 1} and ${i + 1})` });
      else obstacles.set(o.name, i);
    });
    const known = new Set(allObstacleNames(rs));
    const checkContact = (list: string[] | undefined, path: (string | number)[], what: string) => {
      const once = new Set<string>();
      list?.forEach((name, k) => {
        if (!known.has(name)) ctx.addIssue({ code: "custom", path: [...path, k], message: `${what} names obstacle "${name}", but the cell has no obstacle of that name` });
        else if (once.has(name)) ctx.addIssue({ code: "custom", path: [...path, k], message: `${what} names obstacle "${name}" twice` });
        once.add(name);
      });
    };
    rs.targets.forEach((t, i) => checkContact(t.contact, ["targets", i, "contact"], `target "${t.name}" contact`));
    const targetNames = new Set(rs.targets.map((t) => t.name));
    const pathNames = new Set(rs.paths.map((p) => p.name));
    const sequences = new Map<string, number>();
    rs.sequences?.forEach((q, i) => {
      if (sequences.has(q.name)) ctx.addIssue({ code: "custom", path: ["sequences", i, "name"], message: `sequence name "${q.name}" is used twice (sequences ${sequences.get(q.name)! + 1} and ${i + 1})` });
      else sequences.set(q.name, i);
      q.steps.forEach((st, k) => {
        if (st.kind === "move" && !targetNames.has(st.target)) ctx.addIssue({ code: "custom", path: ["sequences", i, "steps", k, "target"], message: `sequence "${q.name}" step ${k + 1} moves to target "${st.target}", but the set has no target of that name` });
        if (st.kind === "path" && !pathNames.has(st.path)) ctx.addIssue({ code: "custom", path: ["sequences", i, "steps", k, "path"], message: `sequence "${q.name}" step ${k + 1} follows path "${st.path}", but the set has no path of that name` });
      });
    });
    rs.paths.forEach((p, i) => checkContact(p.contact, ["paths", i, "contact"], `path "${p.name}" contact`));
    if (rs.mounting) {
      const extent = cellExtent({ base: rs.base, targets: rs.targets, paths: rs.paths, obstacles: [...rs.cell.obstacles, ...convertLegacyObstacles(rs.obstacles ?? [], [])] });
      for (const [path, message] of regionOutsideCell(rs.mounting, extent)) ctx.addIssue({ code: "custom", path: ["mounting", ...path], message });
    }
  })
  .transform(({ obstacles, ...rs }) => {
    if (!obstacles || obstacles.length === 0) return rs;
    const cell: Cell = { ...rs.cell, obstacles: [...rs.cell.obstacles, ...convertLegacyObstacles(obstacles, rs.cell.obstacles.map((o) => o.name))] };
    return { ...rs, cell };
  });
export type RequirementSet = z.infer<typeof requirementSetSchema>;
/** Input type (defaults not yet applied), e.g. what a file holds. */
export type RequirementSetInput = z.input<typeof requirementSetSchema>;
