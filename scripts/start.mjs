// `npm start`: install what is missing, migrate the database, seed the demo into an empty
// catalog, build when the sources are newer than the build, then serve in the foreground.
// Env: PORT (3000), HOST (127.0.0.1: this machine only; 0.0.0.0 for every interface),
// ARMSIFT_DB (./data/armsift.db), ARMSIFT_TRUSTED_PROXIES (none; see scripts/serve.mjs).
import { spawn } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, statSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { ensureGenerated, ensureInstalled, mustRun, nextBin, root, bin } from "./ensure.mjs";

const dbFile = path.resolve(root, process.env.ARMSIFT_DB ?? path.join("data", "armsift.db"));
const env = {
  ...process.env,
  NEXT_TELEMETRY_DISABLED: "1",
  ARMSIFT_DB: dbFile,
  DATABASE_URL: `file:${dbFile}`,
};
const port = process.env.PORT ?? "3000";
const host = process.env.HOST || "127.0.0.1";

ensureInstalled(env);
ensureGenerated(env);

mkdirSync(path.dirname(dbFile), { recursive: true });
mustRun(`migrate ${path.relative(root, dbFile) || dbFile}`, process.execPath, [path.join(root, "scripts", "prisma.mjs"), "migrate", "deploy"], env);

function armCount() {
  const Database = createRequire(import.meta.url)("better-sqlite3");
  const conn = new Database(dbFile, { readonly: true });
  try {
    return Number(conn.prepare('SELECT count(*) AS n FROM "Arm"').get().n);
  } finally {
    conn.close();
  }
}
if (armCount() === 0) mustRun("seed the demo data", bin("tsx"), ["--conditions=react-server", path.join(root, "scripts", "seed.ts")], env);

/** Newest modification time of the files that go into the build. */
function newestSource() {
  let newest = 0;
  const skip = new Set(["node_modules", ".next", "data", "generated"]);
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
  for (const p of ["app", "components", "lib", "shared", "seed-data", "public", "package.json", "package-lock.json", "next.config.mjs", "tsconfig.json", "prisma/schema.prisma"]) {
    walk(path.join(root, p));
  }
  return newest;
}
const buildId = path.join(root, ".next", "BUILD_ID");
if (!existsSync(buildId) || statSync(buildId).mtimeMs < newestSource()) {
  mustRun("next build", process.execPath, [nextBin(), "build"], env);
}

console.log(`\n▶ database ${dbFile}${host === "127.0.0.1" ? "; listening on this machine only (set HOST=0.0.0.0 to serve other machines)" : ""}`);
const server = spawn(process.execPath, [path.join(root, "scripts", "serve.mjs")], { cwd: root, env: { ...env, PORT: port, HOST: host }, stdio: "inherit" });
for (const sig of ["SIGINT", "SIGTERM"]) {
  process.on(sig, () => {
    if (server.exitCode === null) server.kill(sig);
  });
}
server.on("exit", (code, signal) => process.exit(code ?? (signal ? 128 + (signal === "SIGINT" ? 2 : 15) : 1)));
