-- AlterTable
ALTER TABLE "AnalysisRun" ADD COLUMN     "resultKey" TEXT;

-- CreateTable
CREATE TABLE "AnalysisResult" (
    "key" TEXT NOT NULL,
    "analysisVersion" TEXT NOT NULL,
    "format" TEXT NOT NULL,
    "head" TEXT NOT NULL,
    "armCount" INTEGER NOT NULL,
    "bytes" INTEGER NOT NULL,
    "jsonBytes" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "AnalysisResult_pkey" PRIMARY KEY ("key")
);

-- CreateTable
CREATE TABLE "AnalysisResultArm" (
    "resultKey" TEXT NOT NULL,
    "position" INTEGER NOT NULL,
    "armId" TEXT NOT NULL,
    "data" BYTEA NOT NULL,

    CONSTRAINT "AnalysisResultArm_pkey" PRIMARY KEY ("resultKey","position")
);

-- Move the stored results into AnalysisResult, one row per analysis key (a run that reused an
-- earlier result held a copy of its JSON; the original run's copy is kept). Such results keep
-- their whole JSON ("whole-json"); results stored from now on are split per arm.
INSERT INTO "AnalysisResult" ("key", "analysisVersion", "format", "head", "armCount", "bytes", "jsonBytes", "createdAt")
SELECT DISTINCT ON ("key") "key", "analysisVersion", 'whole-json', "resultJson", 0, octet_length("resultJson"), octet_length("resultJson"), COALESCE("finishedAt", "createdAt")
FROM "AnalysisRun" WHERE "status" = 'done' AND "resultJson" IS NOT NULL
ORDER BY "key", ("reusedFromId" IS NOT NULL), "createdAt";
UPDATE "AnalysisRun" SET "resultKey" = "key" WHERE "status" = 'done' AND "resultJson" IS NOT NULL;
ALTER TABLE "AnalysisRun" DROP COLUMN "resultJson";

-- CreateIndex
CREATE INDEX "AnalysisRun_resultKey_idx" ON "AnalysisRun"("resultKey");

-- AddForeignKey
ALTER TABLE "AnalysisRun" ADD CONSTRAINT "AnalysisRun_resultKey_fkey" FOREIGN KEY ("resultKey") REFERENCES "AnalysisResult"("key") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "AnalysisResultArm" ADD CONSTRAINT "AnalysisResultArm_resultKey_fkey" FOREIGN KEY ("resultKey") REFERENCES "AnalysisResult"("key") ON DELETE CASCADE ON UPDATE CASCADE;

