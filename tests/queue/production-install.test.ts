// An install without development dependencies runs an analysis: the compiled programs
// (dist/jobs) in a folder whose node_modules holds only the production packages of
// package-lock.json (links into this checkout's node_modules; node resolves through the links
// with --preserve-symlinks, so nothing else is reachable), a worker started from there analyses
// a queued run on the test database. No tsx, TypeScript or esbuild is needed at run time.
import { execFileSync, spawn } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { armDoc, createTestDb, requirementDoc, type TestDb } from "../db/helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { getRun, getRunResult } from "@/lib/db/shortlists";
import { createShortlistWithRun } from "@/lib/jobs/runs";
import { waitFor } from "./workers";

const ROOT = path.resolve(__dirname, "..", "..");
const lock = JSON.parse(readFileSync(path.join(ROOT, "package-lock.json"), "utf8")) as { packages: Record<string, { dev?: boolean }> };
const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { devDependencies: Record<string, string> };

/** Top-level packages an `npm ci --omit=dev` would install. */
const productionPackages = Object.entries(lock.packages)
  .filter(([key, info]) => /^node_modules\/(@[^/]+\/)?[^/]+$/.test(key) && !info.dev)
  .map(([key]) => key.slice("node_modules/".length));

let t: TestDb;
let dir: string;
beforeAll(() => {
  t = createTestDb();
  dir = mkdtempSync(path.join(os.tmpdir(), "armsift-prod-"));
  for (const name of productionPackages) {
    mkdirSync(path.dirname(path.join(dir, "node_modules", name)), { recursive: true });
    symlinkSync(path.join(ROOT, "node_modules", name), path.join(dir, "node_modules", name));
  }
  cpSync(path.join(ROOT, "dist", "jobs"), path.join(dir, "dist", "jobs"), { recursive: true });
});
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  await t?.cleanup();
});

const node = (args: string[], opts: { env?: NodeJS.ProcessEnv } = {}) =>
  execFileSync(process.execPath, ["--preserve-symlinks", "--preserve-symlinks-main", ...args], { cwd: dir, env: { ...process.env, ...opts.env }, encoding: "utf8" });

describe("an install without development dependencies", () => {
  it("has none of them: the compiled programs import only production packages", () => {
    // The build and test tools. (TypeScript stays: an optional peer of @prisma/client, which
    // npm keeps in a production install, as the lockfile's devOptional says.)
    const tools = ["tsx", "esbuild", "vitest", "eslint"];
    expect(Object.keys(pkg.devDependencies)).toEqual(expect.arrayContaining(tools));
    for (const name of tools) expect(productionPackages, name).not.toContain(name);
    // The sandbox really hides them: from inside it, tsx cannot be found; pg-boss can.
    const probe = (name: string) => node(["-e", `try { require.resolve(${JSON.stringify(name)}); console.log("found") } catch { console.log("missing") }`]).trim();
    expect(probe("tsx")).toBe("missing");
    expect(probe("esbuild")).toBe("missing");
    expect(probe("pg-boss")).toBe("found");
    for (const file of ["analysis-thread.mjs", "worker.mjs", "seed.mjs"]) {
      const code = readFileSync(path.join(ROOT, "dist", "jobs", file), "utf8");
      const imported = [...code.matchAll(/^import\s.*?from\s+"([^"]+)";?$/gm), ...code.matchAll(/\bimport\("([^"]+)"\)/g)].map((m) => m[1]);
      const packages = imported.filter((s) => !s.startsWith("node:") && !s.startsWith(".")).map((s) => (s.startsWith("@") ? s.split("/").slice(0, 2).join("/") : s.split("/")[0]));
      for (const p of packages) expect(productionPackages, `${file} imports ${p}`).toContain(p);
    }
  });

  it("runs an analysis: a worker started from it analyses a queued run", async () => {
    const arm = (await createArm(null, armDoc())).id;
    const set = (await createRequirementSet(null, requirementDoc({ name: "Production install cell" }))).id;
    const { run } = await createShortlistWithRun(null, { name: "Production install", requirementSetId: set, armIds: [arm] });
    let out = "";
    const child = spawn(process.execPath, ["--preserve-symlinks", "--preserve-symlinks-main", path.join(dir, "dist", "jobs", "worker.mjs")], {
      cwd: dir,
      env: { ...process.env, DATABASE_URL: t.url, NODE_ENV: "production", ARMSIFT_WORKER_CONCURRENCY: "1", ARMSIFT_WORKER_POLL_SECONDS: "0.5" },
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout!.on("data", (d) => (out += d));
    child.stderr!.on("data", (d) => (out += d));
    try {
      const done = await waitFor("the run analysed", async () => {
        const r = await getRun(run.id);
        if (child.exitCode !== null) throw new Error(`the worker exited with ${child.exitCode}:\n${out}`);
        return r?.status === "done" || r?.status === "failed" ? r : undefined;
      }, 90_000, 250);
      expect(done.status, `${done.error}\n${out}`).toBe("done");
      expect((await getRunResult(run.id))!.arms).toHaveLength(1);
    } finally {
      try {
        process.kill(-child.pid!, "SIGKILL");
      } catch {
        // already gone
      }
    }
  }, 120_000);
});
