/**
 * The arm's collision geometry in the editor: one table of capsules, each on a body (the base or
 * link k, in that body's frame, ends in mm, radius in mm), and the ignored pairs as text
 * ("1-3, 2-4"). A row loaded from the file and not edited goes back exactly as loaded.
 */
import type { ArmCapsule, ArmDocument, FieldError } from "@/shared/schemas";
import { mmToM, mToMm } from "@/shared/units";
import { parseNum, rowKey, show } from "../pose";

export const CAPSULE_TEXT_KEYS = ["fx", "fy", "fz", "tx", "ty", "tz", "r"] as const;
export type CapsuleTextKey = (typeof CAPSULE_TEXT_KEYS)[number];

export interface CapsuleRow {
  key: string;
  /** "0" for the base, "k" for link k. */
  link: string;
  fx: string; fy: string; fz: string;
  tx: string; ty: string; tz: string;
  r: string;
  orig?: { texts: string; value: ArmCapsule };
}

const textsOf = (r: CapsuleRow) => JSON.stringify(CAPSULE_TEXT_KEYS.map((k) => r[k].trim()));

export function capsuleRow(link: number, c: ArmCapsule, loaded: boolean): CapsuleRow {
  const mm = (v: number) => show(mToMm(v));
  const row: CapsuleRow = { key: rowKey(), link: String(link), fx: mm(c.from[0]), fy: mm(c.from[1]), fz: mm(c.from[2]), tx: mm(c.to[0]), ty: mm(c.to[1]), tz: mm(c.to[2]), r: mm(c.radius) };
  if (loaded) row.orig = { texts: textsOf(row), value: { from: [...c.from], to: [...c.to], radius: c.radius } };
  return row;
}

export function newCapsuleRow(link: number): CapsuleRow {
  return { key: rowKey(), link: String(link), fx: "0", fy: "0", fz: "0", tx: "0", ty: "0", tz: "100", r: "50" };
}

/** The rows of a loaded arm: the base's capsules, then each link's, in file order. */
export function capsuleRowsFromDoc(doc: ArmDocument): CapsuleRow[] {
  const rows = (doc.baseCollision ?? []).map((c) => capsuleRow(0, c, true));
  doc.joints.forEach((j, i) => (j.collision ?? []).forEach((c) => rows.push(capsuleRow(i + 1, c, true))));
  return rows;
}

export function ignoredPairsText(doc: ArmDocument): string {
  return (doc.ignoredPairs ?? []).map(([a, b]) => `${a}-${b}`).join(", ");
}

/**
 * Document path of each row ("baseCollision.0", "joints.2.collision.1"), or null for a row whose
 * link is not a body of an arm with n joints. Rows keep their order within a body.
 */
export function capsuleRowPaths(rows: readonly CapsuleRow[], n: number): (string | null)[] {
  const count = new Map<number, number>();
  return rows.map((r) => {
    const k = Number(r.link);
    if (!Number.isInteger(k) || k < 0 || k > n || r.link.trim() === "") return null;
    const idx = count.get(k) ?? 0;
    count.set(k, idx + 1);
    return k === 0 ? `baseCollision.${idx}` : `joints.${k - 1}.collision.${idx}`;
  });
}

/** Doc paths whose errors belong to cell `key` of a row at `path`. */
export function capsuleCellPaths(path: string | null, rowIndex: number, key: CapsuleTextKey | "link"): string[] {
  const own = `collision.${rowIndex}.${key}`;
  if (path === null) return [own];
  switch (key) {
    case "link": return [own, path];
    case "fx": return [own, `${path}.from.0`, `${path}.from`];
    case "fy": return [own, `${path}.from.1`];
    case "fz": return [own, `${path}.from.2`];
    case "tx": return [own, `${path}.to.0`, `${path}.to`];
    case "ty": return [own, `${path}.to.1`];
    case "tz": return [own, `${path}.to.2`];
    default: return [own, `${path}.radius`];
  }
}

const LABEL: Record<CapsuleTextKey, string> = { fx: "from x", fy: "from y", fz: "from z", tx: "to x", ty: "to y", tz: "to z", r: "radius" };

/**
 * Writes the capsule rows into `doc` (baseCollision and joints[i].collision, replacing what was
 * there) and the ignored pairs; not-a-number entries, bad link numbers and malformed pairs go to
 * `errors`.
 */
export function applyCollisionForm(doc: ArmDocument, rows: readonly CapsuleRow[], ignored: string, errors: FieldError[]): void {
  const n = doc.joints.length;
  const paths = capsuleRowPaths(rows, n);
  const base: ArmCapsule[] = [];
  const links: ArmCapsule[][] = doc.joints.map(() => []);
  rows.forEach((row, i) => {
    if (paths[i] === null) {
      errors.push({ path: `collision.${i}.link`, message: `capsule ${i + 1}: body '${row.link.trim()}' is not the base (0) or a link 1 to ${n}` });
      return;
    }
    let value: ArmCapsule;
    if (row.orig && row.orig.texts === textsOf(row)) value = row.orig.value;
    else {
      const num = (k: CapsuleTextKey): number => {
        const v = parseNum(row[k]);
        if (v === "bad" || v === undefined) {
          errors.push({ path: `collision.${i}.${k}`, message: `capsule ${i + 1} ${LABEL[k]} ${v === "bad" ? `'${row[k].trim()}' is not a number` : "is required"}` });
          return 0;
        }
        return mmToM(v);
      };
      value = { from: [num("fx"), num("fy"), num("fz")], to: [num("tx"), num("ty"), num("tz")], radius: num("r") };
    }
    const k = Number(row.link);
    if (k === 0) base.push(value);
    else links[k - 1].push(value);
  });
  if (base.length) doc.baseCollision = base;
  else delete doc.baseCollision;
  doc.joints.forEach((j, i) => {
    if (links[i].length) j.collision = links[i];
    else delete j.collision;
  });
  const pairs: [number, number][] = [];
  for (const item of ignored.split(/[,;]/).map((s) => s.trim()).filter(Boolean)) {
    const m = /^(\d+)\s*[-–]\s*(\d+)$/.exec(item);
    if (!m) {
      errors.push({ path: "ignoredPairs", message: `ignored pair '${item}' is not two link numbers such as 2-4` });
      continue;
    }
    pairs.push([Number(m[1]), Number(m[2])]);
  }
  if (pairs.length) doc.ignoredPairs = pairs;
  else delete doc.ignoredPairs;
}
