/**
 * Spec compliance: datasheet fields of an arm against the requirement set's spec requirements.
 * Numbers compare in SI with their units; IP codes digit by digit per IEC 60529; mounting by
 * inclusion; missing data is `unknown`, never a pass.
 */
import type { ArmDocument } from "@/shared/schemas/arm";
import { COMPARATOR_TEXT, SPEC_FIELDS, type SpecRequirement, type SpecField } from "@/shared/schemas/requirements";
import { upTo } from "@/shared/format";
import type { Verdict } from "./types";

/** A parsed IP code. Digits are numbers, or null for 'X' (not tested / not stated). */
interface IpCode {
  /** First characteristic numeral (solid foreign objects, 0–6), null for X. */
  solid: number | null;
  /**
   * Second characteristic numerals (water, 0–9), one per marking: a dual-marked code such as
   * "IP65/IP67" has two. [null] for X.
   */
  water: (number | null)[];
  /** The text as given, upper-cased. */
  text: string;
}

/**
 * Parses "IP54", "IPX7", "IP6X", "IP65/IP67", "IP65/67", "IP69K" (additional and supplementary
 * letters are ignored: they do not change the numerals). Returns null on anything else.
 */
export function parseIpCode(text: string): IpCode | null {
  const s = text.trim().toUpperCase().replace(/\s+/g, "");
  const m = /^IP([0-6X])([0-9X])[A-DHMSWK]{0,2}((?:\/(?:IP)?(?:[0-6X])?[0-9X][A-DHMSWK]{0,2})*)$/.exec(s);
  if (!m) return null;
  const solid = m[1] === "X" ? null : Number(m[1]);
  const water: (number | null)[] = [m[2] === "X" ? null : Number(m[2])];
  for (const part of m[3].split("/").filter(Boolean)) {
    const p = /^(?:IP)?([0-6X])?([0-9X])/.exec(part)!;
    if (p[1] !== undefined && p[1] !== m[1]) return null; // a dual marking repeats the first numeral
    water.push(p[2] === "X" ? null : Number(p[2]));
  }
  return { solid, water, text: s };
}

/**
 * IEC 60529 digit meanings (from memory; the standard's text was not read here):
 * - First numeral, solid objects: 0 none, 1 ≥ 50 mm, 2 ≥ 12.5 mm, 3 ≥ 2.5 mm, 4 ≥ 1 mm,
 *   5 dust-protected, 6 dust-tight. Each numeral implies all lower ones.
 * - Second numeral, water: 0 none, 1 vertical drips, 2 drips at 15° tilt, 3 spraying, 4 splashing,
 *   5 jets, 6 powerful jets, 7 temporary immersion, 8 continuous immersion (beyond 7's
 *   conditions), 9 high-pressure, high-temperature jets (added by amendment in 2013).
 *   Up to 6, a numeral implies all lower ones. A 7 or 8 alone does NOT imply 5 or 6 (the jet
 *   tests): an enclosure meeting both is dual-marked (e.g. IP65/IP67). We read 7 and 8 as
 *   implying 0–4 (the standard only excepts the jets) and 8 as implying 7; 9 implies nothing
 *   else.
 */
export const IEC_60529_NOTE =
  "IEC 60529 digit rules (from memory): numerals up to 6 imply the lower ones; a water numeral 7 or 8 does not imply 5 or 6 (jets) unless the code is dual-marked (e.g. IP65/IP67); 9 implies no other numeral; X (not tested) is unknown.";

/** True when a second (water) numeral `has` covers the required numeral `need` (rules above). */
export function waterCovers(has: number, need: number): boolean {
  if (need === 0) return true;
  if (has === 9) return need === 9;
  if (need === 9) return false;
  if (need <= 4) return has >= need;
  if (need === 5) return has === 5 || has === 6;
  if (need === 6) return has === 6;
  if (need === 7) return has === 7 || has === 8;
  return has === 8; // need 8
}

/** Digit-by-digit comparison "arm's code is at least the required code". */
export function compareIpAtLeast(arm: IpCode, req: IpCode): { verdict: Verdict; reason: string } {
  const parts: string[] = [];
  let verdict: Verdict = "meets";
  const fail = (why: string) => { verdict = "fails"; parts.push(why); };
  const unknown = (why: string) => { if (verdict !== "fails") verdict = "unknown"; parts.push(why); };
  if (req.solid !== null && req.solid > 0) {
    if (arm.solid === null) unknown(`first numeral X (not stated) against required ${req.solid}`);
    else if (arm.solid < req.solid) fail(`first numeral ${arm.solid} < required ${req.solid}`);
  }
  const need = req.water[0];
  if (need !== null && need > 0) {
    const known = arm.water.filter((w): w is number => w !== null);
    if (known.some((w) => waterCovers(w, need))) {
      // covered
    } else if (known.length === 0) {
      unknown(`second numeral X (not stated) against required ${need}`);
    } else if ((need === 5 || need === 6) && known.some((w) => w === 7 || w === 8)) {
      fail(`second numeral ${known.join("/")} (immersion) does not imply ${need} (jets) without a dual marking`);
    } else {
      fail(`second numeral ${known.join("/")} does not cover required ${need}`);
    }
  }
  return { verdict, reason: parts.length ? parts.join("; ") : "both numerals covered" };
}

/** One row of the compliance table. */
export interface SpecResult {
  /** Index of the requirement in the requirement set's `specs`. */
  index: number;
  field: SpecField;
  label: string;
  comparator: SpecRequirement["comparator"];
  priority: SpecRequirement["priority"];
  /** Required value as stored (SI number, IP code, mounting name or boolean). */
  required: number | string | boolean;
  /** The arm's value as stored, or null when the datasheet lacks it. */
  value: number | string | boolean | string[] | null;
  /** SI unit of numeric values ("" for codes and flags; "currency" for price). */
  unit: string;
  /** Display forms (mm for lengths; the currency code for prices). */
  requiredDisplay: string;
  valueDisplay: string;
  displayUnit: string;
  verdict: Verdict;
  reason: string;
}


