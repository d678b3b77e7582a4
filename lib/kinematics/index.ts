/**
 * Public surface of the kinematics library (pure, synchronous, SI units, row-major matrices).
 * See types.ts for the notation, frames and memory order.
 */
export type {
  ArmData,
  ArmKinematics,
  ChainArmKinematics,
  DhArmKinematics,
  ArmModel,
  IkCause,
  IkMode,
  IkMultiOptions,
  IkOptions,
  IkResult,
  JointType,
  Mat4,
} from "./types";
export { createModel } from "./model";
export { createData } from "./data";
export { forwardKinematics } from "./forward";
export { computeJacobian, computeLinkPointJacobian, jointAxisWorld } from "./jacobian";
export {
  LIMIT_EPSILON,
  maxJointDistance,
  neutralConfiguration,
  randomConfiguration,
  withinLimits,
  wrapToLimits,
} from "./configuration";
export { createRng, type Rng } from "./rng";
export {
  mat4FromPositionRpy,
  mat4InvertRigid,
  mat4MulRigid,
  positionDistance,
  rotationAngleBetween,
} from "./math/mat4";
export { minSingularValue } from "./math/linalg";
export { IK_NEAR_LIMIT_FRACTION, solveIk, solveIkMulti } from "./inverse";
export { taskJacobianInto, taskRowCount, taskVelocityInto } from "./task";
export { dhToChain, mulRigid, originFromMatrix, originMatrix, transformPointRigid } from "./chain";
