// Runs the Prisma CLI without downloaded engines (see DEVELOPERS.md, "Prisma without engines").
// The provider follows DATABASE_URL: postgresql://… (or postgres://…) works on prisma/postgres,
// anything else on prisma/sqlite (default file ./data/armsift.db, or ARMSIFT_DB).
// `generate` without DATABASE_URL generates the clients of both providers.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const bin = path.join(root, "node_modules", "prisma", "build", "index.js");
const args = process.argv.slice(2);
if (!existsSync(bin)) {
  console.error("prisma is not installed yet; run npm install");
  process.exit(args.includes("generate") ? 0 : 1);
}

/** "postgres" for a postgresql:// or postgres:// URL, else "sqlite". */
function providerOf(url) {
  return /^postgres(ql)?:\/\//i.test(url ?? "") ? "postgres" : "sqlite";
}

const engineEnv = {
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? "/bin/true",
  PRISMA_QUERY_ENGINE_LIBRARY: process.env.PRISMA_QUERY_ENGINE_LIBRARY ?? "/bin/true",
  CHECKPOINT_DISABLE: "1",
  PRISMA_HIDE_UPDATE_MESSAGE: "1",
};

function prisma(provider, url) {
  const env = { ...process.env, ...engineEnv, DB_PROVIDER: provider, DATABASE_URL: url };
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, env, stdio: "inherit" });
  return r.status ?? 1;
}

const url = process.env.DATABASE_URL ?? `file:${process.env.ARMSIFT_DB ?? "./data/armsift.db"}`;
if (args[0] === "generate" && !process.env.DATABASE_URL) {
  // Both clients exist side by side: DATABASE_URL picks one at run time.
  const sqlite = prisma("sqlite", url);
  if (sqlite !== 0) process.exit(sqlite);
  process.exit(prisma("postgres", "postgresql://generate@localhost/generate"));
}
process.exit(prisma(providerOf(url), url));
