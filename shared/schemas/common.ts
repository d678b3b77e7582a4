import { z } from "zod";
import { cleanName } from "../text";

/** A finite number (rejects NaN, ±Infinity and numeric strings). */
export const finite = z.number({ error: "must be a number" }).finite("must be a finite number");
export const nonNegative = finite.min(0, "must be ≥ 0");
export const positive = finite.gt(0, "must be > 0");
export const vec3 = z.tuple([finite, finite, finite]);
/** A row-major 4×4 homogeneous transform (16 numbers); last row must be 0 0 0 1. */
export const mat4 = z
  .array(finite)
  .length(16, "must hold 16 numbers (row-major 4×4)")
  .superRefine((m, ctx) => {
    const last = [m[12], m[13], m[14], m[15]];
    if (Math.abs(last[0]) > 1e-9 || Math.abs(last[1]) > 1e-9 || Math.abs(last[2]) > 1e-9 || Math.abs(last[3] - 1) > 1e-9) {
      ctx.addIssue({ code: "custom", message: `last row must be 0 0 0 1, got ${last.join(" ")}` });
    }
    // Rotation block must be orthonormal with determinant +1 (tolerance 1e-6).
    const r = [m[0], m[1], m[2], m[4], m[5], m[6], m[8], m[9], m[10]];
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let dot = 0;
        for (let k = 0; k < 3; k++) dot += r[i * 3 + k] * r[j * 3 + k];
        if (Math.abs(dot - (i === j ? 1 : 0)) > 1e-6) {
          ctx.addIssue({ code: "custom", message: "rotation part is not orthonormal" });
          return;
        }
      }
    }
    const det =
      r[0] * (r[4] * r[8] - r[5] * r[7]) - r[1] * (r[3] * r[8] - r[5] * r[6]) + r[2] * (r[3] * r[7] - r[4] * r[6]);
    if (det < 0) ctx.addIssue({ code: "custom", message: "rotation part is a reflection (determinant −1)" });
  });

/**
 * A name shown to others, cleaned by cleanName (no control or bidirectional-override
 * characters), then 1 to `max` characters.
 */
export const nameText = (max: number) =>
  z
    .string({ error: "must be text" })
    .transform(cleanName)
    .pipe(z.string().min(1, "must not be empty").max(max, `must be at most ${max} characters`));

/** Like nameText, but may be empty (optional labels and maker names). */
export const labelText = (max: number) =>
  z.string({ error: "must be text" }).transform(cleanName).pipe(z.string().max(max, `must be at most ${max} characters`));

/** One field-level problem, as returned by the API and shown by forms. */
export interface FieldError {
  /** Dotted path, e.g. "joints.2.max". */
  path: string;
  /** Human-readable reason naming the value, e.g. "joint 3 max (−10°) is below min (20°)". */
  message: string;
}

/** Converts zod issues into FieldErrors with dotted paths. */
export function toFieldErrors(error: z.ZodError): FieldError[] {
  return error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message }));
}
