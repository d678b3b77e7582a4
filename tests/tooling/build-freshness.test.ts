// The browser tests rebuild when the production build is older than a source file
// (tests/helpers/build-freshness.ts), so `npm run test:browser` never drives stale pages.
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { buildIsStale } from "../helpers/build-freshness";

const dirs: string[] = [];
afterEach(() => {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

function tree(): string {
  const root = mkdtempSync(path.join(os.tmpdir(), "armsift-build-"));
  dirs.push(root);
  mkdirSync(path.join(root, "app", "arms"), { recursive: true });
  mkdirSync(path.join(root, ".next"));
  writeFileSync(path.join(root, "app", "arms", "page.tsx"), "export default 1;\n");
  return root;
}

/** Sets the access and modification time of one file or folder (seconds since the epoch). */
const touch = (file: string, seconds: number) => utimesSync(file, seconds, seconds);

describe("buildIsStale", () => {
  it("is stale without a build", () => {
    expect(buildIsStale(tree())).toBe(true);
  });

  it("is fresh when the build is newer than every source, stale once a nested source is newer", () => {
    const root = tree();
    const page = path.join(root, "app", "arms", "page.tsx");
    const buildId = path.join(root, ".next", "BUILD_ID");
    writeFileSync(buildId, "x");
    for (const p of [page, path.join(root, "app", "arms"), path.join(root, "app")]) touch(p, 1_000);
    touch(buildId, 2_000);
    expect(buildIsStale(root)).toBe(false);
    touch(page, 3_000);
    expect(buildIsStale(root)).toBe(true);
  });

  it("ignores files outside the build inputs (tests, docs)", () => {
    const root = tree();
    const buildId = path.join(root, ".next", "BUILD_ID");
    writeFileSync(buildId, "x");
    for (const p of [path.join(root, "app", "arms", "page.tsx"), path.join(root, "app", "arms"), path.join(root, "app")]) touch(p, 1_000);
    touch(buildId, 2_000);
    mkdirSync(path.join(root, "tests"));
    writeFileSync(path.join(root, "tests", "a.test.ts"), "");
    touch(path.join(root, "tests", "a.test.ts"), 3_000);
    expect(buildIsStale(root)).toBe(false);
  });
});
