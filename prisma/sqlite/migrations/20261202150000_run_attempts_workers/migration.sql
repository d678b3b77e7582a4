-- CreateTable
CREATE TABLE "WorkerProcess" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "host" TEXT NOT NULL,
    "pid" INTEGER NOT NULL,
    "concurrency" INTEGER NOT NULL,
    "startedAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "lastSeenAt" DATETIME NOT NULL,
    "stoppedAt" DATETIME,
    "runIds" TEXT
);

-- RedefineTables
PRAGMA defer_foreign_keys=ON;
PRAGMA foreign_keys=OFF;
CREATE TABLE "new_AnalysisRun" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "shortlistId" TEXT NOT NULL,
    "key" TEXT NOT NULL,
    "analysisVersion" TEXT NOT NULL,
    "status" TEXT NOT NULL,
    "progress" REAL NOT NULL DEFAULT 0,
    "stage" TEXT,
    "error" TEXT,
    "resultJson" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "startedAt" DATETIME,
    "finishedAt" DATETIME,
    "pins" TEXT,
    "heartbeatAt" DATETIME,
    "reusedFromId" TEXT,
    "attempt" INTEGER NOT NULL DEFAULT 0,
    "runner" TEXT,
    CONSTRAINT "AnalysisRun_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist" ("id") ON DELETE CASCADE ON UPDATE CASCADE
);
INSERT INTO "new_AnalysisRun" ("analysisVersion", "createdAt", "error", "finishedAt", "heartbeatAt", "id", "key", "pins", "progress", "resultJson", "reusedFromId", "shortlistId", "stage", "startedAt", "status") SELECT "analysisVersion", "createdAt", "error", "finishedAt", "heartbeatAt", "id", "key", "pins", "progress", "resultJson", "reusedFromId", "shortlistId", "stage", "startedAt", "status" FROM "AnalysisRun";
DROP TABLE "AnalysisRun";
ALTER TABLE "new_AnalysisRun" RENAME TO "AnalysisRun";
CREATE INDEX "AnalysisRun_shortlistId_createdAt_idx" ON "AnalysisRun"("shortlistId", "createdAt");
CREATE INDEX "AnalysisRun_key_idx" ON "AnalysisRun"("key");
CREATE INDEX "AnalysisRun_status_createdAt_idx" ON "AnalysisRun"("status", "createdAt");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;

-- CreateIndex
CREATE INDEX "WorkerProcess_lastSeenAt_idx" ON "WorkerProcess"("lastSeenAt");

