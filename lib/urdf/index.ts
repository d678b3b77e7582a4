/**
 * The open URDF robot description format: import (a serial chain of a URDF tree as a `chain` arm)
 * and export (any arm as URDF). Pure and synchronous; file reading and hashing are the caller's.
 */
export { UrdfError } from "./errors";
export { parseUrdf, URDF_LIMITS, type UrdfRobot } from "./parse";
export { CONTINUOUS_RANGE, importUrdf, type UrdfImportReport } from "./import";
export { exportUrdf } from "./export";
