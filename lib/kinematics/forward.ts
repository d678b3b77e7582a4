/** Forward kinematics over DH tables (both conventions) and general joint chains, allocation-free. */
import type { ArmData, ArmModel } from "./types";
import { checkArgs } from "./data";
import { mat4MulRigid } from "./math/mat4";

/**
 * Fills `data.frames` (frame 0 = `model.base`, frame i = T_world_i after joint i's link
 * transform), `data.flange` (= frame n) and `data.toolPose` (= flange·tool), all row-major and in
 * the arm's world frame (the frame `model.base` is expressed in). q in rad (revolute) or m
 * (prismatic): added to θ or d for DH tables, the angle about or travel along the joint axis for a
 * chain. Does not allocate.
 *
 * @throws RangeError if `data` belongs to another model or q has the wrong length.
 */
export function forwardKinematics(model: ArmModel, data: ArmData, q: ArrayLike<number>): void {
  checkArgs(model, data, q);
  forwardKinematicsUnchecked(model, data, q);
}

/** `forwardKinematics` without argument checks (internal hot path). */
export function forwardKinematicsUnchecked(model: ArmModel, data: ArmData, q: ArrayLike<number>): void {
  const f = data.frames;
  const n = model.n;
  const prismatic = model.prismatic, A = model.a, D = model.d, TH = model.theta;
  const CA = model.cosAlpha, SA = model.sinAlpha;
  if (model.convention === "chain") {
    const O = model.origin, U = model.axis, X = model.originCross, W = model.originOuter;
    for (let i = 0; i < n; i++) {
      const p = 16 * i, o = p + 16, b = 16 * i, a3 = 3 * i;
      // P = parent · T(origin): rotation block and translation.
      const o00 = O[b], o01 = O[b + 1], o02 = O[b + 2], o03 = O[b + 3];
      const o10 = O[b + 4], o11 = O[b + 5], o12 = O[b + 6], o13 = O[b + 7];
      const o20 = O[b + 8], o21 = O[b + 9], o22 = O[b + 10], o23 = O[b + 11];
      const ux = U[a3], uy = U[a3 + 1], uz = U[a3 + 2];
      // child = P · J with J the joint's motion: its rotation block m and translation t.
      let m00 = o00, m01 = o01, m02 = o02, m10 = o10, m11 = o11, m12 = o12, m20 = o20, m21 = o21, m22 = o22;
      let tx = o03, ty = o13, tz = o23;
      if (prismatic[i] === 1) {
        // J = Trans(u·q): the translation moves by q·(R_P u).
        tx = o03 + q[i] * (o00 * ux + o01 * uy + o02 * uz);
        ty = o13 + q[i] * (o10 * ux + o11 * uy + o12 * uz);
        tz = o23 + q[i] * (o20 * ux + o21 * uy + o22 * uz);
      } else {
        // Rodrigues: Rot(u, q) = c·I + s·[u]× + (1 − c)·u·uᵀ, so M = R_origin·Rot = c·R_origin + s·(R_origin[u]×)
        // + (1 − c)·(R_origin u uᵀ) with both products precomputed; the origin translation is unchanged.
        const c = Math.cos(q[i]), s = Math.sin(q[i]), v = 1 - c, k = 9 * i;
        m00 = c * o00 + s * X[k] + v * W[k]; m01 = c * o01 + s * X[k + 1] + v * W[k + 1]; m02 = c * o02 + s * X[k + 2] + v * W[k + 2];
        m10 = c * o10 + s * X[k + 3] + v * W[k + 3]; m11 = c * o11 + s * X[k + 4] + v * W[k + 4]; m12 = c * o12 + s * X[k + 5] + v * W[k + 5];
        m20 = c * o20 + s * X[k + 6] + v * W[k + 6]; m21 = c * o21 + s * X[k + 7] + v * W[k + 7]; m22 = c * o22 + s * X[k + 8] + v * W[k + 8];
      }
      for (let r = 0; r < 12; r += 4) {
        const p0 = f[p + r], p1 = f[p + r + 1], p2 = f[p + r + 2], p3 = f[p + r + 3];
        f[o + r] = p0 * m00 + p1 * m10 + p2 * m20;
        f[o + r + 1] = p0 * m01 + p1 * m11 + p2 * m21;
        f[o + r + 2] = p0 * m02 + p1 * m12 + p2 * m22;
        f[o + r + 3] = p0 * tx + p1 * ty + p2 * tz + p3;
      }
    }
  } else {
    // DH tables: θ and d of each joint (q adds to θ or to d), then the link transform row by row.
    const modified = model.convention === "mdh";
    for (let i = 0; i < n; i++) {
      const p = 16 * i, o = p + 16;
      let th = TH[i], d = D[i];
      if (prismatic[i] === 1) d += q[i];
      else th += q[i];
      const ct = Math.cos(th), st = Math.sin(th), ca = CA[i], sa = SA[i], a = A[i];
      for (let r = 0; r < 12; r += 4) {
        const p0 = f[p + r], p1 = f[p + r + 1], p2 = f[p + r + 2], p3 = f[p + r + 3];
        if (modified) {
          // child = parent · Rx(α)·Tx(a)·Rz(θ)·Tz(d).
          const m1 = ca * p1 + sa * p2;
          const m2 = ca * p2 - sa * p1;
          f[o + r] = ct * p0 + st * m1;
          f[o + r + 1] = ct * m1 - st * p0;
          f[o + r + 2] = m2;
          f[o + r + 3] = d * m2 + a * p0 + p3;
        } else {
          // child = parent · Rz(θ)·Tz(d)·Tx(a)·Rx(α); row r: u = p0 cθ + p1 sθ, v = p1 cθ − p0 sθ.
          const u = p0 * ct + p1 * st;
          const v = p1 * ct - p0 * st;
          f[o + r] = u;
          f[o + r + 1] = ca * v + sa * p2;
          f[o + r + 2] = ca * p2 - sa * v;
          f[o + r + 3] = a * u + d * p2 + p3;
        }
      }
    }
  }
  // tool pose = flange · tool
  mat4MulRigid(data.toolPose, f, model.tool, 0, 16 * n, 0);
}
