-- CreateTable
CREATE TABLE "AnalysisResult" (
    "key" TEXT NOT NULL PRIMARY KEY,
    "analysisVersion" TEXT NOT NULL,
    "format" TEXT NOT NULL,
    "head" TEXT NOT NULL,
    "armCount" INTEGER NOT NULL,
    "bytes" INTEGER NOT NULL,
    "jsonBytes" INTEGER NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "AnalysisResultArm" (
    "resultKey" TEXT NOT NULL,
    "position" INTEGER NOT NULL,
    "armId" TEXT NOT NULL,
    "data" BLOB NOT NULL,

    PRIMARY KEY ("resultKey", "position"),
    CONSTRAINT "AnalysisResultArm_resultKey_fkey" FOREIGN KEY ("resultKey") REFERENCES "AnalysisResult" ("key") ON DELETE CASCADE ON UPDATE CASCADE
);

-- Move the stored results into AnalysisResult, one row per analysis key (a run that reused an
-- earlier result held a copy of its JSON; the original run's copy is kept). Such results keep
-- their whole JSON ("whole-json"); results stored from now on are split per arm.
INSERT OR IGNORE INTO "AnalysisResult" ("key", "analysisVersion", "format", "head", "armCount", "bytes", "jsonBytes", "createdAt")
SELECT "key", "analysisVersion", 'whole-json', "resultJson", 0, length(CAST("resultJson" AS BLOB)), length(CAST("resultJson" AS BLOB)), COALESCE("finishedAt", "createdAt")
FROM "AnalysisRun" WHERE "status" = 'done' AND "resultJson" IS NOT NULL
ORDER BY ("reusedFromId" IS NOT NULL), "createdAt";

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
    "resultKey" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "startedAt" DATETIME,
    "finishedAt" DATETIME,
    "pins" TEXT,
    "heartbeatAt" DATETIME,
    "reusedFromId" TEXT,
    "attempt" INTEGER NOT NULL DEFAULT 0,
    "runner" TEXT,
    CONSTRAINT "AnalysisRun_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "AnalysisRun_resultKey_fkey" FOREIGN KEY ("resultKey") REFERENCES "AnalysisResult" ("key") ON DELETE RESTRICT ON UPDATE CASCADE
);
INSERT INTO "new_AnalysisRun" ("analysisVersion", "attempt", "createdAt", "error", "finishedAt", "heartbeatAt", "id", "key", "pins", "progress", "reusedFromId", "runner", "shortlistId", "stage", "startedAt", "status", "resultKey") SELECT "analysisVersion", "attempt", "createdAt", "error", "finishedAt", "heartbeatAt", "id", "key", "pins", "progress", "reusedFromId", "runner", "shortlistId", "stage", "startedAt", "status", CASE WHEN "status" = 'done' AND "resultJson" IS NOT NULL THEN "key" END FROM "AnalysisRun";
DROP TABLE "AnalysisRun";
ALTER TABLE "new_AnalysisRun" RENAME TO "AnalysisRun";
CREATE INDEX "AnalysisRun_shortlistId_createdAt_idx" ON "AnalysisRun"("shortlistId", "createdAt");
CREATE INDEX "AnalysisRun_key_idx" ON "AnalysisRun"("key");
CREATE INDEX "AnalysisRun_status_createdAt_idx" ON "AnalysisRun"("status", "createdAt");
CREATE INDEX "AnalysisRun_resultKey_idx" ON "AnalysisRun"("resultKey");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;

