// `npm test`: install what is missing, generate the Prisma client, then type check, lint, unit
// tests, database/API tests, production build and browser tests, stopping at the first failure.
import { existsSync } from "node:fs";
import { bin, ensureGenerated, ensureInstalled, nextBin, root, run } from "./ensure.mjs";

const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };
const started = Date.now();
const timings = [];
const secs = (ms) => `${(ms / 1000).toFixed(0)} s`;

ensureInstalled(env);
ensureGenerated(env, true);

const chromium = "/usr/bin/chromium";
const ci = Boolean(process.env.CI) && process.env.CI !== "false" && process.env.CI !== "0";
const steps = [
  ["typecheck", bin("tsc"), ["--noEmit", "-p", "tsconfig.json"]],
  ["lint", bin("eslint"), ["--max-warnings=0", "."]],
  ["unit tests", bin("vitest"), ["run", "--project", "unit"]],
  ["database and API tests", bin("vitest"), ["run", "--project", "db"]],
  ["next build", process.execPath, [nextBin(), "build"]],
  ["browser tests", bin("vitest"), ["run", "--project", "browser"]],
];

for (const [label, cmd, args] of steps) {
  if (label === "browser tests" && !existsSync(chromium)) {
    if (ci) {
      console.error(`\n✖ browser tests: ${chromium} is missing (required under CI; apt-get install -y chromium)`);
      console.log(`\nnpm test: FAILED at browser tests after ${secs(Date.now() - started)}`);
      process.exit(1);
    }
    console.log(`\n⚠ SKIPPING browser tests: ${chromium} is not installed (apt-get install -y chromium). Under CI=true this is a failure.`);
    timings.push(`${label} skipped`);
    continue;
  }
  console.log(`\n▶ ${label}`);
  const t0 = Date.now();
  const status = run(cmd, args, env);
  timings.push(`${label} ${secs(Date.now() - t0)}`);
  if (status !== 0) {
    console.log(`\nnpm test: FAILED at ${label} (exit ${status}) after ${secs(Date.now() - started)} [${timings.join(", ")}]`);
    process.exit(status);
  }
}
console.log(`\nnpm test: all steps passed in ${secs(Date.now() - started)} [${timings.join(", ")}] (root ${root})`);
