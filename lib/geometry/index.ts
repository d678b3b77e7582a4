/**
 * Geometry library: convex primitives (sphere, capsule, box, cylinder), their placement in a
 * frame, and separation distance, penetration depth and the closest pair of points between them
 * (closed forms where they exist, GJK/EPA for the rest). Pure TypeScript, SI units (m),
 * row-major 4×4 poses; no dependence on the rest of Armsift. See types.ts for the conventions.
 */
export * from "./types";
export { STRIDE, packShape, placeShape, updateBound } from "./packed";
export { distancePacked, gjkPacked, shapeDistance } from "./distance";
