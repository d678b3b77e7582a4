// import-urdf and export-urdf on the command line: the same library as the server; the arm file on
// stdout, URDF text on stdout, and for bad input exit status 2 with one stderr line naming the
// element. Reference for the forward kinematics: the library import (checked against KDL in
// tests/reference/urdf_kdl.test.ts).
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { importUrdf } from "@/lib/urdf";
import { armSchema } from "@/shared/schemas";
import { maxAbsDiff } from "../helpers/fd";

const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules", ".bin", "tsx");
const fixture = path.join(root, "tests", "reference", "urdf", "twin-branch.urdf");
let dir = "";

function cli(...args: string[]) {
  const r = spawnSync(tsx, [path.join(root, "cli", "armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000, maxBuffer: 16 << 20 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function write(name: string, text: string | Buffer): string {
  const p = path.join(dir, name);
  writeFileSync(p, text);
  return p;
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), "armsift-urdf-cli-"));
});

describe("cli: import-urdf and export-urdf", { timeout: 60_000 }, () => {
  it("import-urdf prints the arm file of the chosen chain, with its source file and hash", () => {
    const r = cli("import-urdf", "--file", fixture, "--base", "torso", "--tip", "left_tip");
    expect(r.code, r.stderr).toBe(0);
    const arm = armSchema.parse(JSON.parse(r.stdout));
    expect(arm.convention).toBe("chain");
    expect(arm.joints).toHaveLength(3);
    expect(arm.source).toEqual({ format: "urdf", file: "twin-branch.urdf", sha256: createHash("sha256").update(readFileSync(fixture)).digest("hex"), baseLink: "torso", tipLink: "left_tip" });
    const lib = importUrdf(readFileSync(fixture, "utf8"), { base: "torso", tip: "left_tip" }).arm;
    const q = [0.4, -0.9, 1.3];
    const pose = (a: typeof arm) => {
      const m = createModel(a), d = createData(m);
      forwardKinematics(m, d, q);
      return d.toolPose;
    };
    expect(maxAbsDiff(pose(arm), pose(lib))).toBe(0);
  });

  it("export-urdf prints URDF that import-urdf reads back to the same forward kinematics", () => {
    const seed = path.join(root, "seed-data", "arms", "compact-six-3.json");
    const out = cli("export-urdf", "--arm", seed);
    expect(out.code, out.stderr).toBe(0);
    expect(out.stdout).toMatch(/^<\?xml version="1.0"\?>\n/);
    const back = cli("import-urdf", "--file", write("compact.urdf", out.stdout));
    expect(back.code, back.stderr).toBe(0);
    const a = armSchema.parse(JSON.parse(readFileSync(seed, "utf8"))), b = armSchema.parse(JSON.parse(back.stdout));
    const ma = createModel(a), mb = createModel(b), da = createData(ma), db = createData(mb);
    const q = [0.3, -0.4, 0.6, 1.0, -0.7, 0.2];
    forwardKinematics(ma, da, q);
    forwardKinematics(mb, db, q);
    expect(maxAbsDiff(da.toolPose, db.toolPose)).toBeLessThan(1e-12);
  });

  it("bad files exit 2 with one line naming the file and the element", () => {
    const cases: [string, RegExp][] = [
      [write("doctype.urdf", '<!DOCTYPE r [<!ENTITY a "b">]><robot name="x"/>'), /^--file .*doctype\.urdf: <!DOCTYPE> \(line 1\): DOCTYPE and entity declarations are refused/],
      [write("cycle.urdf", '<robot name="x"><link name="a"/><link name="b"/><joint name="ab" type="fixed"><parent link="a"/><child link="b"/></joint><joint name="ba" type="fixed"><parent link="b"/><child link="a"/></joint></robot>'), /: link "a": is the child of two joints|closes a cycle/],
      [write("empty.urdf", ""), /: file: is empty$/],
      [write("big.urdf", " ".repeat(20 * 1024 * 1024)), /^--file .*big\.urdf: is 20,971,520 bytes; the limit is 2 MiB/],
      [write("latin1.urdf", Buffer.from([0x3c, 0x72, 0xe9, 0x3e])), /: is not UTF-8 text$/],
      [path.join(dir, "missing.urdf"), /^--file .*missing\.urdf: cannot read the file \(ENOENT\)$/],
    ];
    for (const [file, message] of cases) {
      const r = cli("import-urdf", "--file", file);
      expect(r.code, file).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr.trim()).toMatch(message);
    }
    expect(cli("import-urdf").stderr.trim()).toBe("--file: is required");
  });
});
