import "server-only";
import Database from "better-sqlite3";
import { BUSY_TIMEOUT_MS, databaseUrl } from "./client";

/** Same text form the Prisma SQLite adapter writes for DateTime columns. */
export const sqliteDateTime = (d: Date): string => d.toISOString().replace("Z", "+00:00");

/**
 * Synchronous progress writes for an analysis run. The analysis itself is synchronous (CPU-bound),
 * so an awaited Prisma write would only land after it ends; this opens its own better-sqlite3
 * connection to the same file and writes while the analysis runs.
 */
export function openProgressWriter(runId: string, url: string = databaseUrl()): { write(progress: number, stage: string): void; close(): void } {
  const file = url.replace(/^file:/, "");
  const conn = new Database(file, { timeout: BUSY_TIMEOUT_MS });
  conn.pragma("journal_mode = WAL");
  const stmt = conn.prepare(`UPDATE "AnalysisRun" SET "progress" = ?, "stage" = ?, "heartbeatAt" = ? WHERE "id" = ? AND "status" = 'running'`);
  return {
    write(progress, stage) {
      stmt.run(Math.min(1, Math.max(0, progress)), stage.slice(0, 300), sqliteDateTime(new Date()), runId);
    },
    close() {
      conn.close();
    },
  };
}
