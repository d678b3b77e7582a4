import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join("prisma", "schema.prisma"),
  async adapter() {
    const url = process.env.DATABASE_URL ?? "file:./data/armsift.db";
    return new PrismaBetterSQLite3({ url });
  },
});
