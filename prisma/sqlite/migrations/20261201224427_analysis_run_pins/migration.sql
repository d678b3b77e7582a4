-- AlterTable
ALTER TABLE "AnalysisRun" ADD COLUMN "heartbeatAt" DATETIME;
ALTER TABLE "AnalysisRun" ADD COLUMN "pins" TEXT;
ALTER TABLE "AnalysisRun" ADD COLUMN "reusedFromId" TEXT;

