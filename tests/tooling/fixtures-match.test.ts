// The fixture-drift check that CI runs after regenerating the reference fixtures
// (tests/reference/fixtures_match.py): last-bit differences pass, anything else fails.
import { execFileSync, spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";

const SCRIPT = path.resolve(__dirname, "..", "reference", "fixtures_match.py");
const COMMITTED = { source: "generator (numpy 1.0)", values: [0.1 + 0.2, 2109.8110293391996, -0.0, 1e-15], status: "bounded", ok: true };

let repo = "";
const git = (...args: string[]) => execFileSync("git", args, { cwd: repo, stdio: "pipe" });
const write = (name: string, doc: unknown) => writeFileSync(path.join(repo, "tests/reference/fixtures", name), JSON.stringify(doc, null, 1) + "\n");
const check = () => {
  const r = spawnSync("/usr/bin/python3", [SCRIPT], { cwd: repo, encoding: "utf8" });
  return { status: r.status, out: r.stdout + r.stderr };
};

beforeEach(() => {
  repo = mkdtempSync(path.join(os.tmpdir(), "armsift-fixtures-"));
  mkdirSync(path.join(repo, "tests/reference/fixtures"), { recursive: true });
  git("init", "-q");
  write("a.json", COMMITTED);
  git("add", ".");
  git("-c", "user.name=t", "-c", "user.email=t@example.invalid", "commit", "-qm", "fixtures");
});
afterEach(() => rmSync(repo, { recursive: true, force: true }));

describe("fixtures_match.py", () => {
  it("byte-identical regeneration passes", () => {
    expect(check()).toMatchObject({ status: 0 });
  });

  it("numbers a few units in the last place apart pass (another processor's BLAS)", () => {
    write("a.json", { ...COMMITTED, values: [0.30000000000000004 * (1 + 2e-16), 2109.8110293391987, 0, 3e-15] });
    const r = check();
    expect(r.status, r.out).toBe(0);
    expect(r.out).toContain("last-bit differences only");
  });

  it("a number moved beyond 1e-9 relative fails and names its path", () => {
    write("a.json", { ...COMMITTED, values: [0.3, 2109.811029 * (1 + 1e-8), -0.0, 1e-15] });
    const r = check();
    expect(r.status).toBe(1);
    expect(r.out).toContain("a.json.values[1]");
  });

  it("a changed string, flag, key or length fails", () => {
    for (const doc of [
      { ...COMMITTED, status: "unbounded" },
      { ...COMMITTED, ok: false },
      { ...COMMITTED, extra: 1 },
      { ...COMMITTED, values: COMMITTED.values.slice(1) },
      { ...COMMITTED, values: [null, ...COMMITTED.values.slice(1)] },
    ]) {
      write("a.json", doc);
      expect(check().status, JSON.stringify(doc)).toBe(1);
    }
  });

  it("a new fixture that is not committed fails", () => {
    write("b.json", { x: 1 });
    const r = check();
    expect(r.status).toBe(1);
    expect(r.out).toContain("b.json: new fixture");
  });
});
