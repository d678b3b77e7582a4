/**
 * Roll-pitch-yaw poses: position and roll, pitch, yaw about the fixed axes X, Y, Z
 * (R = Rz(yaw)·Ry(pitch)·Rx(roll)), to and from a row-major 4×4 rigid transform. SI units (m, rad).
 * Pure and isomorphic: the one implementation behind the forms (browser), the analysis and the
 * kinematics (server).
 */

/**
 * Writes the row-major 4×4 of position (m) and roll, pitch, yaw (rad) into `out` and returns it
 * (does not allocate).
 */
export function writeRpyPose<T extends number[] | Float64Array>(out: T, position: ArrayLike<number>, rpy: ArrayLike<number>): T {
  const cr = Math.cos(rpy[0]), sr = Math.sin(rpy[0]);
  const cp = Math.cos(rpy[1]), sp = Math.sin(rpy[1]);
  const cy = Math.cos(rpy[2]), sy = Math.sin(rpy[2]);
  out[0] = cy * cp; out[1] = cy * sp * sr - sy * cr; out[2] = cy * sp * cr + sy * sr; out[3] = position[0];
  out[4] = sy * cp; out[5] = sy * sp * sr + cy * cr; out[6] = sy * sp * cr - cy * sr; out[7] = position[1];
  out[8] = -sp; out[9] = cp * sr; out[10] = cp * cr; out[11] = position[2];
  out[12] = 0; out[13] = 0; out[14] = 0; out[15] = 1;
  return out;
}

/** A new row-major 4×4 (plain array) from position (m) and roll, pitch, yaw (rad). */
export function rpyPose(position: ArrayLike<number>, rpy: ArrayLike<number>): number[] {
  return writeRpyPose(new Array<number>(16).fill(0), position, rpy);
}

/** Position (m) and roll, pitch, yaw (rad) of a row-major 4×4; at pitch ±90° roll is set to 0. */
export function poseRpy(m: ArrayLike<number>): { p: [number, number, number]; rpy: [number, number, number] } {
  const cp = Math.hypot(m[0], m[4]);
  const pitch = Math.atan2(-m[8], cp);
  let roll: number, yaw: number;
  if (cp > 1e-9) {
    roll = Math.atan2(m[9], m[10]);
    yaw = Math.atan2(m[4], m[0]);
  } else {
    roll = 0;
    yaw = Math.atan2(-m[1], m[5]);
  }
  return { p: [m[3], m[7], m[11]], rpy: [roll, pitch, yaw] };
}
