import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";

type Adapter = Awaited<ReturnType<PrismaBetterSQLite3["connect"]>>;

/**
 * The migration engine replays existing migrations into an in-memory shadow database when it
 * diffs from `prisma/migrations`. The adapter sends raw SQL through better-sqlite3's prepare(),
 * which takes one statement only (error P3006 on multi-statement migrations, triggers included).
 * This factory routes argument-less raw SQL on the shadow connection through executeScript.
 */
class MigrationAdapterFactory extends PrismaBetterSQLite3 {
  override async connectToShadowDb(): Promise<Adapter> {
    const adapter = (await super.connectToShadowDb()) as Adapter;
    const executeRaw = adapter.executeRaw.bind(adapter);
    const queryRaw = adapter.queryRaw.bind(adapter);
    adapter.executeRaw = async (query) => {
      if (query.args.length > 0) return executeRaw(query);
      await adapter.executeScript(query.sql);
      return 0;
    };
    adapter.queryRaw = async (query) => {
      if (query.args.length > 0 || !/;\s*\S/.test(query.sql)) return queryRaw(query);
      await adapter.executeScript(query.sql);
      return { columnNames: [], columnTypes: [], rows: [] };
    };
    return adapter;
  }
}

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join("prisma", "schema.prisma"),
  async adapter() {
    const url = process.env.DATABASE_URL ?? "file:./data/armsift.db";
    return new MigrationAdapterFactory({ url });
  },
});
