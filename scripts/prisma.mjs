// Runs the Prisma CLI without downloaded engines (see DEVELOPERS.md, "Prisma without engines").
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const bin = path.join(root, "node_modules", "prisma", "build", "index.js");
if (!existsSync(bin)) {
  console.error("prisma is not installed yet; run npm install");
  process.exit(process.argv.includes("generate") ? 0 : 1);
}
const env = {
  ...process.env,
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? "/bin/true",
  PRISMA_QUERY_ENGINE_LIBRARY: process.env.PRISMA_QUERY_ENGINE_LIBRARY ?? "/bin/true",
  CHECKPOINT_DISABLE: "1",
  PRISMA_HIDE_UPDATE_MESSAGE: "1",
  DATABASE_URL: process.env.DATABASE_URL ?? `file:${process.env.ARMSIFT_DB ?? "./data/armsift.db"}`,
};
const r = spawnSync(process.execPath, [bin, ...process.argv.slice(2)], { cwd: root, env, stdio: "inherit" });
process.exit(r.status ?? 1);
