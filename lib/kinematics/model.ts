/**
 * `createModel`: compiles an interchange arm (DH table or general joint chain) into an immutable
 * `ArmModel` once, with the per-joint constants the hot paths need (cos α, sin α, joint origins
 * and unit axes, joint-type flags).
 */
import { writeRpyPose } from "@/shared/pose";
import { MIN_AXIS_LENGTH } from "@/shared/schemas/arm";
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

function readVec3(v: unknown, field: string): [number, number, number] {
  if (!Array.isArray(v) && !(v instanceof Float64Array)) fail(field, "expected 3 numbers");
  const a = v as ArrayLike<unknown>;
  if (a.length !== 3) fail(field, `expected 3 numbers, got ${a.length}`);
  for (let k = 0; k < 3; k++) {
    if (typeof a[k] !== "number" || !Number.isFinite(a[k])) fail(`${field}.${k}`, "must be a finite number");
  }
  return [a[0] as number, a[1] as number, a[2] as number];
}

/**
 * Validates `spec` and builds the frozen model.
 *
 * - `dh`: link i = Rz(θᵢ + qᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ) for a revolute joint (q adds to d for a prismatic one).
 * - `mdh`: link i = Rx(α₍ᵢ₋₁₎)·Tx(a₍ᵢ₋₁₎)·Rz(θᵢ)·Tz(dᵢ), row i holding a₍ᵢ₋₁₎, α₍ᵢ₋₁₎, dᵢ, θᵢ.
 * - `chain`: link i = T(originᵢ)·Rot(uᵢ, qᵢ) (revolute) or T(originᵢ)·Trans(uᵢ·qᵢ) (prismatic), with
 *   T(origin) = Trans(xyz)·Rz(yaw)·Ry(pitch)·Rx(roll) and uᵢ the joint `axis` normalised here
 *   (the URDF joint: origin in the parent link's frame, axis in the joint frame).
 * - Flange = base·link₁···linkₙ; tool point = flange·tool.
 *
 * @throws RangeError naming the field when the spec is malformed (no joints, a non-finite
 *   number, min > max, a zero axis, a base/tool that is not a rigid 4×4). Allocates (once per arm).
 */
