/** Readable values for arm document paths (conflict lists, history), in the units the form shows. */
import type { ArmDocument } from "@/shared/schemas";
import { show, matrixPose } from "../pose";
import { mToMm, radToDeg } from "@/shared/units";
import { armPathLabel, jointFieldToDisplay, jointFieldUnit, type JointNumField } from "./armForm";

export function formatArmValue(path: string, value: unknown, doc: ArmDocument | undefined): string {
  if (value === undefined) return "(not set)";
  const p = path.split(".");
  if (p[0] === "joints" && p.length >= 3 && typeof value === "number") {
    const type = doc?.joints[Number(p[1])]?.type ?? "revolute";
    if (p[2] === "com") return `${show(mToMm(value))} mm`;
    if (p[2] === "origin") return p[3] === "rpy" ? `${show(radToDeg(value))}°` : `${show(mToMm(value))} mm`;
    if (p[2] === "axis") return show(value);
    const f = p[2] as JointNumField;
    const unit = jointFieldUnit(f, type);
    return `${show(jointFieldToDisplay(f, type, value))}${unit === "°" ? "" : " "}${unit}`;
  }
  if (p[0] === "joints" && p[2] === "com" && Array.isArray(value)) return `${value.map((v) => show(mToMm(v as number))).join(", ")} mm`;
  if (p[0] === "joints" && p[2] === "origin" && p[3] === "xyz" && Array.isArray(value)) return `${value.map((v) => show(mToMm(v as number))).join(", ")} mm`;
  if (p[0] === "joints" && p[2] === "origin" && p[3] === "rpy" && Array.isArray(value)) return `${value.map((v) => show(radToDeg(v as number))).join(", ")}°`;
  if ((p[0] === "base" || p[0] === "tool") && Array.isArray(value) && value.length === 16) {
    const { p: pos, rpy } = matrixPose(value as number[]);
    return `x y z ${pos.map((v) => show(mToMm(v))).join(" ")} mm, rpy ${rpy.map((v) => show(radToDeg(v))).join(" ")}°`;
  }
  if (p[0] === "specs" && typeof value === "number") {
    if (p[1] === "reach" || p[1] === "repeatability") return `${show(mToMm(value))} mm`;
    if (p[1] === "ratedPayload" || p[1] === "armMass") return `${show(value)} kg`;
    if (p[1] === "leadTimeWeeks") return `${show(value)} weeks`;
    if (p[1] === "wristAllowables" && p[3] === "moment") return `${show(value)} N·m`;
    if (p[1] === "wristAllowables" && p[3] === "inertia") return `${show(value)} kg·m²`;
    return show(value);
  }
  if (typeof value === "string") return value;
  return JSON.stringify(value);
}

export { armPathLabel };
