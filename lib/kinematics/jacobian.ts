/**
 * Geometric Jacobians (Craig, "Introduction to Robotics", ch. 5; Spong, Hutchinson & Vidyasagar,
 * "Robot Modeling and Control", §4.6): column j is [zⱼ × (p − oⱼ); zⱼ] for a revolute joint and
 * [zⱼ; 0] for a prismatic one, where zⱼ and oⱼ are joint j's axis direction and a point on it
 * (world frame) and p is the reference point. For DH tables zⱼ is a frame's z-axis; for a chain
 * it is the joint's unit axis rotated into the world by the frame after the joint.
 */
import type { ArmData, ArmModel } from "./types";
import { checkArgs } from "./data";
import { forwardKinematicsUnchecked } from "./forward";

/**
 * Writes the 6×`n` geometric Jacobian of the world point (px, py, pz), moved rigidly by joints
 * 1..`upTo`, into `out` (row-major 6×n; columns beyond `upTo` zero). Needs `data.frames` from a
 * forward-kinematics call at the same q. Internal hot path: no checks, no allocation.
 */
export function jacobianAtWorldPoint(
  model: ArmModel,
  data: ArmData,
  px: number,
  py: number,
  pz: number,
  upTo: number,
  out: Float64Array,
): Float64Array {
  const n = model.n, f = data.frames, off = model.axisFrameOffset, prismatic = model.prismatic;
  const chain = model.convention === "chain", U = model.axis;
  for (let j = 0; j < n; j++) {
    if (j >= upTo) {
      out[j] = 0; out[n + j] = 0; out[2 * n + j] = 0; out[3 * n + j] = 0; out[4 * n + j] = 0; out[5 * n + j] = 0;
      continue;
    }
    const b = 16 * (j + off);
    let zx = f[b + 2], zy = f[b + 6], zz = f[b + 10];
    if (chain) {
      // The axis is fixed in the frame after the joint: world axis = R_frame · u.
      const ux = U[3 * j], uy = U[3 * j + 1], uz = U[3 * j + 2];
      zx = f[b] * ux + f[b + 1] * uy + f[b + 2] * uz;
      zy = f[b + 4] * ux + f[b + 5] * uy + f[b + 6] * uz;
      zz = f[b + 8] * ux + f[b + 9] * uy + f[b + 10] * uz;
    }
    if (prismatic[j] === 1) {
      out[j] = zx; out[n + j] = zy; out[2 * n + j] = zz;
      out[3 * n + j] = 0; out[4 * n + j] = 0; out[5 * n + j] = 0;
    } else {
      const rx = px - f[b + 3], ry = py - f[b + 7], rz = pz - f[b + 11];
      out[j] = zy * rz - zz * ry;
      out[n + j] = zz * rx - zx * rz;
      out[2 * n + j] = zx * ry - zy * rx;
      out[3 * n + j] = zx; out[4 * n + j] = zy; out[5 * n + j] = zz;
    }
  }
  return out;
}

/**
 * Joint `joint` (1-based) in the world frame after a forward-kinematics call: writes the unit axis
 * direction to out[0..2] and a point on the axis (m) to out[3..5] (the origin of the frame that
 * holds the axis: frame joint−1 for `dh`, frame joint for `mdh` and `chain`). Returns `out`.
 * Does not allocate.
 *
 * @throws RangeError on a bad joint number or a short `out`.
 */
export function jointAxisWorld(model: ArmModel, data: ArmData, joint: number, out: Float64Array | number[]): Float64Array | number[] {
  if (data.model !== model) throw new RangeError("data: was created for a different model (use createData(model))");
  if (!Number.isInteger(joint) || joint < 1 || joint > model.n) throw new RangeError(`joint: out of range, expected 1..${model.n}, got ${joint}`);
  if (out.length < 6) throw new RangeError(`out: wrong size, expected 6 numbers, got ${out.length}`);
  const f = data.frames, j = joint - 1, b = 16 * (j + model.axisFrameOffset), U = model.axis;
  const ux = U[3 * j], uy = U[3 * j + 1], uz = U[3 * j + 2];
  out[0] = f[b] * ux + f[b + 1] * uy + f[b + 2] * uz;
  out[1] = f[b + 4] * ux + f[b + 5] * uy + f[b + 6] * uz;
  out[2] = f[b + 8] * ux + f[b + 9] * uy + f[b + 10] * uz;
  out[3] = f[b + 3]; out[4] = f[b + 7]; out[5] = f[b + 11];
  return out;
}

