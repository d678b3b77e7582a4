-- CreateTable
CREATE TABLE "CommentRevision" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "commentId" TEXT NOT NULL,
    "revision" INTEGER NOT NULL,
    "body" TEXT NOT NULL,
    "editorId" TEXT,
    "editorLabel" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "CommentRevision_commentId_fkey" FOREIGN KEY ("commentId") REFERENCES "Comment" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "CommentRevision_editorId_fkey" FOREIGN KEY ("editorId") REFERENCES "User" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "CommentMention" (
    "commentId" TEXT NOT NULL,
    "userId" TEXT NOT NULL,

    PRIMARY KEY ("commentId", "userId"),
    CONSTRAINT "CommentMention_commentId_fkey" FOREIGN KEY ("commentId") REFERENCES "Comment" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "CommentMention_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE CASCADE ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "CommentRead" (
    "userId" TEXT NOT NULL,
    "shortlistId" TEXT NOT NULL,
    "lastReadAt" DATETIME NOT NULL,

    PRIMARY KEY ("userId", "shortlistId"),
    CONSTRAINT "CommentRead_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "CommentRead_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist" ("id") ON DELETE CASCADE ON UPDATE CASCADE
);

-- RedefineTables
PRAGMA defer_foreign_keys=ON;
PRAGMA foreign_keys=OFF;
CREATE TABLE "new_Comment" (
    "id" TEXT NOT NULL PRIMARY KEY,
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
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" DATETIME NOT NULL,
    "editedAt" DATETIME,
    "resolvedAt" DATETIME,
    "resolvedById" TEXT,
    "deletedAt" DATETIME,
    "deletedById" TEXT,
    CONSTRAINT "Comment_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "Comment_parentId_fkey" FOREIGN KEY ("parentId") REFERENCES "Comment" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "Comment_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Comment_shareLinkId_fkey" FOREIGN KEY ("shareLinkId") REFERENCES "ShareLink" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Comment_resolvedById_fkey" FOREIGN KEY ("resolvedById") REFERENCES "User" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);
INSERT INTO "new_Comment" ("anchorId", "anchorType", "authorId", "authorLabel", "body", "createdAt", "deletedAt", "id", "parentId", "resolvedAt", "resolvedById", "shortlistId", "updatedAt") SELECT "anchorId", "anchorType", "authorId", "authorLabel", "body", "createdAt", "deletedAt", "id", "parentId", "resolvedAt", "resolvedById", "shortlistId", "updatedAt" FROM "Comment";
DROP TABLE "Comment";
ALTER TABLE "new_Comment" RENAME TO "Comment";
CREATE INDEX "Comment_shortlistId_createdAt_idx" ON "Comment"("shortlistId", "createdAt");
CREATE INDEX "Comment_parentId_idx" ON "Comment"("parentId");
CREATE UNIQUE INDEX "Comment_shortlistId_clientKey_key" ON "Comment"("shortlistId", "clientKey");
CREATE TABLE "new_ShareLink" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "shortlistId" TEXT NOT NULL,
    "tokenHash" TEXT NOT NULL,
    "access" TEXT NOT NULL,
    "label" TEXT,
    "createdById" TEXT,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" DATETIME,
    "revokedAt" DATETIME,
    "revokedById" TEXT,
    "hidePrices" BOOLEAN NOT NULL DEFAULT false,
    CONSTRAINT "ShareLink_shortlistId_fkey" FOREIGN KEY ("shortlistId") REFERENCES "Shortlist" ("id") ON DELETE CASCADE ON UPDATE CASCADE,
    CONSTRAINT "ShareLink_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);
INSERT INTO "new_ShareLink" ("access", "createdAt", "createdById", "expiresAt", "id", "label", "revokedAt", "shortlistId", "tokenHash") SELECT "access", "createdAt", "createdById", "expiresAt", "id", "label", "revokedAt", "shortlistId", "tokenHash" FROM "ShareLink";
DROP TABLE "ShareLink";
ALTER TABLE "new_ShareLink" RENAME TO "ShareLink";
CREATE UNIQUE INDEX "ShareLink_tokenHash_key" ON "ShareLink"("tokenHash");
CREATE INDEX "ShareLink_shortlistId_idx" ON "ShareLink"("shortlistId");
PRAGMA foreign_keys=ON;
PRAGMA defer_foreign_keys=OFF;

-- CreateIndex
CREATE UNIQUE INDEX "CommentRevision_commentId_revision_key" ON "CommentRevision"("commentId", "revision");

-- CreateIndex
CREATE INDEX "CommentMention_userId_idx" ON "CommentMention"("userId");


-- Comments written before revisions existed get their body as revision 1.
INSERT INTO "CommentRevision" ("id", "commentId", "revision", "body", "editorId", "editorLabel", "createdAt")
SELECT "id" || ':1', "id", 1, "body", "authorId", "authorLabel", "createdAt" FROM "Comment";

-- Comment revisions are immutable (written by hand: Prisma's schema language has no triggers).
CREATE TRIGGER "CommentRevision_no_update"
BEFORE UPDATE ON "CommentRevision"
BEGIN
    SELECT RAISE(ABORT, 'comment revisions are immutable');
END;

CREATE TRIGGER "CommentRevision_no_delete"
BEFORE DELETE ON "CommentRevision"
BEGIN
    SELECT RAISE(ABORT, 'comment revisions are immutable');
END;
