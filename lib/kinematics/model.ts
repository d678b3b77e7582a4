/**
 * `createModel`: compiles an interchange arm (DESIGN.md) into an immutable `ArmModel` once, with
 * the per-joint constants the hot paths need (cos α, sin α, joint-type flags).
 */
import type { ArmKinematics, ArmModel, JointType } from "./types";

const TWO_PI = 2 * Math.PI;

function fail(field: string, reason: string): never {
  throw new RangeError(`${field}: ${reason}`);
}

function readTransform(values: ArrayLike<number> | undefined, field: string): Float64Array {
  const m = new Float64Array(16);
  if (values === undefined) {
    m[0] = m[5] = m[10] = m[15] = 1;
    return m;
  }
  if (values.length !== 16) fail(field, `expected 16 numbers (row-major 4×4), got ${values.length}`);
  for (let i = 0; i < 16; i++) {
    const v = values[i];
    if (typeof v !== "number" || !Number.isFinite(v)) fail(`${field}.${i}`, "must be a finite number");
    m[i] = v;
  }
  if (Math.abs(m[12]) > 1e-9 || Math.abs(m[13]) > 1e-9 || Math.abs(m[14]) > 1e-9 || Math.abs(m[15] - 1) > 1e-9) {
    fail(field, "last row must be 0 0 0 1");
  }
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      const dot = m[4 * i] * m[4 * j] + m[4 * i + 1] * m[4 * j + 1] + m[4 * i + 2] * m[4 * j + 2];
      if (Math.abs(dot - (i === j ? 1 : 0)) > 1e-6) fail(field, "rotation part is not orthonormal");
    }
  }
  m[12] = 0; m[13] = 0; m[14] = 0; m[15] = 1;
  return m;
}

/**
 * Validates `spec` and builds the frozen model.
 *
 * - `dh`: link i = Rz(θᵢ + qᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ) for a revolute joint (q adds to d for a prismatic one).
 * - `mdh`: link i = Rx(α₍ᵢ₋₁₎)·Tx(a₍ᵢ₋₁₎)·Rz(θᵢ)·Tz(dᵢ), row i holding a₍ᵢ₋₁₎, α₍ᵢ₋₁₎, dᵢ, θᵢ.
 * - Flange = base·link₁···linkₙ; tool point = flange·tool.
 *
 * @throws RangeError naming the field when the spec is malformed (no joints, a non-finite
 *   number, min > max, a base/tool that is not a rigid 4×4). Allocates (once per arm).
 */
export function createModel(spec: ArmKinematics): ArmModel {
  if (spec === null || typeof spec !== "object") fail("arm", "must be an object");
  if (spec.convention !== "dh" && spec.convention !== "mdh") fail("convention", "must be dh or mdh");
  const joints = spec.joints;
  if (!Array.isArray(joints) || joints.length === 0) fail("joints", "an arm needs at least 1 joint");
  const n = joints.length;
  const a = new Float64Array(n), alpha = new Float64Array(n), d = new Float64Array(n), theta = new Float64Array(n);
  const cosAlpha = new Float64Array(n), sinAlpha = new Float64Array(n);
  const lower = new Float64Array(n), upper = new Float64Array(n);
  const maxSpeed = new Float64Array(n).fill(NaN), maxTorque = new Float64Array(n).fill(NaN);
  const mass = new Float64Array(n), com = new Float64Array(3 * n), radius = new Float64Array(n).fill(NaN);
  const prismatic = new Uint8Array(n);
  const types: JointType[] = [];
  let lengthScale = 0;
  for (let i = 0; i < n; i++) {
    const j = joints[i];
    const at = `joints.${i}`;
    if (j === null || typeof j !== "object") fail(at, "must be an object");
    if (j.type !== "revolute" && j.type !== "prismatic") fail(`${at}.type`, "must be revolute or prismatic");
    for (const key of ["a", "alpha", "d", "theta", "min", "max"] as const) {
      const v = j[key];
      if (typeof v !== "number" || !Number.isFinite(v)) fail(`${at}.${key}`, "must be a finite number");
    }
    if (j.min > j.max) fail(`${at}.max`, `below min (${j.min} > ${j.max})`);
    if (j.type === "revolute" && j.max - j.min > 2 * TWO_PI + 1e-9) fail(`${at}.max`, "revolute range exceeds 720°");
    types.push(j.type);
    prismatic[i] = j.type === "prismatic" ? 1 : 0;
    a[i] = j.a; alpha[i] = j.alpha; d[i] = j.d; theta[i] = j.theta;
    cosAlpha[i] = Math.cos(j.alpha); sinAlpha[i] = Math.sin(j.alpha);
    lower[i] = j.min; upper[i] = j.max;
    if (j.maxSpeed !== undefined) maxSpeed[i] = j.maxSpeed;
    if (j.maxTorque !== undefined) maxTorque[i] = j.maxTorque;
    if (j.mass !== undefined) mass[i] = j.mass;
    if (j.com !== undefined) {
      if (j.com.length !== 3) fail(`${at}.com`, `expected 3 numbers, got ${j.com.length}`);
      com[3 * i] = j.com[0]; com[3 * i + 1] = j.com[1]; com[3 * i + 2] = j.com[2];
    }
    if (j.radius !== undefined) radius[i] = j.radius;
    lengthScale += Math.abs(j.a) + Math.abs(j.d) + (j.type === "prismatic" ? Math.max(Math.abs(j.min), Math.abs(j.max)) : 0);
  }
  const base = readTransform(spec.base, "base");
  const tool = readTransform(spec.tool, "tool");
  lengthScale += Math.hypot(tool[3], tool[7], tool[11]);
  const model: ArmModel = {
    name: typeof spec.name === "string" ? spec.name : "",
    n,
    convention: spec.convention,
    types: Object.freeze(types),
    prismatic,
    a, alpha, d, theta, cosAlpha, sinAlpha,
    lower, upper, maxSpeed, maxTorque, mass, com, radius,
    base, tool,
    axisFrameOffset: spec.convention === "dh" ? 0 : 1,
    lengthScale: lengthScale > 0 ? lengthScale : 1,
  };
  return Object.freeze(model);
}