function checkOut(model: ArmModel, out: Float64Array): void {
  if (!(out instanceof Float64Array) || out.length < 6 * model.n) {
    throw new RangeError(`out: wrong size, expected a Float64Array of ${6 * model.n}, got ${out?.length}`);
  }
}

/**
 * Geometric Jacobian (6×n, row-major, rows vx vy vz wx wy wz, world frame) of the tool point, or of
 * the point `pointInTool` (m, in the TOOL frame) fixed to the last link. Runs forward kinematics
 * at q first, so `data.frames`, `data.flange`, `data.toolPose` are written too. Writes and returns
 * `out` (zeroed where needed by this function). Does not allocate.
 *
 * @throws RangeError on a wrong q length, a foreign `data`, or a short `out`.
 */
export function computeJacobian(
  model: ArmModel,
  data: ArmData,
  q: ArrayLike<number>,
  out: Float64Array,
  pointInTool?: ArrayLike<number>,
): Float64Array {
  checkArgs(model, data, q);
  checkOut(model, out);
  forwardKinematicsUnchecked(model, data, q);
  const t = data.toolPose;
  let px = t[3], py = t[7], pz = t[11];
  if (pointInTool !== undefined) {
    if (pointInTool.length !== 3) throw new RangeError(`pointInTool: wrong size, expected 3, got ${pointInTool.length}`);
    const x = pointInTool[0], y = pointInTool[1], z = pointInTool[2];
    px = t[0] * x + t[1] * y + t[2] * z + t[3];
    py = t[4] * x + t[5] * y + t[6] * z + t[7];
    pz = t[8] * x + t[9] * y + t[10] * z + t[11];
  }
  return jacobianAtWorldPoint(model, data, px, py, pz, model.n, out);
}

/**
 * Geometric Jacobian (6×n, as `computeJacobian`) of the point `pointInLink` (m) fixed to link
 * `link` (1-based; coordinates in frame `link`, i.e. after joint `link`'s transform — the frame
 * `com` is given in). Columns beyond `link` are zero. Runs forward kinematics at q first. Used for
 * link gravity torques (τ = Jᵀ·F). Does not allocate.
 *
 * @throws RangeError on a bad link index, point size, q length, foreign data or short `out`.
 */
export function computeLinkPointJacobian(
  model: ArmModel,
  data: ArmData,
  q: ArrayLike<number>,
  link: number,
  pointInLink: ArrayLike<number>,
  out: Float64Array,
): Float64Array {
  checkArgs(model, data, q);
  checkOut(model, out);
  if (!Number.isInteger(link) || link < 1 || link > model.n) {
    throw new RangeError(`link: out of range, expected 1..${model.n}, got ${link}`);
  }
  if (pointInLink.length !== 3) throw new RangeError(`pointInLink: wrong size, expected 3, got ${pointInLink.length}`);
  forwardKinematicsUnchecked(model, data, q);
  const f = data.frames, b = 16 * link;
  const x = pointInLink[0], y = pointInLink[1], z = pointInLink[2];
  const px = f[b] * x + f[b + 1] * y + f[b + 2] * z + f[b + 3];
  const py = f[b + 4] * x + f[b + 5] * y + f[b + 6] * z + f[b + 7];
  const pz = f[b + 8] * x + f[b + 9] * y + f[b + 10] * z + f[b + 11];
  return jacobianAtWorldPoint(model, data, px, py, pz, link, out);
}
