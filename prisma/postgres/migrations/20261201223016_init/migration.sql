-- CreateSchema
CREATE SCHEMA IF NOT EXISTS "public";

-- CreateTable
CREATE TABLE "User" (
    "id" TEXT NOT NULL,
    "email" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "role" TEXT NOT NULL,
    "passwordHash" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "User_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Session" (
    "id" TEXT NOT NULL,
    "userId" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "Session_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Arm" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "maker" TEXT,
    "modelCode" TEXT,
    "axes" INTEGER NOT NULL,
    "currentRevision" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    "updatedById" TEXT,
    "deletedAt" TIMESTAMP(3),

    CONSTRAINT "Arm_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ArmRevision" (
    "id" TEXT NOT NULL,
    "armId" TEXT NOT NULL,
    "revision" INTEGER NOT NULL,
    "document" TEXT NOT NULL,
    "summary" TEXT NOT NULL,
    "authorId" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "ArmRevision_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RequirementSet" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "targets" INTEGER NOT NULL,
    "paths" INTEGER NOT NULL,
    "currentRevision" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    "updatedById" TEXT,
    "deletedAt" TIMESTAMP(3),

    CONSTRAINT "RequirementSet_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RequirementRevision" (
    "id" TEXT NOT NULL,
    "setId" TEXT NOT NULL,
    "revision" INTEGER NOT NULL,
    "document" TEXT NOT NULL,
    "summary" TEXT NOT NULL,
    "authorId" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "RequirementRevision_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Shortlist" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "requirementSetId" TEXT NOT NULL,
    "requirementRevision" INTEGER NOT NULL,
    "createdById" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    "weights" TEXT,
    "deletedAt" TIMESTAMP(3),

    CONSTRAINT "Shortlist_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ShortlistArm" (
    "shortlistId" TEXT NOT NULL,
    "armId" TEXT NOT NULL,
    "armRevision" INTEGER NOT NULL,
    "position" INTEGER NOT NULL DEFAULT 0,
    "addedAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "ShortlistArm_pkey" PRIMARY KEY ("shortlistId","armId")
);

-- CreateTable
CREATE TABLE "AnalysisRun" (
    "id" TEXT NOT NULL,
    "shortlistId" TEXT NOT NULL,
    "key" TEXT NOT NULL,
    "analysisVersion" TEXT NOT NULL,
    "status" TEXT NOT NULL,
    "progress" DOUBLE PRECISION NOT NULL DEFAULT 0,
    "stage" TEXT,
    "error" TEXT,
    "resultJson" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "startedAt" TIMESTAMP(3),
    "finishedAt" TIMESTAMP(3),
    "pins" TEXT,
    "heartbeatAt" TIMESTAMP(3),
    "reusedFromId" TEXT,

    CONSTRAINT "AnalysisRun_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Comment" (
    "id" TEXT NOT NULL,
    "shortlistId" TEXT NOT NULL,
    "parentId" TEXT,
    "anchorType" TEXT NOT NULL,
    "anchorId" TEXT,
    "authorId" TEXT,
    "authorLabel" TEXT,
    "shareLinkId" TEXT,
    "clientKey" TEXT,
    "body" TEXT NOT NULL,
    "revision" INTEGER NOT NULL DEFAULT 1,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    "editedAt" TIMESTAMP(3),
    "resolvedAt" TIMESTAMP(3),
    "resolvedById" TEXT,
    "deletedAt" TIMESTAMP(3),
    "deletedById" TEXT,

    CONSTRAINT "Comment_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CommentRevision" (
    "id" TEXT NOT NULL,
    "commentId" TEXT NOT NULL,
    "revision" INTEGER NOT NULL,
    "body" TEXT NOT NULL,
    "editorId" TEXT,
    "editorLabel" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "CommentRevision_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CommentMention" (
    "commentId" TEXT NOT NULL,
    "userId" TEXT NOT NULL,

    CONSTRAINT "CommentMention_pkey" PRIMARY KEY ("commentId","userId")
);

-- CreateTable
CREATE TABLE "CommentRead" (
    "userId" TEXT NOT NULL,
    "shortlistId" TEXT NOT NULL,
    "lastReadAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "CommentRead_pkey" PRIMARY KEY ("userId","shortlistId")
);

-- CreateTable
CREATE TABLE "ShareLink" (
    "id" TEXT NOT NULL,
    "shortlistId" TEXT NOT NULL,
    "tokenHash" TEXT NOT NULL,
    "access" TEXT NOT NULL,
    "label" TEXT,
    "createdById" TEXT,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMP(3),
    "revokedAt" TIMESTAMP(3),
    "revokedById" TEXT,
    "hidePrices" BOOLEAN NOT NULL DEFAULT false,

    CONSTRAINT "ShareLink_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AuditEvent" (
    "id" TEXT NOT NULL,
    "at" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "actorId" TEXT,
    "action" TEXT NOT NULL,
    "entityType" TEXT NOT NULL,
    "entityId" TEXT NOT NULL,
    "detail" TEXT,

    CONSTRAINT "AuditEvent_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE UNIQUE INDEX "User_email_key" ON "User"("email");

-- CreateIndex
CREATE INDEX "Session_userId_idx" ON "Session"("userId");

-- CreateIndex
CREATE INDEX "Session_expiresAt_idx" ON "Session"("expiresAt");

-- CreateIndex
CREATE INDEX "Arm_deletedAt_idx" ON "Arm"("deletedAt");

-- CreateIndex
CREATE INDEX "Arm_name_idx" ON "Arm"("name");

-- CreateIndex
CREATE UNIQUE INDEX "ArmRevision_armId_revision_key" ON "ArmRevision"("armId", "revision");

-- CreateIndex
CREATE INDEX "RequirementSet_deletedAt_idx" ON "RequirementSet"("deletedAt");

-- CreateIndex
CREATE INDEX "RequirementSet_name_idx" ON "RequirementSet"("name");

-- CreateIndex
CREATE UNIQUE INDEX "RequirementRevision_setId_revision_key" ON "RequirementRevision"("setId", "revision");

-- CreateIndex
CREATE INDEX "Shortlist_requirementSetId_idx" ON "Shortlist"("requirementSetId");

-- CreateIndex
CREATE INDEX "AnalysisRun_shortlistId_createdAt_idx" ON "AnalysisRun"("shortlistId", "createdAt");

-- CreateIndex
CREATE INDEX "AnalysisRun_key_idx" ON "AnalysisRun"("key");

-- CreateIndex
CREATE INDEX "Comment_shortlistId_createdAt_idx" ON "Comment"("shortlistId", "createdAt");

-- CreateIndex
CREATE INDEX "Comment_parentId_idx" ON "Comment"("parentId");

-- CreateIndex
CREATE UNIQUE INDEX "Comment_shortlistId_clientKey_key" ON "Comment"("shortlistId", "clientKey");

-- CreateIndex
CREATE UNIQUE INDEX "CommentRevision_commentId_revision_key" ON "CommentRevision"("commentId", "revision");

-- CreateIndex
CREATE INDEX "CommentMention_userId_idx" ON "CommentMention"("userId");

-- CreateIndex
CREATE UNIQUE INDEX "ShareLink_tokenHash_key" ON "ShareLink"("tokenHash");

-- CreateIndex
CREATE INDEX "ShareLink_shortlistId_idx" ON "ShareLink"("shortlistId");

-- CreateIndex
CREATE INDEX "AuditEvent_entityType_entityId_at_idx" ON "AuditEvent"("entityType", "entityId", "at");

-- CreateIndex
CREATE INDEX "AuditEvent_at_idx" ON "AuditEvent"("at");

-- AddForeignKey
ALTER TABLE "Session" ADD CONSTRAINT "Session_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Arm" ADD CONSTRAINT "Arm_updatedById_fkey" FOREIGN KEY ("updatedById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ArmRevision" ADD CONSTRAINT "ArmRevision_armId_fkey" FOREIGN KEY ("armId") REFERENCES "Arm"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ArmRevision" ADD CONSTRAINT "ArmRevision_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RequirementSet" ADD CONSTRAINT "RequirementSet_updatedById_fkey" FOREIGN KEY ("updatedById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RequirementRevision" ADD CONSTRAINT "RequirementRevision_setId_fkey" FOREIGN KEY ("setId") REFERENCES "RequirementSet"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "RequirementRevision" ADD CONSTRAINT "RequirementRevision_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Shortlist" ADD CONSTRAINT "Shortlist_requirementSetId_requirementRevision_fkey" FOREIGN KEY ("requirementSetId", "requirementRevision") REFERENCES "RequirementRevision"("setId", "revision") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Shortlist" ADD CONSTRAINT "Shortlist_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ShortlistArm" ADD CONSTRAINT "ShortlistArm_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ShortlistArm" ADD CONSTRAINT "ShortlistArm_armId_armRevision_fkey" FOREIGN KEY ("armId", "armRevision") REFERENCES "ArmRevision"("armId", "revision") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "AnalysisRun" ADD CONSTRAINT "AnalysisRun_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_parentId_fkey" FOREIGN KEY ("parentId") REFERENCES "Comment"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_shareLinkId_fkey" FOREIGN KEY ("shareLinkId") REFERENCES "ShareLink"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_resolvedById_fkey" FOREIGN KEY ("resolvedById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentRevision" ADD CONSTRAINT "CommentRevision_commentId_fkey" FOREIGN KEY ("commentId") REFERENCES "Comment"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentRevision" ADD CONSTRAINT "CommentRevision_editorId_fkey" FOREIGN KEY ("editorId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentMention" ADD CONSTRAINT "CommentMention_commentId_fkey" FOREIGN KEY ("commentId") REFERENCES "Comment"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentMention" ADD CONSTRAINT "CommentMention_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentRead" ADD CONSTRAINT "CommentRead_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CommentRead" ADD CONSTRAINT "CommentRead_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ShareLink" ADD CONSTRAINT "ShareLink_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ShareLink" ADD CONSTRAINT "ShareLink_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "AuditEvent" ADD CONSTRAINT "AuditEvent_actorId_fkey" FOREIGN KEY ("actorId") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;


-- Revisions are immutable: a saved revision is never edited or removed, and the audit log is
-- append-only. (Written by hand: Prisma's schema language has no triggers. The SQLite migrations
-- hold the same rules as RAISE(ABORT) triggers.)
CREATE FUNCTION "armsift_refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION '%', TG_ARGV[0] USING ERRCODE = 'restrict_violation';
END;
$$;

CREATE TRIGGER "ArmRevision_no_update" BEFORE UPDATE ON "ArmRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('arm revisions are immutable');
CREATE TRIGGER "ArmRevision_no_delete" BEFORE DELETE ON "ArmRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('arm revisions are immutable');
CREATE TRIGGER "ArmRevision_no_truncate" BEFORE TRUNCATE ON "ArmRevision"
    FOR EACH STATEMENT EXECUTE FUNCTION "armsift_refuse_change"('arm revisions are immutable');

CREATE TRIGGER "RequirementRevision_no_update" BEFORE UPDATE ON "RequirementRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('requirement revisions are immutable');
CREATE TRIGGER "RequirementRevision_no_delete" BEFORE DELETE ON "RequirementRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('requirement revisions are immutable');
CREATE TRIGGER "RequirementRevision_no_truncate" BEFORE TRUNCATE ON "RequirementRevision"
    FOR EACH STATEMENT EXECUTE FUNCTION "armsift_refuse_change"('requirement revisions are immutable');

CREATE TRIGGER "CommentRevision_no_update" BEFORE UPDATE ON "CommentRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('comment revisions are immutable');
CREATE TRIGGER "CommentRevision_no_delete" BEFORE DELETE ON "CommentRevision"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('comment revisions are immutable');
CREATE TRIGGER "CommentRevision_no_truncate" BEFORE TRUNCATE ON "CommentRevision"
    FOR EACH STATEMENT EXECUTE FUNCTION "armsift_refuse_change"('comment revisions are immutable');

CREATE TRIGGER "AuditEvent_no_update" BEFORE UPDATE ON "AuditEvent"
    FOR EACH ROW EXECUTE FUNCTION "armsift_refuse_change"('audit events are append-only');
