import { z } from "zod";
import { finite, labelText, nameText, nonNegative, positive, vec3, mat4 } from "./common";
import { fixed } from "../format";
import { jointToDisplay, jointUnit } from "../units";
import { armCapsuleSchema, MAX_BODY_SHAPES } from "./cell";

/**
 * Arm model: the arm file of docs/formats.md#arm-file (SI units: m, rad, kg, N·m) plus identity and
 * datasheet specs. The kinematic part ({name, convention, joints, base, tool}) is exactly the
 * interchange arm JSON the command line reads; identity and specs are optional extras.
 */
export const MAX_JOINTS = 12;

/** A collision capsule of an arm body (the points within `radius` of the segment from → to). */
export type Capsule = z.infer<typeof armCapsuleSchema>;

/** Fields every joint has, whatever the convention. */
const jointCommonShape = {
  type: z.enum(["revolute", "prismatic"], { error: "must be revolute or prismatic" }),
  /** Lower bound of q (rad or m). */
  min: finite,
  /** Upper bound of q (rad or m). */
  max: finite,
  /** Max joint speed (rad/s or m/s). */
  maxSpeed: positive.optional(),
  /**
   * Max joint acceleration (rad/s² or m/s²), used by the cycle-time model; without it the model
   * assumes one (docs/design.md#cycle-time) and marks the result an estimate.
   */
  maxAcceleration: positive.max(1e4, "must be at most 10 000 rad/s² (or m/s²)").optional(),
  /** Max joint torque (N·m) or force (N). */
  maxTorque: positive.optional(),
  /** Mass of the link moved by this joint (kg). */
  mass: nonNegative.optional(),
  /** Centre of mass of that link in this joint's frame after its transform (m). */
  com: vec3.optional(),
  /**
   * Collision radius of the link (m): without `collision`, the link's capsules are derived from
   * its kinematic description with this radius (lib/geometry/arm.ts and docs/design.md#derived-capsules say how).
   */
  radius: nonNegative.optional(),
  /** Collision capsules of the link in its frame (after this joint's transform, the frame of `com`). */
  collision: z.array(armCapsuleSchema).max(MAX_BODY_SHAPES, `at most ${MAX_BODY_SHAPES} capsules per link`).optional(),
};

/** A joint of a `dh` or `mdh` arm: one row of the DH table. */
const { type: jointType, ...jointLimitsAndMass } = jointCommonShape;

const jointSchema = z.object({
  type: jointType,
  /** DH link length a (m). In `mdh` this is a₍ᵢ₋₁₎. */
  a: finite,
  /** DH twist α (rad). In `mdh` this is α₍ᵢ₋₁₎. */
  alpha: finite,
  /** DH offset d (m); q adds to it for a prismatic joint. */
  d: finite,
  /** DH angle θ (rad); q adds to it for a revolute joint. */
  theta: finite,
  ...jointLimitsAndMass,
});
export type JointSpec = z.infer<typeof jointSchema>;

/** Shortest joint axis accepted before normalisation (a zero axis has no direction). */
export const MIN_AXIS_LENGTH = 1e-9;

/**
 * Origin of a chain joint (URDF semantics): the fixed transform from the previous link's frame to
 * the joint frame, T(origin) = Trans(xyz) · Rz(yaw) · Ry(pitch) · Rx(roll), rpy = [roll, pitch, yaw].
 */
const originSchema = z.object({
  /** Translation (m) in the previous link's frame. */
  xyz: vec3,
  /** Roll, pitch, yaw (rad) about the fixed axes x, y, z. */
  rpy: vec3,
});
export type JointOrigin = z.infer<typeof originSchema>;

/**
 * A joint of a `chain` arm (general joint chain, as in the open URDF format): its transform is
 * T(origin) · Rot(axis, q) for a revolute joint and T(origin) · Trans(axis · q) for a prismatic
 * one; the link frame after the joint (the frame `com` is given in) is that result.
 */
