// Shared by start.mjs and test.mjs: install dependencies when missing or stale, generate the
// Prisma client when missing or older than the schema, and small helpers to run steps.
import { spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import path from "node:path";

export const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");

const mtime = (p) => (existsSync(p) ? statSync(p).mtimeMs : -1);

/** Runs a command from the project root with inherited output; returns the exit status. */
export function run(cmd, args, env = process.env) {
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: "inherit" });
  if (r.error) console.error(`${cmd}: ${r.error.message}`);
  return r.status ?? 1;
}

/** Runs a step and exits the process with its status when it fails. */
export function mustRun(label, cmd, args, env) {
  console.log(`\n▶ ${label}`);
  const status = run(cmd, args, env);
  if (status !== 0) {
    console.error(`✖ ${label} failed (exit ${status})`);
    process.exit(status);
  }
}

/** npm ci when node_modules is missing or package-lock.json is newer than the installed tree. */
export function ensureInstalled(env = process.env) {
  const lock = path.join(root, "package-lock.json");
  const installed = path.join(root, "node_modules", ".package-lock.json");
  if (!existsSync(path.join(root, "node_modules")) || mtime(lock) > mtime(installed)) {
    mustRun("npm ci (dependencies missing or package-lock.json changed)", "npm", ["ci", "--no-audit", "--no-fund"], env);
  }
}

/** prisma generate (both providers' clients) when one is missing or older than the schema. */
export function ensureGenerated(env = process.env, force = false) {
  const schema = Math.max(...["models.prisma", "sqlite/schema.prisma", "postgres/schema.prisma"].map((f) => mtime(path.join(root, "prisma", f))));
  const oldest = Math.min(...["generated", "generated-pg"].map((d) => mtime(path.join(root, "lib", "db", d, "client.ts"))));
  if (force || oldest < schema) {
    const { DATABASE_URL: _url, ...rest } = env;
    mustRun("prisma generate", process.execPath, [path.join(root, "scripts", "prisma.mjs"), "generate"], rest);
  }
}

export const bin = (name) => path.join(root, "node_modules", ".bin", name);
export const nextBin = () => path.join(root, "node_modules", "next", "dist", "bin", "next");
