/**
 * Capability analysis of robot arms against a requirement set (pure TypeScript, SI units, cell
 * frame). Browser-safe: the cache key (node:crypto) lives in ./key.
 */
export * from "./types";
export * from "./canonical";
export * from "./linalg";
export * from "./dexterity";
export * from "./statics";
export * from "./spec";
export * from "./ranking";
export * from "./targets";
export * from "./paths";
export * from "./workspace";
export * from "./cycle";
export * from "./shortlist";
export * from "./compact";
export { createArmContext, placedArmKinematics, type ArmContext } from "./context";
export { armClearance } from "./clearance";
export * from "./copies";
export * from "./speed";