const chainJointSchema = z.object({
  type: jointType,
  origin: originSchema,
  /** Joint axis in the joint frame (any length > 0; normalised by the kinematics). */
  axis: vec3.refine((v) => Math.hypot(v[0], v[1], v[2]) >= MIN_AXIS_LENGTH, "must not be zero: the axis needs a direction"),
  ...jointLimitsAndMass,
  /**
   * Inertia tensor of the link about its centre of mass, axes of the link frame (kg·m²):
   * [ixx, iyy, izz, ixy, ixz, iyz]. Kept from imported files for later use; not used by the
   * analysis yet.
   */
  inertia: z.tuple([finite, finite, finite, finite, finite, finite]).optional(),
});
export type ChainJointSpec = z.infer<typeof chainJointSchema>;

/** Where an arm description came from when it was imported from a file. */
const armSourceSchema = z.object({
  format: z.enum(["urdf"], { error: "must be urdf" }),
  /** File name as given when importing (no directories). */
  file: z.string().trim().min(1, "must not be empty").max(255, "must be at most 255 characters"),
  /** SHA-256 of the file's bytes, lowercase hex. */
  sha256: z.string().regex(/^[0-9a-f]{64}$/, "must be 64 lowercase hex digits (SHA-256)"),
  /** Base and tip links of the chain taken from the file. */
  baseLink: z.string().max(255).optional(),
  tipLink: z.string().max(255).optional(),
});
export type ArmSource = z.infer<typeof armSourceSchema>;

export const MOUNTINGS = ["floor", "ceiling", "wall", "angled"] as const;
export type Mounting = (typeof MOUNTINGS)[number];

/** IEC 60529 code as written on datasheets: "IP54", "IP6X", "IPX7", "IP67" (optional letters ignored). */
const ipCodeSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^IP[0-6X][0-9X][A-DHMSW]{0,2}$/, "must be an IP code such as IP54, IP67 or IPX4 (IEC 60529)")
  .refine((s) => !(s[2] === "X" && s[3] === "X"), "IPXX states nothing; leave the field empty instead");

/** Allowable load on one wrist axis, from the datasheet's load diagram. */
const wristAllowableSchema = z.object({
  /** 1-based joint number (e.g. 4, 5, 6). */
  joint: z.number().int().min(1).max(MAX_JOINTS),
  /** Allowable moment about that axis (N·m). */
  moment: positive.optional(),
  /** Allowable moment of inertia about that axis (kg·m²). */
  inertia: positive.optional(),
});

export const armSpecsSchema = z.object({
  /** Rated payload (kg). */
  ratedPayload: nonNegative.optional(),
  /** Datasheet reach (m). */
  reach: positive.optional(),
  /** Pose repeatability RP per ISO 9283 (m). */
  repeatability: positive.optional(),
  /** Arm mass (kg). */
  armMass: positive.optional(),
  ipCode: ipCodeSchema.optional(),
  mounting: z.array(z.enum(MOUNTINGS)).max(MOUNTINGS.length).optional(),
  wristAllowables: z.array(wristAllowableSchema).max(MAX_JOINTS).optional(),
  collaborative: z.boolean().optional(),
  price: nonNegative.optional(),
  /** ISO 4217 currency code. */
  currency: z.string().regex(/^[A-Z]{3}$/, "must be a 3-letter currency code such as EUR").optional(),
  /** Lead time (weeks). */
  leadTimeWeeks: nonNegative.optional(),
});
export type ArmSpecs = z.infer<typeof armSpecsSchema>;

/** Identity fields (first in a stored document, as before the kinematics). */
const armIdentityShape = {
  name: nameText(120),
  maker: labelText(120).optional(),
  modelCode: labelText(60).optional(),
  description: z.string().max(4000).optional(),
};

/** Fields after the joints. */
const armCommonShape = {
  /** Cell-independent base transform: arm base → first joint frame (row-major 4×4). */
  base: mat4.optional(),
  /** Flange → tool point (row-major 4×4). */
  tool: mat4.optional(),
  specs: armSpecsSchema.optional(),
  /** The file the arm was imported from, if any. */
  source: armSourceSchema.optional(),
  /**
   * Collision capsules of the base (body "base", link number 0) in the arm's base frame: the frame
   * the requirement set's `base` places, before this file's own `base` transform.
   */
  baseCollision: z.array(armCapsuleSchema).max(MAX_BODY_SHAPES, `at most ${MAX_BODY_SHAPES} capsules`).optional(),
  /** Pairs of link numbers (0 = base, 1 … n) never checked against each other. */
  ignoredPairs: z.array(z.tuple([z.number().int("must be a whole link number").min(0, "must be ≥ 0"), z.number().int("must be a whole link number").min(0, "must be ≥ 0")])).max(100, "at most 100 pairs").optional(),
};

