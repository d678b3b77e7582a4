/** `createData`: the per-model workspace holding every buffer (Pinocchio's Model/Data split). */
import type { ArmData, ArmModel } from "./types";

/**
 * Allocates every buffer for `model` (frames, tool pose, Jacobian, IK scratch). After this, the
 * forward kinematics, Jacobian and IK functions do not allocate (IK results are the exception:
 * each returned `IkResult.q` is a fresh array the caller owns).
 */
export function createData(model: ArmModel): ArmData {
  const n = model.n;
  const frames = new Float64Array(16 * (n + 1));
  for (let i = 0; i <= n; i++) frames[16 * i + 15] = 1;
  frames.set(model.base, 0);
  const toolPose = new Float64Array(16);
  toolPose[15] = 1;
  const k = Math.max(6, n);
  return Object.freeze({
    model,
    frames,
    flange: frames.subarray(16 * n, 16 * (n + 1)),
    toolPose,
    jacobian: new Float64Array(6 * n),
    ik: Object.freeze({
      q: new Float64Array(n),
      qTrial: new Float64Array(n),
      qBest: new Float64Array(n),
      qBestAll: new Float64Array(n),
      qSeed: new Float64Array(n),
      dq: new Float64Array(n),
      jt: new Float64Array(6 * n),
      normal: new Float64Array(36),
      gram: new Float64Array(k * k),
      err: new Float64Array(6),
      y: new Float64Array(6),
      frozen: new Uint8Array(n),
    }),
  });
}

/** Throws RangeError unless `data` was made for `model` and `q` has n entries. */
export function checkArgs(model: ArmModel, data: ArmData, q: ArrayLike<number>): void {
  if (data.model !== model) throw new RangeError("data: was created for a different model (use createData(model))");
  if (q.length !== model.n) throw new RangeError(`q: wrong size, expected ${model.n}, got ${q.length}`);
}