function displayNumber(field: SpecField, v: number, currency?: string): { text: string; unit: string } {
  const unit = SPEC_FIELDS[field].unit;
  if (unit === "m") return { text: upTo(v * 1000, 3), unit: "mm" };
  if (unit === "currency") return { text: upTo(v, 2), unit: currency ?? "" };
  return { text: upTo(v, 3), unit };
}


/** Compares one spec requirement with one arm's datasheet. */
export function checkSpec(arm: ArmDocument, req: SpecRequirement, index: number): SpecResult {
  const def = SPEC_FIELDS[req.field];
  const specs = arm.specs ?? {};
  const base = {
    index, field: req.field, label: def.label, comparator: req.comparator, priority: req.priority,
    required: req.value, unit: def.unit as string,
  };
  const op = COMPARATOR_TEXT[req.comparator].symbol;
  if (def.kind === "number") {
    const raw = req.field === "axes" ? arm.joints.length : (specs as Record<string, unknown>)[req.field];
    const need = req.value as number;
    const rd = displayNumber(req.field, need, specs.currency);
    if (typeof raw !== "number") {
      return { ...base, value: null, requiredDisplay: rd.text, valueDisplay: "–", displayUnit: rd.unit, verdict: "unknown", reason: `${def.label} is not on the datasheet (required ${op} ${rd.text} ${rd.unit})`.trim() };
    }
    const vd = displayNumber(req.field, raw, specs.currency);
    const tol = 1e-9 * Math.max(1, Math.abs(need));
    const ok = req.comparator === "atLeast" ? raw >= need - tol : req.comparator === "atMost" ? raw <= need + tol : Math.abs(raw - need) <= tol;
    let reason = `${def.label} ${vd.text} ${vd.unit} ${ok ? "" : "not "}${op} required ${rd.text} ${rd.unit}`.replace(/\s+/g, " ").trim();
    if (req.field === "price") reason += specs.currency ? ` (prices in ${specs.currency}; the requirement is taken in the same currency)` : " (currency not stated)";
    return { ...base, value: raw, requiredDisplay: rd.text, valueDisplay: vd.text, displayUnit: vd.unit, verdict: ok ? "meets" : "fails", reason };
  }
  if (def.kind === "ip") {
    const reqCode = parseIpCode(String(req.value));
    const text = specs.ipCode;
    if (!reqCode) return { ...base, value: text ?? null, requiredDisplay: String(req.value), valueDisplay: text ?? "–", displayUnit: "", verdict: "unknown", reason: `required IP code ${String(req.value)} cannot be read` };
    if (!text) return { ...base, value: null, requiredDisplay: reqCode.text, valueDisplay: "–", displayUnit: "", verdict: "unknown", reason: `IP code is not on the datasheet (required ${op} ${reqCode.text})` };
    const armCode = parseIpCode(text);
    if (!armCode) return { ...base, value: text, requiredDisplay: reqCode.text, valueDisplay: text, displayUnit: "", verdict: "unknown", reason: `the datasheet's IP code ${text} cannot be read` };
    if (req.comparator === "equals") {
      const ok = armCode.solid === reqCode.solid && armCode.water.includes(reqCode.water[0]);
      return { ...base, value: text, requiredDisplay: reqCode.text, valueDisplay: armCode.text, displayUnit: "", verdict: ok ? "meets" : "fails", reason: `${armCode.text} ${ok ? "is" : "is not"} ${reqCode.text}` };
    }
    const c = compareIpAtLeast(armCode, reqCode);
    return { ...base, value: text, requiredDisplay: reqCode.text, valueDisplay: armCode.text, displayUnit: "", verdict: c.verdict, reason: `${armCode.text} against required ${reqCode.text} (IEC 60529, digit by digit): ${c.reason}` };
  }
  if (def.kind === "mounting") {
    const list = specs.mounting;
    const need = String(req.value);
    if (!list || list.length === 0) return { ...base, value: null, requiredDisplay: need, valueDisplay: "–", displayUnit: "", verdict: "unknown", reason: `mounting options are not on the datasheet (required: ${need})` };
    const ok = list.includes(need as (typeof list)[number]);
    return { ...base, value: [...list], requiredDisplay: need, valueDisplay: list.join(", "), displayUnit: "", verdict: ok ? "meets" : "fails", reason: `mounting options ${list.join(", ")} ${ok ? "include" : "do not include"} ${need}` };
  }
  // boolean: collaborative
  const v = specs.collaborative;
  const need = req.value === true;
  if (typeof v !== "boolean") return { ...base, value: null, requiredDisplay: need ? "yes" : "no", valueDisplay: "–", displayUnit: "", verdict: "unknown", reason: `the datasheet does not say whether the arm is collaborative (required: ${need ? "yes" : "no"})` };
  const ok = v === need;
  return { ...base, value: v, requiredDisplay: need ? "yes" : "no", valueDisplay: v ? "yes" : "no", displayUnit: "", verdict: ok ? "meets" : "fails", reason: `collaborative: ${v ? "yes" : "no"}, required ${need ? "yes" : "no"}` };
}

/** A requirement as one line: "Rated payload ≥ 5 kg". */
export function requirementText(r: Pick<SpecResult, "label" | "comparator" | "requiredDisplay" | "displayUnit">): string {
  return `${r.label} ${COMPARATOR_TEXT[r.comparator].symbol} ${r.requiredDisplay}${r.displayUnit ? ` ${r.displayUnit}` : ""}`;
}
