import { describe, expect, it } from "vitest";
import { jsonDiff, summarizeChanges } from "@/lib/db/diff";

describe("jsonDiff", () => {
  it("reports changed leaves by dotted path in document order", () => {
    const base = { name: "A", joints: [{ min: -1, max: 1 }, { min: -2, max: 2 }], specs: { price: 10 } };
    const current = { name: "A", joints: [{ min: -1, max: 1.5 }, { min: -2, max: 2 }], specs: { price: 12, currency: "EUR" } };
    expect(jsonDiff(base, current)).toEqual([
      { path: "joints.0.max", base: 1, current: 1.5 },
      { path: "specs.price", base: 10, current: 12 },
      { path: "specs.currency", base: null, current: "EUR" },
    ]);
  });

  it("reports added and removed array entries and kind changes whole", () => {
    expect(jsonDiff({ a: [1, 2] }, { a: [1] })).toEqual([{ path: "a.1", base: 2, current: null }]);
    expect(jsonDiff({ a: [1] }, { a: { x: 1 } })).toEqual([{ path: "a", base: [1], current: { x: 1 } }]);
    expect(jsonDiff({ a: 1 }, { a: 1 })).toEqual([]);
  });

  it("handles very deep documents without overflowing the stack", () => {
    let a: unknown = 1;
    let b: unknown = 2;
    for (let i = 0; i < 100_000; i++) {
      a = { x: a };
      b = { x: b };
    }
    const changes = jsonDiff(a, b);
    expect(changes).toHaveLength(1);
    expect(changes[0].path.split(".")).toHaveLength(100_000);
  });

  it("summarizes a change list in one line", () => {
    expect(summarizeChanges([])).toBe("no changes");
    const many = ["a", "b", "c", "d", "e"].map((path) => ({ path, base: 1, current: 2 }));
    expect(summarizeChanges(many)).toBe("changed a, b, c and 2 more");
  });
});
