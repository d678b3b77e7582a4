// `npm test`: install what is missing, generate the Prisma clients, then type check, lint, unit
// tests, database/API tests (SQLite, then PostgreSQL), queue tests, production build and browser
// tests, stopping at the first failure.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import net from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { bin, ensureGenerated, ensureInstalled, root, run } from "./ensure.mjs";

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
// The PostgreSQL suites run when the server of ARMSIFT_TEST_PG_URL (else a postgresql://
// DATABASE_URL, else 127.0.0.1:5432) answers; under CI it must (.ci/run starts it).
const pgUrl = new URL(process.env.ARMSIFT_TEST_PG_URL ?? (/^postgres(ql)?:/.test(process.env.DATABASE_URL ?? "") ? process.env.DATABASE_URL : "postgresql://127.0.0.1:5432/postgres"));
const pgReachable = await new Promise((resolve) => {
  const socket = net.connect({ host: pgUrl.hostname, port: Number(pgUrl.port || 5432) });
  const done = (ok) => (socket.destroy(), resolve(ok));
  socket.setTimeout(1500, () => done(false));
  socket.once("connect", () => done(true));
  socket.once("error", () => done(false));
});
const steps = [
  ["typecheck", bin("tsc"), ["--noEmit", "-p", "tsconfig.json"]],
  ["lint", bin("eslint"), ["--max-warnings=0", "."]],
  ["unit tests", bin("vitest"), vitest("unit")],
  ["database and API tests", bin("vitest"), vitest("db")],
  ["database and API tests on PostgreSQL", bin("vitest"), vitest("db-pg")],
  ["next build", "npm", ["run", "build"]],
  // After the build: the queue project also restarts the built server during a run.
  ["queue tests on PostgreSQL (worker processes)", bin("vitest"), vitest("queue")],
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
  for (const project of ["unit", "db", "db-pg", "queue", "browser"]) {
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
  if (label.includes("PostgreSQL") && !pgReachable) {
    if (ci) {
      console.error(`\n✖ ${label}: PostgreSQL at ${pgUrl.host} is not reachable (required under CI; .ci/run starts it)`);
      console.log(`\nnpm test: FAILED at ${label} after ${secs(Date.now() - started)}`);
      process.exit(1);
    }
    const n = listed(args[args.indexOf("--project") + 1]);
    notRun += n;
    console.log(red(`\n⚠ SKIPPED ${n} ${label}: PostgreSQL at ${pgUrl.host} is not reachable (set ARMSIFT_TEST_PG_URL or start it). Under CI=true this is a failure.`));
    timings.push(`${label} skipped`);
    continue;
  }
  if (label === "browser tests" && !existsSync(chromium)) {
    if (ci) {
      console.error(`\n✖ browser tests: ${chromium} is missing (required under CI; apt-get install -y chromium)`);
      console.log(`\nnpm test: FAILED at browser tests after ${secs(Date.now() - started)}`);
      console.log(`tests: ${counts()}`);
      process.exit(1);
    }
    const n = listed("browser");
    notRun += n;
    console.log(red(`\n⚠ SKIPPED ${n} browser tests: ${chromium} is not installed (apt-get install -y chromium). Under CI=true this is a failure.`));
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
const closing = `npm test: ${notRun ? "every step that ran passed (some tests SKIPPED)" : "all steps passed"} in ${secs(Date.now() - started)} [${timings.join(", ")}] (root ${root})`;
console.log(`\n${notRun ? red(closing) : closing}`);
console.log(`tests: ${counts()}`);
rmSync(reports, { recursive: true, force: true });
