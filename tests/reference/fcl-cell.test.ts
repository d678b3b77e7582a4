// The `clearance` check of an arm in a cell against FCL 0.7 (Debian's libfcl-dev):
// fixtures/fcl_cell.json, written by tests/reference/fcl_fixtures.cpp ("cell"), holds an invented
// six-axis arm with capsules on the base, the links, the tool (capsule and box) and the payload, a
// cell with one obstacle of each kind, and 60 seeded configurations with FCL's answer for every
// checked pair: the smallest distance over the two bodies' shapes (the smaller of FCL's two GJK
// solvers, see fcl.test.ts) and whether any shape pair collides. The forward kinematics there are
// written out independently of the product (standard DH with Eigen), so the placement of the
// shapes is checked too.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { allPairDistances, contactMask, pairNames } from "@/lib/analysis/cell";
import { createArmContext } from "@/lib/analysis/context";
import { armSchema } from "@/shared/schemas/arm";
import { requirementSetSchema } from "@/shared/schemas/requirements";

interface Fixture {
  source: string;
  arm: unknown;
  requirements: unknown;
  configs: { q: number[]; pairs: { a: string; b: string; distance: number; collide: boolean }[] }[];
}
const fixture = JSON.parse(readFileSync(path.join(__dirname, "fixtures", "fcl_cell.json"), "utf8")) as Fixture;
const arm = armSchema.parse(fixture.arm);
const req = requirementSetSchema.parse(fixture.requirements);

const root = path.resolve(__dirname, "../..");
function cli(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "cli/armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

describe("the cell's pairs against FCL", () => {
  const ctx = createArmContext(arm, req);

  it("checks exactly the pairs the rules name, in the same order", () => {
    const names = ctx.cell.pairs.map((_, p) => pairNames(ctx.cell, p).join(" – "));
    expect(names).toEqual(fixture.configs[0].pairs.map((p) => `${p.a} – ${p.b}`));
    expect(names.length).toBeGreaterThan(50);
  });

  it("every pair at 60 configurations: |distance − FCL| ≤ 1e-6 m and the same collision answer", () => {
    let worst = 0, collisions = 0;
    for (const c of fixture.configs) {
      const got = allPairDistances(ctx.cell, ctx.cellData, ctx.model, ctx.data, c.q, null);
      expect(got).toHaveLength(c.pairs.length);
      got.forEach((g, i) => {
        const ref = c.pairs[i];
        expect(pairNames(ctx.cell, g.pair)).toEqual([ref.a, ref.b]);
        const err = Math.abs(g.distance - ref.distance);
        worst = Math.max(worst, err);
        expect(err, `${ref.a} – ${ref.b} at q = ${c.q.join(", ")}`).toBeLessThanOrEqual(1e-6);
        expect(g.distance === 0, `${ref.a} – ${ref.b} collision at q = ${c.q.join(", ")}`).toBe(ref.collide);
        if (ref.collide) collisions++;
      });
    }
    // the fixture has both answers, and the agreement is far below the tolerance
    expect(collisions).toBeGreaterThan(30);
    expect(worst).toBeLessThan(1e-9);
  });

  it("the clearance command prints the same pairs, the smallest and whether anything collides; --target lifts the contact pairs", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "armsift-clearance-"));
    const armFile = path.join(dir, "arm.json"), reqFile = path.join(dir, "req.json");
    writeFileSync(armFile, JSON.stringify(fixture.arm));
    writeFileSync(reqFile, JSON.stringify(fixture.requirements));
    for (const c of [fixture.configs[0], fixture.configs.find((x) => x.pairs.some((p) => p.collide))!]) {
      const r = cli("clearance", "--arm", armFile, "--requirements", reqFile, "--q", c.q.join(","));
      expect(r.code, r.err).toBe(0);
      const out = JSON.parse(r.out) as { collisionFree: boolean; minDistance: number; closest: { a: string; b: string }; pairs: { a: string; b: string; distance: number }[] };
      expect(Object.keys(out)).toEqual(["collisionFree", "minDistance", "closest", "pairs"]);
      expect(out.pairs.map((p) => [p.a, p.b])).toEqual(c.pairs.map((p) => [p.a, p.b]));
      out.pairs.forEach((p, i) => expect(Math.abs(p.distance - c.pairs[i].distance)).toBeLessThanOrEqual(1e-6));
      const min = Math.min(...c.pairs.map((p) => p.distance));
      expect(Math.abs(out.minDistance - min)).toBeLessThanOrEqual(1e-6);
      expect(out.collisionFree).toBe(!c.pairs.some((p) => p.collide));
      const closest = c.pairs.find((p) => Math.abs(p.distance - out.minDistance) <= 1e-6)!;
      expect(out.closest).toEqual({ a: closest.a, b: closest.b });
    }
    // the target's contact list names the table: the tool's and payload's pairs with it go
    const lifted = cli("clearance", "--arm", armFile, "--requirements", reqFile, "--q", fixture.configs[0].q.join(","), "--target", "on the table");
    expect(lifted.code).toBe(0);
    const pairs = (JSON.parse(lifted.out) as { pairs: { a: string; b: string }[] }).pairs;
    expect(pairs.some((p) => p.b === "table" && (p.a === "tool" || p.a === "payload"))).toBe(false);
    expect(pairs.some((p) => p.b === "table" && p.a === "link 4")).toBe(true);
    expect(pairs).toHaveLength(fixture.configs[0].pairs.length - 2);
    const missing = cli("clearance", "--arm", armFile, "--requirements", reqFile, "--q", "0,0,0,0,0,0", "--target", "nowhere");
    expect(missing.code).toBe(2);
    expect(missing.err.trim()).toBe('--target: the requirement set has no target "nowhere" (targets: on the table)');
    const short = cli("clearance", "--arm", armFile, "--requirements", reqFile, "--q", "0,0");
    expect(short.code).toBe(2);
    expect(short.err.trim()).toBe("--q: expected 6 numbers, got 2");
    // the library agrees with the command on the lifted list
    const ctx2 = createArmContext(arm, req);
    expect(allPairDistances(ctx2.cell, ctx2.cellData, ctx2.model, ctx2.data, fixture.configs[0].q, contactMask(ctx2.cell, ["table"]))).toHaveLength(pairs.length);
  });
});
