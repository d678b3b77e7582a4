import "server-only";
import type { Change } from "./errors";

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === "object" && v !== null && !Array.isArray(v);

/**
 * Differences between two JSON values, by dotted path, in document order. Objects are compared
 * key by key (keys of either side), arrays index by index; a side where the path is absent
 * reports null. When the kinds differ (object vs array vs scalar) the whole value is reported.
 * Iterative, so deeply nested documents cannot overflow the stack.
 */
export function jsonDiff(base: unknown, current: unknown): Change[] {
  // Paths are linked lists of segments (shared prefixes), joined only for reported changes.
  interface PathNode {
    seg: string;
    parent: PathNode | null;
  }
  const join = (p: PathNode | null): string => {
    const segs: string[] = [];
    for (let n = p; n; n = n.parent) segs.push(n.seg);
    return segs.reverse().join(".");
  };
  const out: Change[] = [];
  const stack: { path: PathNode | null; a: unknown; b: unknown }[] = [{ path: null, a: base, b: current }];
  while (stack.length > 0) {
    const { path, a, b } = stack.pop()!;
    if (Object.is(a, b)) continue;
    const children: { path: PathNode; a: unknown; b: unknown }[] = [];
    if (Array.isArray(a) && Array.isArray(b)) {
      const n = Math.max(a.length, b.length);
      for (let i = 0; i < n; i++) children.push({ path: { seg: String(i), parent: path }, a: i < a.length ? a[i] : null, b: i < b.length ? b[i] : null });
    } else if (isObject(a) && isObject(b)) {
      const keys = [...Object.keys(a), ...Object.keys(b).filter((k) => !(k in a))];
      for (const k of keys) children.push({ path: { seg: k, parent: path }, a: a[k] ?? null, b: b[k] ?? null });
    } else {
      out.push({ path: join(path), base: a ?? null, current: b ?? null });
      continue;
    }
    // Push in reverse so the output follows document order.
    for (let i = children.length - 1; i >= 0; i--) stack.push(children[i]);
  }
  return out;
}

/** One line describing a change list, e.g. "changed joints.2.max, specs.price and 3 more". */
export function summarizeChanges(changes: Change[]): string {
  if (changes.length === 0) return "no changes";
  const shown = changes.slice(0, 3).map((c) => c.path || "(document)");
  const more = changes.length - shown.length;
  return `changed ${shown.join(", ")}${more > 0 ? ` and ${more} more` : ""}`;
}
