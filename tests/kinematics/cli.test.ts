// The command line (docs/cli.md) runs the same library; checked here against the
// planar 2R closed form (Craig ch. 3) and for its error contract (exit 2, one stderr line naming the field).
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { createData, createModel, forwardKinematics, positionDistance } from "@/lib/kinematics";
import { planarArm, SPHERICAL_WRIST_6R } from "../helpers/arms";
import { CliError } from "@/cli/io";

const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules", ".bin", "tsx");
let dir = "";

function cli(...args: string[]) {
  const r = spawnSync(tsx, [path.join(root, "cli", "armsift.ts"), ...args], { cwd: root, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function file(name: string, value: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, typeof value === "string" ? value : JSON.stringify(value));
  return p;
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), "armsift-cli-"));
});

describe("cli", { timeout: 60_000 }, () => {
  it("fk and jacobian, single and batch, match the 2R closed form", () => {
    const arm = file("arm.json", planarArm([0.4, 0.3]));
    const one = cli("fk", "--arm", arm, "--q", "0.3,0.5");
    expect(one.code).toBe(0);
    const pose = JSON.parse(one.stdout).pose as number[];
    expect(pose[3]).toBeCloseTo(0.4 * Math.cos(0.3) + 0.3 * Math.cos(0.8), 10);
    expect(pose[7]).toBeCloseTo(0.4 * Math.sin(0.3) + 0.3 * Math.sin(0.8), 10);
    const batch = JSON.parse(cli("fk", "--arm", arm, "--configs", file("q.json", [[0, 0], [0.3, 0.5]])).stdout);
    expect(batch.poses).toHaveLength(2);
    expect(batch.poses[0][3]).toBeCloseTo(0.7, 12);
    const jac = JSON.parse(cli("jacobian", "--arm", arm, "--q", "0.3,0.5").stdout).jacobian as number[][];
    expect(jac).toHaveLength(6);
    expect(jac[0][1]).toBeCloseTo(-0.3 * Math.sin(0.8), 10); // −l2 s12
    expect(jac[5]).toEqual([1, 1]);
  });

  it("ik reports results and a summary; FK of each answer hits the target", () => {
    const model = createModel(SPHERICAL_WRIST_6R);
    const data = createData(model);
    const targets = [[0.1, 0.2, 0.3, 0.4, 0.5, 0.6], [-1, 0.5, 0.2, 2, -1, 1]].map((q) => {
      forwardKinematics(model, data, q);
      return Array.from(data.toolPose);
    });
    targets.push([1, 0, 0, 5, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]); // 5 m away: beyond reach
    const out = cli("ik", "--arm", file("arm6.json", SPHERICAL_WRIST_6R), "--targets", file("t.json", targets), "--seed", "3");
    expect(out.code).toBe(0);
    const doc = JSON.parse(out.stdout);
    expect(doc.summary).toMatchObject({ reached: 2, total: 3 });
    expect(doc.summary.medianMs).toBeGreaterThan(0);
    for (let i = 0; i < 2; i++) {
      expect(doc.results[i].status).toBe("reached");
      forwardKinematics(model, data, doc.results[i].q);
      expect(positionDistance(data.toolPose, targets[i])).toBeLessThan(1e-5);
    }
    expect(doc.results[2].status).toBe("not-reached");
    expect(doc.results[2].positionError).toBeGreaterThan(3);
  });

  it("bad input exits 2 with one stderr line naming the field", () => {
    const arm = file("arm2.json", planarArm([0.4, 0.3]));
    for (const [args, message] of [
      [["fk", "--arm", arm, "--q", "0.1"], /^--q: expected 2 numbers, got 1$/],
      [["frobnicate"], /^command: unknown command/],
    ] as [string[], RegExp][]) {
      const r = cli(...args);
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr.trim()).toMatch(message);
    }
  });

  it("each command names the bad field in its CliError (same path the entry prints)", async () => {
    const arm = file("arm3.json", planarArm([0.4, 0.3]));
    const run = async (name: "fk" | "jacobian" | "ik", args: string[]) => {
      const mod = await import(`@/cli/commands/${name}`);
      return () => mod.command.run(args);
    };
    const cases: ["fk" | "jacobian" | "ik", string[], RegExp][] = [
      ["fk", ["--arm", arm, "--q", "0.1,x"], /^--q: item 2/],
      ["fk", ["--arm", file("bad.json", { ...planarArm([0.4]), convention: "xx" }), "--q", "0"], /convention/],
      ["fk", ["--arm", file("broken.json", "{"), "--q", "0"], /^--arm: .* is not valid JSON/],
      ["fk", ["--arm", arm], /^--q: give either --q or --configs$/],
      ["jacobian", ["--arm", arm, "--configs", file("qbad.json", [[0, 0], [1]])], /\[1\]: expected a list of 2 numbers/],
      ["ik", ["--arm", arm, "--targets", file("tbad.json", [[1, 2, 3]])], /^--targets .*\[0\]: must hold 16 numbers/],
      ["ik", ["--arm", arm], /^--targets: is required$/],
      ["ik", ["--arm", arm, "--targets", file("t1.json", []), "--mode", "sideways"], /^--mode: must be/],
      ["fk", ["--arm", arm, "--q", "0,0", "--bogus", "1"], /^--bogus: unknown option/],
    ];
    for (const [name, args, message] of cases) {
      const fn = await run(name, args);
      expect(fn, args.join(" ")).toThrow(CliError);
      expect(fn).toThrow(message);
    }
  });
});