const jointList = <J extends z.ZodType>(joint: J) =>
  z
    .array(joint)
    .min(1, "an arm needs at least 1 joint")
    .max(MAX_JOINTS, `an arm has at most ${MAX_JOINTS} joints`);

/** An arm described by a DH table (standard `dh` or modified `mdh`). */
const dhArmObject = z.object({
  ...armIdentityShape,
  convention: z.enum(["dh", "mdh"]),
  joints: jointList(jointSchema),
  ...armCommonShape,
});

/** An arm described as a general joint chain (origin + axis per joint). */
const chainArmObject = z.object({
  ...armIdentityShape,
  convention: z.literal("chain"),
  joints: jointList(chainJointSchema),
  ...armCommonShape,
});

const armObject = z.discriminatedUnion("convention", [dhArmObject, chainArmObject], { error: "must be dh, mdh or chain" });

/** Cross-field checks; messages name the joint, the value and the reason in display units. */
export const armSchema = armObject.superRefine((arm, ctx) => {
  arm.joints.forEach((j, i) => {
    if (j.min > j.max) {
      const u = jointUnit(j.type);
      ctx.addIssue({
        code: "custom",
        path: ["joints", i, "max"],
        message: `joint ${i + 1} max (${fixed(jointToDisplay(j.type, j.max), 1)}${u}) is below min (${fixed(jointToDisplay(j.type, j.min), 1)}${u})`,
      });
    }
    if (j.type === "revolute" && j.max - j.min > 4 * Math.PI + 1e-9) {
      ctx.addIssue({
        code: "custom",
        path: ["joints", i, "max"],
        message: `joint ${i + 1} range (${fixed(jointToDisplay(j.type, j.max - j.min), 0)}°) exceeds 720°`,
      });
    }
  });
  const n = arm.joints.length;
  arm.ignoredPairs?.forEach(([a, b], i) => {
    for (const [k, v] of [[0, a], [1, b]] as const) {
      if (v > n) ctx.addIssue({ code: "custom", path: ["ignoredPairs", i, k], message: `ignored pair ${i + 1} names link ${v}, but the arm has links 0 (base) to ${n}` });
    }
    if (a === b) ctx.addIssue({ code: "custom", path: ["ignoredPairs", i, 1], message: `ignored pair ${i + 1} names link ${a} twice` });
  });
  arm.specs?.wristAllowables?.forEach((w, i) => {
    if (w.joint > arm.joints.length) {
      ctx.addIssue({
        code: "custom",
        path: ["specs", "wristAllowables", i, "joint"],
        message: `wrist allowable names joint ${w.joint}, but the arm has ${arm.joints.length} joints`,
      });
    }
  });
});
export type ArmDocument = z.infer<typeof armSchema>;
export type DhArmDocument = Extract<ArmDocument, { convention: "dh" | "mdh" }>;
type ChainArmDocument = Extract<ArmDocument, { convention: "chain" }>;
export type Convention = ArmDocument["convention"];

type KinematicKeys = "name" | "convention" | "joints" | "base" | "tool";
/** The kinematic part the analysis and the command line need (either kind of arm). */
export type ArmKinematics = DhArmKinematics | ChainArmKinematics;
export type DhArmKinematics = Pick<DhArmDocument, KinematicKeys>;
export type ChainArmKinematics = Pick<ChainArmDocument, KinematicKeys>;

/** The kinematic part of an arm document (name, convention, joints, base, tool), as one object. */
export function kinematicsOf(arm: ArmDocument): ArmKinematics {
  return { name: arm.name, convention: arm.convention, joints: arm.joints, base: arm.base, tool: arm.tool } as ArmKinematics;
}
