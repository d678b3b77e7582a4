import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

const root = path.resolve(__dirname, "../..");
function cli(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "cli/armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

// Planar 2R arm (joint axes along z), links 0.5 m and 0.4 m, floor mounting only; invented.
const dir = mkdtempSync(path.join(tmpdir(), "armsift-place-"));
const armFile = path.join(dir, "arm.json");
writeFileSync(armFile, JSON.stringify({
  name: "planar 2R", convention: "dh", specs: { mounting: ["floor"] },
  joints: [0.5, 0.4].map((a) => ({ type: "revolute", a, alpha: 0, d: 0, theta: 0, min: -3, max: 3 })),
}));
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const CEILING = [1, 0, 0, 0, 0, -1, 0, 0, 0, 0, -1, 0, 0, 0, 0, 1];
const write = (name: string, mounting: unknown) => {
  const file = path.join(dir, name);
  writeFileSync(file, JSON.stringify({
    name: "two picks", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0, cog: [0, 0, 0] },
    // 1.6 m apart: no base reaches both from the nominal base at the origin, both from x = 0.8 (0.9 m reach)
    targets: [{ name: "left", position: [0, 0.1, 0], rpy: [0, 0, 0], mode: "point" }, { name: "right", position: [1.6, 0.1, 0], rpy: [0, 0, 0], mode: "point" }],
    paths: [], specs: [], ...(mounting ? { mounting } : {}),
  }));
  return file;
};
const region = { x: [0, 1], y: [-0.2, 0.2], z: [0, 0], yaw: [0, 0] };

describe("command line: place (docs/cli.md#place)", { timeout: 60_000 }, () => {
  it("prints the contract's fields in order, and the base found reaches both targets", () => {
    const r = cli("place", "--arm", armFile, "--requirements", write("r.json", { region, orientation: I4 }));
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.out);
    expect(Object.keys(out)).toEqual(["base", "reached", "total", "followed", "paths", "worstMargin", "minClearance", "targets", "evaluated"]);
    expect(out).toMatchObject({ reached: 2, total: 2, followed: 0, paths: 0, minClearance: null });
    expect(out.base).toHaveLength(16);
    expect(out.evaluated).toBeGreaterThan(1);
    // the 2R tool point from the returned base and q (Craig ch. 4, docs/references.md#craig-introduction-to-robotics)
    for (const [k, goal] of [[0, [0, 0.1]], [1, [1.6, 0.1]]] as const) {
      const t = out.targets[k];
      expect(Object.keys(t)).toEqual(["name", "reached", "q"]);
      const [q1, q2] = t.q;
      const x = out.base[3] + 0.5 * Math.cos(q1) + 0.4 * Math.cos(q1 + q2), y = out.base[7] + 0.5 * Math.sin(q1) + 0.4 * Math.sin(q1 + q2);
      expect(Math.hypot(x - goal[0], y - goal[1])).toBeLessThanOrEqual(1e-5);
    }
  });

  it("refuses a set without a region and an orientation the datasheet does not allow, status 2, one line", () => {
    const none = cli("place", "--arm", armFile, "--requirements", write("none.json", null));
    expect(none.code).toBe(2);
    expect(none.err).toMatch(/^--requirements .*none\.json: mounting: the requirement set has no mounting region to search\n$/);
    const ceiling = cli("place", "--arm", armFile, "--requirements", write("ceiling.json", { region, orientation: CEILING }));
    expect(ceiling.code).toBe(2);
    expect(ceiling.err).toMatch(/^--requirements .*ceiling\.json: mounting\.orientation: a ceiling mount \(base z axis 180\.0° from the cell's z\) is not allowed by the arm's datasheet \(--arm .*: specs\.mounting lists floor\)\n$/);
    const bad = cli("place", "--arm", armFile, "--requirements", write("bad.json", { region: { ...region, x: [1, 0] }, orientation: I4 }));
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/: mounting\.region\.x: lo \(1000\.0 mm\) is above hi \(0\.0 mm\)\n$/);
  });
});
