import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { REF } from "./fixtures";

const root = path.resolve(__dirname, "../..");
function cli(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), path.join(root, "cli/armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

const dir = mkdtempSync(path.join(tmpdir(), "armsift-cli-"));
const armFile = path.join(dir, "arm.json");
// Vertical-plane 2R arm of docs/references.md#2r-gravity-and-payload-check-values (base Rx(90°): the DH plane is the x-z plane).
writeFileSync(armFile, JSON.stringify({
  name: "2R vertical", convention: "dh", base: [1, 0, 0, 0, 0, 0, -1, 0, 0, 1, 0, 0, 0, 0, 0, 1],
  joints: [50, 20].map((t) => ({ type: "revolute", a: 1, alpha: 0, d: 0, theta: 0, min: -3.1, max: 3.1, maxTorque: t, mass: 1, com: [-0.5, 0, 0] })),
}));
const I4 = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
const reqFile = path.join(dir, "req.json");
writeFileSync(reqFile, JSON.stringify({
  name: "cli cell", base: I4, tool: { tcp: I4, mass: 0, cog: [0, 0, 0] }, payload: { mass: 0.5, cog: [0, 0, 0] },
  targets: [{ name: "front", position: [1.2, 0, 0.6], rpy: [0, 0, 0], mode: "point" }], paths: [],
  specs: [{ field: "axes", comparator: "atLeast", value: 2, priority: "must" }, { field: "reach", comparator: "atLeast", value: 1, priority: "want" }],
}));

describe("command line: statics and analyze (docs/cli.md)", { timeout: 60_000 }, () => {
  it("statics prints τ_hold, the force capacity, the payload capacity and the limiting joint", () => {
    // Source: Spong's planar elbow arm with g = 9.80665 (analysis_reference.py), q = (0, 0).
    const ref = REF.gravity2r.find((r: { g: number }) => r.g === 9.80665).rows[0];
    const r = cli("statics", "--arm", armFile, "--q", "0,0", "--direction", "0,0,-2");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.gravityTorque[0]).toBeCloseTo(ref.tau[0], 9);
    expect(out.payloadCapacity).toBeCloseTo(ref.capacity, 9);
    // Pushing straight down at the tip: joint 2 binds at 20 + τ₂ = 24.90 N (lever 1 m).
    expect(out.forceCapacity).toBeCloseTo(20 + ref.tau[1], 9);
    expect(out.limitingJoint).toBe(2);
  });
  it("errors exit 2 with one line naming the field", () => {
    const r = cli("statics", "--arm", armFile, "--q", "0,0", "--direction", "0,0,0");
    expect(r.code).toBe(2);
    expect(r.err.trim()).toBe("--direction: must not be the zero vector");
    const bad = cli("analyze", "--arms", armFile, "--requirements", armFile);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/^--requirements .*: tool: /);
  });
  it("analyze --format csv prints one row per requirement × arm", () => {
    const r = cli("analyze", "--arms", `${armFile},${armFile}`, "--requirements", reqFile, "--format", "csv");
    expect(r.code).toBe(0);
    const lines = r.out.trim().split("\n");
    expect(lines[0]).toBe("kind,requirement,priority,required,arm,value,unit,verdict,reason");
    expect(lines.length).toBe(1 + 2 * 2 + 2); // 2 specs × 2 arms + 1 target × 2 arms
    expect(lines[1]).toMatch(/^spec,Number of axes,must,≥ 2,2R vertical,2,,meets,/);
    expect(lines[3]).toMatch(/^spec,Reach,want,≥ 1000,2R vertical,–,mm,unknown,/);
    expect(lines[5]).toMatch(/^target,front,,reached \(point\),2R vertical,/);
  });
  it("analyze --format csv writes names through the exports' CSV writer (quoted, formula-guarded)", () => {
    const hostileArm = path.join(dir, "hostile.json");
    writeFileSync(hostileArm, JSON.stringify({ ...JSON.parse(readFileSync(armFile, "utf8")), name: '=HYPERLINK("http://evil.test"),x' }));
    const hostileReq = path.join(dir, "hostile-req.json");
    writeFileSync(hostileReq, JSON.stringify({ ...JSON.parse(readFileSync(reqFile, "utf8")), targets: [{ name: "+front", position: [1.2, 0, 0.6], rpy: [0, 0, 0], mode: "point" }] }));
    const r = cli("analyze", "--arms", hostileArm, "--requirements", hostileReq, "--format", "csv");
    expect(r.code).toBe(0);
    const lines = r.out.trim().split("\n");
    expect(lines[1]).toMatch(/^spec,Number of axes,must,≥ 2,"'=HYPERLINK\(""http:\/\/evil\.test""\),x",2,,meets,/);
    expect(lines[3]).toMatch(/^target,'\+front,,reached \(point\),"'=HYPERLINK/);
  });
});
