// `npm start`: install what is missing, migrate the database (skipped when nothing is pending),
// seed the demo into an empty catalog, build when the sources are newer than the build, then
// serve in the foreground (scripts/serve.mjs).
// Env: PORT (3000), HOST (127.0.0.1: this machine only; 0.0.0.0 for every interface),
// ARMSIFT_DB (./data/armsift.db), or DATABASE_URL=postgresql://… for the team set-up (then
// `npm run worker` analyses; see the README), ARMSIFT_TRUSTED_PROXIES (none; see scripts/serve.mjs).
import { spawn } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { ensureGenerated, ensureInstalled, mustRun, nextBin, root } from "./ensure.mjs";
import { armCount, pendingMigrations, providerOf } from "./migrations.mjs";

const postgres = providerOf(process.env.DATABASE_URL) === "postgres";
const dbFile = path.resolve(root, process.env.ARMSIFT_DB ?? path.join("data", "armsift.db"));
const env = {
  ...process.env,
  NEXT_TELEMETRY_DISABLED: "1",
  ...(postgres ? {} : { ARMSIFT_DB: dbFile, DATABASE_URL: `file:${dbFile}` }),
};
const where = postgres ? new URL(env.DATABASE_URL).host + new URL(env.DATABASE_URL).pathname : path.relative(root, dbFile) || dbFile;
const port = process.env.PORT ?? "3000";
const host = process.env.HOST || "127.0.0.1";

ensureInstalled(env);
ensureGenerated(env);

// The analysis programs and the seed, compiled (a full install rebuilds them when sources changed).
const jobs = await import("./build-jobs.mjs");
if (jobs.jobsStale()) {
  if (existsSync(path.join(root, "node_modules", "esbuild"))) {
    console.log("\n▶ build the analysis programs");
    await jobs.buildJobs();
  } else if (!existsSync(path.join(jobs.outDir, "analysis-thread.mjs"))) {
    console.error("✖ dist/jobs is missing and esbuild is not installed: run `npm run build` with the development dependencies first");
    process.exit(1);
  }
}

if (!postgres) mkdirSync(path.dirname(dbFile), { recursive: true });
// Skipping an up-to-date database keeps the start independent of other processes using it.
const pending = await pendingMigrations(env.DATABASE_URL).catch((err) => {
  console.error(`✖ cannot read the database ${where}: ${err.message}`);
  process.exit(1);
});
if (pending.length === 0) {
  console.log(`\n▶ database ${where} is up to date (no pending migrations); migrate deploy skipped`);
} else {
  mustRun(`migrate ${where}: ${pending.length} pending (${pending.join(", ")})`, process.execPath, [path.join(root, "scripts", "prisma.mjs"), "migrate", "deploy"], env);
}

if ((await armCount(env.DATABASE_URL)) === 0) mustRun("seed the demo data", process.execPath, [path.join(jobs.outDir, "seed.mjs")], env);

/** Newest modification time of the files that go into the build. */
function newestSource() {
  let newest = 0;
  const skip = new Set(["node_modules", ".next", "data", "generated", "generated-pg"]);
  const walk = (p) => {
    let st;
    try {
      st = statSync(p);
    } catch {
      return;
    }
    if (st.isDirectory()) {
      for (const name of readdirSync(p)) if (!skip.has(name)) walk(path.join(p, name));
    } else if (st.mtimeMs > newest) newest = st.mtimeMs;
  };
  for (const p of ["app", "components", "lib", "shared", "seed-data", "public", "package.json", "package-lock.json", "next.config.mjs", "tsconfig.json", "instrumentation.ts", "prisma"]) {
    walk(path.join(root, p));
  }
  return newest;
}
const buildId = path.join(root, ".next", "BUILD_ID");
if (!existsSync(buildId) || statSync(buildId).mtimeMs < newestSource()) {
  mustRun("next build", process.execPath, [nextBin(), "build"], env);
}

console.log(`\n▶ database ${where}${host === "127.0.0.1" ? "; listening on this machine only (set HOST=0.0.0.0 to serve other machines)" : ""}`);
const server = spawn(process.execPath, [path.join(root, "scripts", "serve.mjs")], { cwd: root, env: { ...env, PORT: port, HOST: host }, stdio: "inherit" });
for (const sig of ["SIGINT", "SIGTERM"]) {
  process.on(sig, () => {
    if (server.exitCode === null) server.kill(sig);
  });
}
server.on("exit", (code, signal) => process.exit(code ?? (signal ? 128 + (signal === "SIGINT" ? 2 : 15) : 1)));
