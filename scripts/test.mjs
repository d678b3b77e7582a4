// `npm test`: install what is missing, generate the Prisma client, then type check, lint, unit
// tests, database/API tests, production build and browser tests, stopping at the first failure.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { bin, ensureGenerated, ensureInstalled, nextBin, root, run } from "./ensure.mjs";

const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };
const started = Date.now();
const timings = [];
const secs = (ms) => `${(ms / 1000).toFixed(0)} s`;

ensureInstalled(env);
ensureGenerated(env, true);

const chromium = "/usr/bin/chromium";
const ci = Boolean(process.env.CI) && process.env.CI !== "false" && process.env.CI !== "0";
// Each vitest run also writes a JSON report so the closing line can count every test.
const reports = mkdtempSync(path.join(tmpdir(), "armsift-test-"));
const vitest = (project) => [
  "run", "--project", project, "--reporter=default", "--reporter=json", `--outputFile.json=${path.join(reports, `${project}.json`)}`,
];
const steps = [
  ["typecheck", bin("tsc"), ["--noEmit", "-p", "tsconfig.json"]],
  ["lint", bin("eslint"), ["--max-warnings=0", "."]],
  ["unit tests", bin("vitest"), vitest("unit")],
  ["database and API tests", bin("vitest"), vitest("db")],
  ["next build", process.execPath, [nextBin(), "build"]],
  ["browser tests", bin("vitest"), vitest("browser")],
];

// Red unless NO_COLOR is set (https://no-color.org), so a skip stands out in a log as well.
const red = (text) => (process.env.NO_COLOR ? text : `\x1b[1;31m${text}\x1b[0m`);
// Tests of a step that did not run (the browser project without Chromium): counted as skipped.
let notRun = 0;

/** Number of tests in a project, from `vitest list` (collects the files, runs nothing). */
function listed(project) {
  const file = path.join(reports, `${project}-list.json`);
  spawnSync(bin("vitest"), ["list", "--project", project, `--json=${file}`], { cwd: root, env, stdio: "ignore" });
  if (!existsSync(file)) return 0;
  return JSON.parse(readFileSync(file, "utf8")).length;
}

/**
 * Sums passed / failed / skipped over the JSON reports written so far, plus the tests not run,
 * and the test files that failed without a failing test (a hook that threw or timed out: their
 * tests are reported as skipped, so the file must be counted or the failure would not show).
 */
function counts() {
  let passed = 0, failed = 0, skipped = notRun, brokenFiles = 0;
  for (const project of ["unit", "db", "browser"]) {
    const file = path.join(reports, `${project}.json`);
    if (!existsSync(file)) continue;
    const r = JSON.parse(readFileSync(file, "utf8"));
    passed += r.numPassedTests ?? 0;
    failed += r.numFailedTests ?? 0;
    skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
    for (const f of r.testResults ?? []) {
      if (f.status === "failed" && !(f.assertionResults ?? []).some((a) => a.status === "failed")) brokenFiles++;
    }
  }
  const line = `${passed} passed, ${failed} failed, ${skipped} skipped` + (brokenFiles ? `, ${brokenFiles} test file${brokenFiles === 1 ? "" : "s"} failed to run` : "");
  return skipped || brokenFiles ? red(line) : line;
}

for (const [label, cmd, args] of steps) {
  if (label === "browser tests" && !existsSync(chromium)) {
    if (ci) {
      console.error(`\n✖ browser tests: ${chromium} is missing (required under CI; apt-get install -y chromium)`);
      console.log(`\nnpm test: FAILED at browser tests after ${secs(Date.now() - started)}`);
      console.log(`tests: ${counts()}`);
      process.exit(1);
    }
    notRun += listed("browser");
    console.log(red(`\n⚠ SKIPPED ${notRun} browser tests: ${chromium} is not installed (apt-get install -y chromium). Under CI=true this is a failure.`));
    timings.push(`${label} skipped`);
    continue;
  }
  console.log(`\n▶ ${label}`);
  const t0 = Date.now();
  const status = run(cmd, args, env);
  timings.push(`${label} ${secs(Date.now() - t0)}`);
  if (status !== 0) {
    console.log(`\nnpm test: FAILED at ${label} (exit ${status}) after ${secs(Date.now() - started)} [${timings.join(", ")}]`);
    console.log(`tests: ${counts()}`);
    rmSync(reports, { recursive: true, force: true });
    process.exit(status);
  }
}
const closing = `npm test: ${notRun ? "every step that ran passed (browser tests SKIPPED)" : "all steps passed"} in ${secs(Date.now() - started)} [${timings.join(", ")}] (root ${root})`;
console.log(`\n${notRun ? red(closing) : closing}`);
console.log(`tests: ${counts()}`);
rmSync(reports, { recursive: true, force: true });