export function createModel(spec: ArmKinematics): ArmModel {
  if (spec === null || typeof spec !== "object") fail("arm", "must be an object");
  const convention = spec.convention;
  if (convention !== "dh" && convention !== "mdh" && convention !== "chain") fail("convention", "must be dh, mdh or chain");
  const joints = spec.joints as readonly unknown[];
  if (!Array.isArray(joints) || joints.length === 0) fail("joints", "an arm needs at least 1 joint");
  const n = joints.length;
  const a = new Float64Array(n), alpha = new Float64Array(n), d = new Float64Array(n), theta = new Float64Array(n);
  const cosAlpha = new Float64Array(n).fill(1), sinAlpha = new Float64Array(n);
  const origin = new Float64Array(16 * n), axis = new Float64Array(3 * n);
  const originCross = new Float64Array(9 * n), originOuter = new Float64Array(9 * n);
  const lower = new Float64Array(n), upper = new Float64Array(n);
  const maxSpeed = new Float64Array(n).fill(NaN), maxAcceleration = new Float64Array(n).fill(NaN), maxTorque = new Float64Array(n).fill(NaN);
  const mass = new Float64Array(n), com = new Float64Array(3 * n), radius = new Float64Array(n).fill(NaN);
  const prismatic = new Uint8Array(n);
  const types: JointType[] = [];
  let lengthScale = 0;
  let reach = 0;
  for (let i = 0; i < n; i++) {
    const j = joints[i] as Record<string, unknown> | null;
    const at = `joints.${i}`;
    if (j === null || typeof j !== "object") fail(at, "must be an object");
    if (j.type !== "revolute" && j.type !== "prismatic") fail(`${at}.type`, "must be revolute or prismatic");
    const type = j.type;
    const geometric = convention === "chain" ? [] : (["a", "alpha", "d", "theta"] as const);
    for (const key of [...geometric, "min", "max"] as const) {
      const v = j[key];
      if (typeof v !== "number" || !Number.isFinite(v)) fail(`${at}.${key}`, "must be a finite number");
    }
    const min = j.min as number, max = j.max as number;
    if (min > max) fail(`${at}.max`, `below min (${min} > ${max})`);
    if (type === "revolute" && max - min > 2 * TWO_PI + 1e-9) fail(`${at}.max`, "revolute range exceeds 720°");
    types.push(type);
    prismatic[i] = type === "prismatic" ? 1 : 0;
    const travel = type === "prismatic" ? Math.max(Math.abs(min), Math.abs(max)) : 0;
    const o = origin.subarray(16 * i, 16 * i + 16);
    if (convention === "chain") {
      const og = j.origin as { xyz?: unknown; rpy?: unknown } | null | undefined;
      if (og === null || typeof og !== "object") fail(`${at}.origin`, "must be an object {xyz, rpy}");
      const xyz = readVec3(og.xyz, `${at}.origin.xyz`);
      const rpy = readVec3(og.rpy, `${at}.origin.rpy`);
      const u = readVec3(j.axis, `${at}.axis`);
      const len = Math.hypot(u[0], u[1], u[2]);
      if (!(len >= MIN_AXIS_LENGTH)) fail(`${at}.axis`, "must not be zero: the axis needs a direction");
      axis[3 * i] = u[0] / len; axis[3 * i + 1] = u[1] / len; axis[3 * i + 2] = u[2] / len;
      writeRpyPose(o, xyz, rpy);
      const ux = axis[3 * i], uy = axis[3 * i + 1], uz = axis[3 * i + 2];
      const K = [0, -uz, uy, uz, 0, -ux, -uy, ux, 0];
      const U = [ux * ux, ux * uy, ux * uz, uy * ux, uy * uy, uy * uz, uz * ux, uz * uy, uz * uz];
      for (let r = 0; r < 3; r++) {
        for (let c = 0; c < 3; c++) {
          let k = 0, u = 0;
          for (let m = 0; m < 3; m++) {
            k += o[4 * r + m] * K[3 * m + c];
            u += o[4 * r + m] * U[3 * m + c];
          }
          originCross[9 * i + 3 * r + c] = k;
          originOuter[9 * i + 3 * r + c] = u;
        }
      }
      const offset = Math.hypot(xyz[0], xyz[1], xyz[2]);
      lengthScale += offset + travel;
      reach += offset + travel;
    } else {
      const ja = j.a as number, jal = j.alpha as number, jd = j.d as number;
      a[i] = ja; alpha[i] = jal; d[i] = jd; theta[i] = j.theta as number;
      cosAlpha[i] = Math.cos(jal); sinAlpha[i] = Math.sin(jal);
      o[0] = o[5] = o[10] = o[15] = 1;
      axis[3 * i + 2] = 1;
      lengthScale += Math.abs(ja) + Math.abs(jd) + travel;
      const dmax = type === "prismatic" ? Math.max(Math.abs(jd + min), Math.abs(jd + max)) : Math.abs(jd);
      reach += Math.hypot(ja, dmax);
    }
    lower[i] = min; upper[i] = max;
    if (j.maxSpeed !== undefined) maxSpeed[i] = j.maxSpeed as number;
    if (j.maxAcceleration !== undefined) maxAcceleration[i] = j.maxAcceleration as number;
    if (j.maxTorque !== undefined) maxTorque[i] = j.maxTorque as number;
    if (j.mass !== undefined) mass[i] = j.mass as number;
    if (j.com !== undefined) {
      const c = readVec3(j.com, `${at}.com`);
      com[3 * i] = c[0]; com[3 * i + 1] = c[1]; com[3 * i + 2] = c[2];
    }
    if (j.radius !== undefined) radius[i] = j.radius as number;
  }
  const base = readTransform(spec.base, "base");
  const tool = readTransform(spec.tool, "tool");
  const toolOffset = Math.hypot(tool[3], tool[7], tool[11]);
  lengthScale += toolOffset;
  reach += toolOffset;
  const model: ArmModel = {
    name: typeof spec.name === "string" ? spec.name : "",
    n,
    convention,
    types: Object.freeze(types),
    prismatic,
    a, alpha, d, theta, cosAlpha, sinAlpha,
    origin, axis, originCross, originOuter,
    lower, upper, maxSpeed, maxAcceleration, maxTorque, mass, com, radius,
    base, tool,
    axisFrameOffset: convention === "dh" ? 0 : 1,
    lengthScale: lengthScale > 0 ? lengthScale : 1,
    reach,
  };
  return Object.freeze(model);
}
