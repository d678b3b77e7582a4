// Compiles the analysis programs to plain JavaScript with esbuild, so a production install (no
// dev dependencies: no tsx, no TypeScript) runs them with node alone:
//   dist/jobs/analysis-thread.mjs  the worker-thread entry of one analysis
//   dist/jobs/worker.mjs           `npm run worker`, the queue worker process
//   dist/jobs/seed.mjs             the demo seed `npm start` runs on an empty catalog
// Packages stay external (resolved from node_modules at run time); `@/` paths come from tsconfig.
// `node scripts/build-jobs.mjs` builds when a source is newer than the output (`--force`: always).
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
export const outDir = path.join(root, "dist", "jobs");
const manifest = path.join(outDir, "inputs.json");
const entries = {
  "analysis-thread": path.join(root, "lib", "jobs", "analysis-thread.ts"),
  worker: path.join(root, "lib", "jobs", "worker-main.ts"),
  seed: path.join(root, "scripts", "seed.ts"),
};

const mtime = (p) => (existsSync(p) ? statSync(p).mtimeMs : -1);

/** True when an output is missing or a file that went into it changed since. */
export function jobsStale() {
  if (!existsSync(manifest)) return true;
  const outputs = Object.keys(entries).map((name) => mtime(path.join(outDir, `${name}.mjs`)));
  if (outputs.some((t) => t < 0)) return true;
  const built = Math.min(...outputs);
  const inputs = JSON.parse(readFileSync(manifest, "utf8"));
  return inputs.some((file) => mtime(path.join(root, file)) > built || !existsSync(path.join(root, file)));
}

/** Builds both programs (esbuild is a dev dependency: building needs a full install). */
export async function buildJobs() {
  const esbuild = await import("esbuild");
  mkdirSync(outDir, { recursive: true });
  const emptyServerOnly = {
    name: "server-only",
    setup(build) {
      // `server-only` guards Next bundles; outside Next it would throw on import.
      build.onResolve({ filter: /^server-only$/ }, () => ({ path: "server-only", namespace: "empty" }));
      build.onLoad({ filter: /.*/, namespace: "empty" }, () => ({ contents: "export {};", loader: "js" }));
    },
  };
  const r = await esbuild.build({
    absWorkingDir: root,
    entryPoints: entries,
    outdir: outDir,
    outExtension: { ".js": ".mjs" },
    bundle: true,
    platform: "node",
    target: "node20",
    format: "esm",
    packages: "external",
    sourcemap: "linked",
    metafile: true,
    logLevel: "warning",
    tsconfig: path.join(root, "tsconfig.json"),
    plugins: [emptyServerOnly],
    banner: { js: "// Built by scripts/build-jobs.mjs from lib/jobs; do not edit." },
  });
  const inputs = Object.keys(r.metafile.inputs).filter((f) => !f.startsWith("empty:") && !f.includes("node_modules"));
  writeFileSync(manifest, JSON.stringify(inputs.sort(), null, 1));
  return inputs.length;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  if (process.argv.includes("--force") || jobsStale()) {
    const t0 = Date.now();
    const n = await buildJobs();
    console.log(`built dist/jobs (analysis thread and worker) from ${n} files in ${Date.now() - t0} ms`);
  } else {
    console.log("dist/jobs is up to date");
  }
}
