/**
 * Unit conversions between the SI values stored and computed (m, rad, kg, N, N·m, s)
 * and the units shown to people (mm, degrees, kg, N, N·m, mm/s).
 * Isomorphic: used by browser and server.
 */
const MM_PER_M = 1000;
const DEG_PER_RAD = 180 / Math.PI;
/** Standard gravity, m/s² (CGPM 1901 conventional value). */
export const STANDARD_GRAVITY = 9.80665;

export const mToMm = (m: number): number => m * MM_PER_M;
export const mmToM = (mm: number): number => mm / MM_PER_M;
export const radToDeg = (rad: number): number => rad * DEG_PER_RAD;
export const degToRad = (deg: number): number => deg / DEG_PER_RAD;

/** Joint variable shown to users: degrees for revolute joints, mm for prismatic ones. */
export function jointToDisplay(type: "revolute" | "prismatic", si: number): number {
  return type === "revolute" ? radToDeg(si) : mToMm(si);
}
export function jointFromDisplay(type: "revolute" | "prismatic", shown: number): number {
  return type === "revolute" ? degToRad(shown) : mmToM(shown);
}
export function jointUnit(type: "revolute" | "prismatic"): "°" | "mm" {
  return type === "revolute" ? "°" : "mm";
}
export function jointSpeedUnit(type: "revolute" | "prismatic"): "°/s" | "mm/s" {
  return type === "revolute" ? "°/s" : "mm/s";
}
export function jointTorqueUnit(type: "revolute" | "prismatic"): "N·m" | "N" {
  return type === "revolute" ? "N·m" : "N";
}
