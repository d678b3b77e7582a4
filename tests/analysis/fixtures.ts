/** Loader for the numpy/scipy reference values (tests/reference/analysis_reference.py). */
import { readFileSync } from "node:fs";
import path from "node:path";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export const REF: any = JSON.parse(readFileSync(path.resolve(__dirname, "../reference/fixtures/analysis_reference.json"), "utf8"));

/** NaN where the fixture has null (absent torque limit). */
export function nanOrNumber(xs: (number | null)[]): Float64Array {
  return Float64Array.from(xs, (x) => (x === null ? NaN : x));
}

/** numpy SVD references of the axis-target orientation factor (tests/reference/axis_dexterity_reference.py). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export const AXIS_REF: any = JSON.parse(readFileSync(path.resolve(__dirname, "../reference/fixtures/axis_dexterity_reference.json"), "utf8"));

/** A row-major 4×4 pose with rotation R (row-major 3×3) and origin p. */
export function poseOf(R: ArrayLike<number>, p: ArrayLike<number> = [0, 0, 0]): Float64Array {
  return Float64Array.from([R[0], R[1], R[2], p[0], R[3], R[4], R[5], p[1], R[6], R[7], R[8], p[2], 0, 0, 0, 1]);
}
