-- AlterTable
ALTER TABLE "AnalysisRun" ADD COLUMN     "attempt" INTEGER NOT NULL DEFAULT 0,
ADD COLUMN     "runner" TEXT;

-- CreateTable
CREATE TABLE "WorkerProcess" (
    "id" TEXT NOT NULL,
    "host" TEXT NOT NULL,
    "pid" INTEGER NOT NULL,
    "concurrency" INTEGER NOT NULL,
    "startedAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "lastSeenAt" TIMESTAMP(3) NOT NULL,
    "stoppedAt" TIMESTAMP(3),
    "runIds" TEXT,

    CONSTRAINT "WorkerProcess_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE INDEX "WorkerProcess_lastSeenAt_idx" ON "WorkerProcess"("lastSeenAt");

-- CreateIndex
CREATE INDEX "AnalysisRun_status_createdAt_idx" ON "AnalysisRun"("status", "createdAt");

