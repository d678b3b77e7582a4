import { z } from "zod";
import { finite, labelText, nameText, nonNegative, positive, vec3, mat4 } from "./common";
import { fmt, jointToDisplay, jointUnit } from "../units";

/**
 * Arm model: the interchange format of DESIGN.md (SI units: m, rad, kg, N·m) plus identity and
 * datasheet specs. The kinematic part ({name, convention, joints, base, tool}) is exactly the
 * interchange arm JSON the command line reads; identity and specs are optional extras.
 */
export const MAX_JOINTS = 12;

export const jointSchema = z.object({
  type: z.enum(["revolute", "prismatic"], { error: "must be revolute or prismatic" }),
  /** DH link length a (m). In `mdh` this is a₍ᵢ₋₁₎. */
  a: finite,
  /** DH twist α (rad). In `mdh` this is α₍ᵢ₋₁₎. */
  alpha: finite,
  /** DH offset d (m); q adds to it for a prismatic joint. */
  d: finite,
  /** DH angle θ (rad); q adds to it for a revolute joint. */
  theta: finite,
  /** Lower bound of q (rad or m). */
  min: finite,
  /** Upper bound of q (rad or m). */
  max: finite,
  /** Max joint speed (rad/s or m/s). */
  maxSpeed: positive.optional(),
  /** Max joint torque (N·m) or force (N). */
  maxTorque: positive.optional(),
  /** Mass of the link moved by this joint (kg). */
  mass: nonNegative.optional(),
  /** Centre of mass of that link in this joint's frame after its transform (m). */
  com: vec3.optional(),
  /** Collision radius of the link (m). */
  radius: nonNegative.optional(),
});
export type JointSpec = z.infer<typeof jointSchema>;

export const MOUNTINGS = ["floor", "ceiling", "wall", "angled"] as const;
export type Mounting = (typeof MOUNTINGS)[number];

/** IEC 60529 code as written on datasheets: "IP54", "IP6X", "IPX7", "IP67" (optional letters ignored). */
export const ipCodeSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^IP[0-6X][0-9X][A-DHMSW]{0,2}$/, "must be an IP code such as IP54, IP67 or IPX4 (IEC 60529)")
  .refine((s) => !(s[2] === "X" && s[3] === "X"), "IPXX states nothing; leave the field empty instead");

/** Allowable load on one wrist axis, from the datasheet's load diagram. */
export const wristAllowableSchema = z.object({
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

const armObject = z.object({
  name: nameText(120),
  maker: labelText(120).optional(),
  modelCode: labelText(60).optional(),
  description: z.string().max(4000).optional(),
  convention: z.enum(["dh", "mdh"], { error: "must be dh or mdh" }),
  joints: z
    .array(jointSchema)
    .min(1, "an arm needs at least 1 joint")
    .max(MAX_JOINTS, `an arm has at most ${MAX_JOINTS} joints`),
  /** Cell-independent base transform: arm base → first DH frame (row-major 4×4). */
  base: mat4.optional(),
  /** Flange → tool point (row-major 4×4). */
  tool: mat4.optional(),
  specs: armSpecsSchema.optional(),
});

/** Cross-field checks; messages name the joint, the value and the reason in display units. */
export const armSchema = armObject.superRefine((arm, ctx) => {
  arm.joints.forEach((j, i) => {
    if (j.min > j.max) {
      const u = jointUnit(j.type);
      ctx.addIssue({
        code: "custom",
        path: ["joints", i, "max"],
        message: `joint ${i + 1} max (${fmt(jointToDisplay(j.type, j.max), 1)}${u}) is below min (${fmt(jointToDisplay(j.type, j.min), 1)}${u})`,
      });
    }
    if (j.type === "revolute" && j.max - j.min > 4 * Math.PI + 1e-9) {
      ctx.addIssue({
        code: "custom",
        path: ["joints", i, "max"],
        message: `joint ${i + 1} range (${fmt(jointToDisplay(j.type, j.max - j.min), 0)}°) exceeds 720°`,
      });
    }
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

/** The kinematic part the analysis and the command line need. */
export type ArmKinematics = Pick<ArmDocument, "name" | "convention" | "joints" | "base" | "tool">;
