/** Forward kinematics over the DH chain (both conventions), allocation-free. */
import type { ArmData, ArmModel } from "./types";
import { checkArgs } from "./data";

/**
 * Fills `data.frames` (frame 0 = `model.base`, frame i = T_world_i after joint i's link
 * transform), `data.flange` (= frame n) and `data.toolPose` (= flange·tool), all row-major and in
 * the arm's world frame (the frame `model.base` is expressed in). q in rad (revolute) or m
 * (prismatic), added to θ or d. Does not allocate.
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
  if (model.convention === "dh") {
    for (let i = 0; i < n; i++) {
      const p = 16 * i, o = p + 16;
      let th = TH[i], d = D[i];
      if (prismatic[i] === 1) d += q[i];
      else th += q[i];
      const ct = Math.cos(th), st = Math.sin(th), ca = CA[i], sa = SA[i], a = A[i];
      // child = parent · Rz(θ)·Tz(d)·Tx(a)·Rx(α); row r: u = p0 cθ + p1 sθ, v = p1 cθ − p0 sθ.
      for (let r = 0; r < 12; r += 4) {
        const p0 = f[p + r], p1 = f[p + r + 1], p2 = f[p + r + 2], p3 = f[p + r + 3];
        const u = p0 * ct + p1 * st;
        const v = p1 * ct - p0 * st;
        f[o + r] = u;
        f[o + r + 1] = ca * v + sa * p2;
        f[o + r + 2] = ca * p2 - sa * v;
        f[o + r + 3] = a * u + d * p2 + p3;
      }
    }
  } else {
    for (let i = 0; i < n; i++) {
      const p = 16 * i, o = p + 16;
      let th = TH[i], d = D[i];
      if (prismatic[i] === 1) d += q[i];
      else th += q[i];
      const ct = Math.cos(th), st = Math.sin(th), ca = CA[i], sa = SA[i], a = A[i];
      // child = parent · Rx(α)·Tx(a)·Rz(θ)·Tz(d).
      for (let r = 0; r < 12; r += 4) {
        const p0 = f[p + r], p1 = f[p + r + 1], p2 = f[p + r + 2], p3 = f[p + r + 3];
        const m1 = ca * p1 + sa * p2;
        const m2 = ca * p2 - sa * p1;
        f[o + r] = ct * p0 + st * m1;
        f[o + r + 1] = ct * m1 - st * p0;
        f[o + r + 2] = m2;
        f[o + r + 3] = d * m2 + a * p0 + p3;
      }
    }
  }
  // tool pose = flange · tool
  const t = model.tool, out = data.toolPose, fo = 16 * n;
  for (let r = 0; r < 12; r += 4) {
    const f0 = f[fo + r], f1 = f[fo + r + 1], f2 = f[fo + r + 2], f3 = f[fo + r + 3];
    out[r] = f0 * t[0] + f1 * t[4] + f2 * t[8];
    out[r + 1] = f0 * t[1] + f1 * t[5] + f2 * t[9];
    out[r + 2] = f0 * t[2] + f1 * t[6] + f2 * t[10];
    out[r + 3] = f0 * t[3] + f1 * t[7] + f2 * t[11] + f3;
  }
}
