/** Loader for the numpy/scipy reference values (tests/reference/analysis_reference.py). */
import { readFileSync } from "node:fs";
import path from "node:path";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export const REF: any = JSON.parse(readFileSync(path.resolve(__dirname, "../reference/fixtures/analysis_reference.json"), "utf8"));

/** NaN where the fixture has null (absent torque limit). */
export function nanOrNumber(xs: (number | null)[]): Float64Array {
  return Float64Array.from(xs, (x) => (x === null ? NaN : x));
}
