/**
 * Pose entry helpers for forms: position in mm and roll-pitch-yaw in degrees about the fixed axes
 * X, Y, Z (R = Rz(yaw)·Ry(pitch)·Rx(roll)), converted to and from the row-major 4×4 in SI (m).
 * Text stays text until saving, so nothing typed is lost.
 */
import { editable } from "@/shared/format";
import { poseRpy } from "@/shared/pose";
import { degToRad, mmToM, mToMm, radToDeg } from "@/shared/units";

export const RPY_CONVENTION = "roll-pitch-yaw about the fixed axes X, Y, Z: R = Rz(yaw)·Ry(pitch)·Rx(roll)";

/** A number as a form shows it for editing (9 significant digits; empty when missing): shared/format.ts. */
export const show = (v: number | undefined | null): string => editable(v);

/** Parses what a person typed: accepts a Unicode minus and surrounding spaces. Empty → undefined. */
export function parseNum(text: string): number | undefined | "bad" {
  const t = text.trim().replace(/\u2212/g, "-");
  if (t === "") return undefined;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return "bad";
  const n = Number(t);
  return Number.isFinite(n) ? n : "bad";
}

export interface PoseText {
  x: string;
  y: string;
  z: string;
  roll: string;
  pitch: string;
  yaw: string;
}
export const POSE_KEYS = ["x", "y", "z", "roll", "pitch", "yaw"] as const;
const ZERO_POSE: PoseText = { x: "0", y: "0", z: "0", roll: "0", pitch: "0", yaw: "0" };

/** Row-major 4×4 from position (m) and roll, pitch, yaw (rad); matrixPose is its inverse. */
export { rpyPose as poseMatrix, poseRpy as matrixPose } from "@/shared/pose";

export function poseTextFromMatrix(m: readonly number[] | undefined): PoseText {
  if (!m) return { ...ZERO_POSE };
  const { p, rpy } = poseRpy(m);
  return {
    x: show(mToMm(p[0])), y: show(mToMm(p[1])), z: show(mToMm(p[2])),
    roll: show(radToDeg(rpy[0])), pitch: show(radToDeg(rpy[1])), yaw: show(radToDeg(rpy[2])),
  };
}

export function samePose(a: PoseText, b: PoseText): boolean {
  return POSE_KEYS.every((k) => a[k].trim() === b[k].trim());
}

export function isZeroPose(t: PoseText): boolean {
  return POSE_KEYS.every((k) => {
    const v = parseNum(t[k]);
    return v === undefined || v === 0;
  });
}

const POSE_LABEL: Record<(typeof POSE_KEYS)[number], string> = { x: "x", y: "y", z: "z", roll: "roll", pitch: "pitch", yaw: "yaw" };

/**
 * Parses a pose: returns the SI position and rpy, or errors keyed by the pose key, each message
 * naming the field and the value.
 */
export function parsePose(t: PoseText, what: string): { ok: true; p: [number, number, number]; rpy: [number, number, number] } | { ok: false; errors: Partial<Record<keyof PoseText, string>> } {
  const errors: Partial<Record<keyof PoseText, string>> = {};
  const vals: number[] = [];
  for (const k of POSE_KEYS) {
    const v = parseNum(t[k]);
    if (v === "bad") errors[k] = `${what} ${POSE_LABEL[k]} '${t[k].trim()}' is not a number`;
    vals.push(v === "bad" || v === undefined ? 0 : v);
  }
  if (Object.keys(errors).length) return { ok: false, errors };
  return {
    ok: true,
    p: [mmToM(vals[0]), mmToM(vals[1]), mmToM(vals[2])],
    rpy: [degToRad(vals[3]), degToRad(vals[4]), degToRad(vals[5])],
  };
}

/** Moves item i by delta (−1 up, +1 down) in a copy of the list. */
export function moveItem<T>(list: T[], i: number, delta: number): T[] {
  const j = i + delta;
  if (j < 0 || j >= list.length) return list;
  const out = list.slice();
  [out[i], out[j]] = [out[j], out[i]];
  return out;
}

let keySeq = 0;
/** A key for list rows that survives reordering. */
export function rowKey(): string {
  keySeq += 1;
  return `r${keySeq}-${Math.random().toString(36).slice(2, 7)}`;
}
