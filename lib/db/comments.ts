/**
 * Discussion of a shortlist. A comment is anchored to the whole shortlist, one of its arms, a
 * target or path of its requirement set, or one compliance row (an arm against one spec
 * requirement). Replies form threads (a reply to a reply joins the same thread). Every version of
 * a body is an immutable CommentRevision written in the same transaction as the comment, so a
 * comment never exists without its text history. Deleting only marks the comment; resolving and
 * reopening apply to a thread's first comment. Every change is an audit event.
 */
import "server-only";
import { randomUUID } from "node:crypto";
import { requirementSetSchema } from "@/shared/schemas";
import { handleOf, mentionedHandles, renderComment } from "@/lib/markdown";
import type { Anchor, AnchorType, CreateCommentInput, EditCommentInput } from "@/shared/schemas/comments";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { readStoredDocument } from "./documents";
import { ConflictError, NotFoundError, ValidationError } from "./errors";

/** Who writes: a member, or a guest on a comment link with the name they gave (cleaned by displayNameSchema). */
type CommentAuthor = { kind: "member"; userId: string } | { kind: "guest"; linkId: string; name: string };

interface CommentView {
  id: string;
  shortlistId: string;
  parentId: string | null;
  anchor: { type: AnchorType; id: string | null };
  author: { kind: "member"; id: string; name: string } | { kind: "guest"; name: string } | { kind: "unknown" };
  /** Markdown source (empty once deleted). */
  body: string;
  /** Sanitised HTML of the body (empty once deleted, or when it could not be rendered). */
  html: string;
  /** Set when the body could not be rendered: the reader sees this instead of it. */
  renderError: string | null;
  revision: number;
  createdAt: Date;
  editedAt: Date | null;
  deletedAt: Date | null;
  resolvedAt: Date | null;
  resolvedBy: { id: string; name: string } | null;
  mentions: { id: string; name: string }[];
}

interface CommentThread extends CommentView {
  replies: CommentView[];
}

/** Members' mention handles → ids (a handle two members share mentions both). */
async function memberHandles(tx: Tx | ReturnType<typeof db>): Promise<Map<string, { id: string; name: string }[]>> {
  const users = await tx.user.findMany({ select: { id: true, name: true, email: true } });
  const map = new Map<string, { id: string; name: string }[]>();
  for (const u of users) {
    const h = handleOf(u.email);
    map.set(h, [...(map.get(h) ?? []), { id: u.id, name: u.name }]);
  }
  return map;
}

/** Checks that an anchor names something of this shortlist's pins; returns the stored form. */
async function checkAnchor(tx: Tx, shortlistId: string, anchor: Anchor | undefined): Promise<{ anchorType: AnchorType; anchorId: string | null }> {
  const type = anchor?.type ?? "shortlist";
  const id = anchor?.id ?? null;
  if (type === "shortlist") {
    if (id !== null) throw new ValidationError([{ path: "anchor.id", message: "must be absent for a comment on the whole shortlist" }]);
    return { anchorType: type, anchorId: null };
  }
  if (id === null) throw new ValidationError([{ path: "anchor.id", message: `name the ${type} the comment is about` }]);
  const s = await tx.shortlist.findUniqueOrThrow({
    where: { id: shortlistId },
    select: { requirementSetId: true, requirementRevision: true, arms: { select: { armId: true } } },
  });
  const armIds = new Set(s.arms.map((a) => a.armId));
  if (type === "arm") {
    if (!armIds.has(id)) throw new ValidationError([{ path: "anchor.id", message: `arm ${id.slice(0, 60)} is not on this shortlist` }]);
    return { anchorType: type, anchorId: id };
  }
  const rev = await tx.requirementRevision.findUniqueOrThrow({
    where: { setId_revision: { setId: s.requirementSetId, revision: s.requirementRevision } },
    select: { document: true },
  });
  const req = readStoredDocument(requirementSetSchema, rev.document, "requirement set");
  if (type === "target" || type === "path") {
    const names = (type === "target" ? req.targets : req.paths).map((t) => t.name);
    if (!names.includes(id)) throw new ValidationError([{ path: "anchor.id", message: `the requirement set has no ${type} named ${JSON.stringify(id.slice(0, 60))}` }]);
    return { anchorType: type, anchorId: id };
  }
  const m = /^(.+)#(\d{1,4})$/.exec(id);
  if (!m || !armIds.has(m[1]) || Number(m[2]) >= req.specs.length) {
    throw new ValidationError([{ path: "anchor.id", message: "must be armId#index of an arm on this shortlist and one of its spec requirements" }]);
  }
  return { anchorType: type, anchorId: id };
}

async function storeMentions(tx: Tx, commentId: string, body: string): Promise<string[]> {
  const handles = mentionedHandles(body);
  await tx.commentMention.deleteMany({ where: { commentId } });
  if (handles.length === 0) return [];
  const members = await memberHandles(tx);
  const ids = [...new Set(handles.flatMap((h) => (members.get(h) ?? []).map((m) => m.id)))];
  if (ids.length) await tx.commentMention.createMany({ data: ids.map((userId) => ({ commentId, userId })) });
  return ids;
}

/**
 * Posts a comment or reply. With a clientKey already used on this shortlist the earlier comment
 * is returned (`created: false`) instead of storing a second one.
 */
export async function createComment(author: CommentAuthor, shortlistId: string, body: CreateCommentInput, now: Date = new Date()): Promise<{ id: string; created: boolean }> {
  const guestName = author.kind === "guest" ? author.name : null;
  return db().$transaction(async (tx) => {
    const s = await tx.shortlist.findUnique({ where: { id: shortlistId }, select: { deletedAt: true } });
    if (!s || s.deletedAt) throw new NotFoundError(`shortlist ${shortlistId} does not exist`);
    if (body.clientKey) {
      const earlier = await tx.comment.findUnique({ where: { shortlistId_clientKey: { shortlistId, clientKey: body.clientKey } }, select: { id: true } });
      if (earlier) return { id: earlier.id, created: false };
    }
    let parentId: string | null = null;
    let anchor: { anchorType: AnchorType; anchorId: string | null };
    if (body.parentId) {
      const parent = await tx.comment.findUnique({ where: { id: body.parentId }, select: { id: true, shortlistId: true, parentId: true, anchorType: true, anchorId: true, deletedAt: true } });
      if (!parent || parent.shortlistId !== shortlistId) throw new ValidationError([{ path: "parentId", message: "the comment replied to is not in this discussion" }]);
      parentId = parent.parentId ?? parent.id;
      anchor = { anchorType: parent.anchorType as AnchorType, anchorId: parent.anchorId };
    } else {
      anchor = await checkAnchor(tx, shortlistId, body.anchor);
    }
    const id = randomUUID();
    await tx.comment.create({
      data: {
        id, shortlistId, parentId, ...anchor, body: body.body, revision: 1, createdAt: now, updatedAt: now, clientKey: body.clientKey ?? null,
        authorId: author.kind === "member" ? author.userId : null,
        authorLabel: guestName, shareLinkId: author.kind === "guest" ? author.linkId : null,
      },
    });
    await tx.commentRevision.create({
      data: { id: `${id}:1`, commentId: id, revision: 1, body: body.body, editorId: author.kind === "member" ? author.userId : null, editorLabel: guestName, createdAt: now },
    });
    const mentioned = await storeMentions(tx, id, body.body);
    await recordAudit(tx, {
      actorId: author.kind === "member" ? author.userId : null, action: "comment.create", entityType: "comment", entityId: id,
      detail: { shortlistId, parentId, anchor, mentions: mentioned.length, ...(author.kind === "guest" ? { guest: guestName, linkId: author.linkId } : {}) },
    });
    return { id, created: true };
  });
}

export interface CommentOwner {
  id: string;
  shortlistId: string;
  authorId: string | null;
  parentId: string | null;
  deletedAt: Date | null;
  revision: number;
}

/** The facts permission checks need about a comment, or null. */
export async function getCommentOwner(commentId: string): Promise<CommentOwner | null> {
  return db().comment.findUnique({ where: { id: commentId }, select: { id: true, shortlistId: true, authorId: true, parentId: true, deletedAt: true, revision: true } });
}

/** A new body: a new immutable revision; the comment row points at it. */
export async function editComment(actorId: string, commentId: string, body: EditCommentInput, now: Date = new Date()): Promise<{ id: string; revision: number }> {
  return db().$transaction(async (tx) => {
    const c = await tx.comment.findUnique({ where: { id: commentId } });
    if (!c || c.deletedAt) throw new NotFoundError(`comment ${commentId} does not exist`);
    if (body.baseRevision !== undefined && body.baseRevision !== c.revision) {
      const base = await tx.commentRevision.findUnique({ where: { commentId_revision: { commentId: c.id, revision: body.baseRevision } }, select: { body: true } });
      throw new ConflictError({
        message: `the comment was edited meanwhile (revision ${c.revision}); reload and edit again`,
        baseRevision: body.baseRevision, currentRevision: c.revision, current: { body: c.body },
        changes: [{ path: "body", base: base?.body ?? null, current: c.body }],
      });
    }
    if (c.body === body.body) return { id: c.id, revision: c.revision };
    const revision = c.revision + 1;
    await tx.commentRevision.create({ data: { id: `${c.id}:${revision}`, commentId: c.id, revision, body: body.body, editorId: actorId, createdAt: now } });
    await tx.comment.update({ where: { id: c.id }, data: { body: body.body, revision, editedAt: now, updatedAt: now } });
    await storeMentions(tx, c.id, body.body);
    await recordAudit(tx, { actorId, action: "comment.edit", entityType: "comment", entityId: c.id, detail: { shortlistId: c.shortlistId, revision } });
    return { id: c.id, revision };
  });
}

/** Marks a comment deleted; its revisions stay (for the audit trail). */
export async function deleteComment(actorId: string, commentId: string, now: Date = new Date()): Promise<{ id: string; deletedAt: Date }> {
  return db().$transaction(async (tx) => {
    const c = await tx.comment.findUnique({ where: { id: commentId } });
    if (!c) throw new NotFoundError(`comment ${commentId} does not exist`);
    if (c.deletedAt) return { id: c.id, deletedAt: c.deletedAt };
    await tx.comment.update({ where: { id: c.id }, data: { deletedAt: now, deletedById: actorId, updatedAt: now } });
    await recordAudit(tx, { actorId, action: "comment.delete", entityType: "comment", entityId: c.id, detail: { shortlistId: c.shortlistId, revision: c.revision, byAuthor: c.authorId === actorId } });
    return { id: c.id, deletedAt: now };
  });
}

/** Resolves or reopens a thread (its first comment). */
export async function setCommentResolved(actorId: string, commentId: string, resolved: boolean, now: Date = new Date()): Promise<{ id: string; resolvedAt: Date | null }> {
  return db().$transaction(async (tx) => {
    const c = await tx.comment.findUnique({ where: { id: commentId } });
    if (!c || c.deletedAt) throw new NotFoundError(`comment ${commentId} does not exist`);
    if (c.parentId) throw new ValidationError([{ path: "", message: "resolve or reopen the thread's first comment, not a reply" }]);
    if (Boolean(c.resolvedAt) === resolved) return { id: c.id, resolvedAt: c.resolvedAt };
    const resolvedAt = resolved ? now : null;
    await tx.comment.update({ where: { id: c.id }, data: { resolvedAt, resolvedById: resolved ? actorId : null, updatedAt: now } });
    await recordAudit(tx, { actorId, action: resolved ? "comment.resolve" : "comment.reopen", entityType: "comment", entityId: c.id, detail: { shortlistId: c.shortlistId } });
    return { id: c.id, resolvedAt };
  });
}

/** A thread as a link guest sees it: names only, no account ids. */
export function threadForGuest(t: CommentThread): unknown {
  const strip = (c: CommentView) => ({
    id: c.id, parentId: c.parentId, anchor: c.anchor, body: c.body, html: c.html, renderError: c.renderError, revision: c.revision, createdAt: c.createdAt, editedAt: c.editedAt,
    deletedAt: c.deletedAt, resolvedAt: c.resolvedAt,
    author: c.author.kind === "member" ? { kind: "member", name: c.author.name } : c.author,
    resolvedBy: c.resolvedBy ? { name: c.resolvedBy.name } : null,
    mentions: c.mentions.map((m) => ({ name: m.name })),
  });
  return { ...strip(t), replies: t.replies.map(strip) };
}

/** The discussion of a shortlist as threads, oldest first, bodies rendered to safe HTML. */
export async function listCommentThreads(shortlistId: string): Promise<CommentThread[]> {
  const client = db();
  const [rows, handles] = await Promise.all([
    client.comment.findMany({
      where: { shortlistId },
      orderBy: [{ createdAt: "asc" }, { id: "asc" }],
      include: {
        author: { select: { id: true, name: true } },
        resolvedBy: { select: { id: true, name: true } },
        mentions: { select: { user: { select: { id: true, name: true } } } },
      },
    }),
    memberHandles(client),
  ]);
  const known = new Set(handles.keys());
  const views = rows.map((r): CommentView => {
    const deleted = r.deletedAt !== null;
    const rendered = deleted ? { html: "", renderError: null } : renderComment(r.body, { mentions: known });
    return {
      id: r.id, shortlistId: r.shortlistId, parentId: r.parentId, anchor: { type: r.anchorType as AnchorType, id: r.anchorId },
      author: r.author ? { kind: "member", id: r.author.id, name: r.author.name } : r.authorLabel ? { kind: "guest", name: r.authorLabel } : { kind: "unknown" },
      body: deleted ? "" : r.body,
      html: rendered.html, renderError: rendered.renderError,
      revision: r.revision, createdAt: r.createdAt, editedAt: r.editedAt, deletedAt: r.deletedAt, resolvedAt: r.resolvedAt,
      resolvedBy: r.resolvedBy, mentions: deleted ? [] : r.mentions.map((m) => m.user),
    };
  });
  const threads = new Map<string, CommentThread>();
  for (const v of views) if (!v.parentId) threads.set(v.id, { ...v, replies: [] });
  for (const v of views) if (v.parentId) threads.get(v.parentId)?.replies.push(v);
  // A deleted first comment with no live replies is left out entirely.
  return [...threads.values()].filter((t) => !t.deletedAt || t.replies.some((r) => !r.deletedAt));
}

interface CommentRevisionView {
  revision: number;
  body: string;
  createdAt: Date;
  editor: { id: string; name: string } | null;
  editorLabel: string | null;
}

/** Every version of a comment's body, oldest first (null when the comment does not exist). */
export async function listCommentRevisions(commentId: string): Promise<CommentRevisionView[] | null> {
  const c = await db().comment.findUnique({ where: { id: commentId }, select: { id: true } });
  if (!c) return null;
  const rows = await db().commentRevision.findMany({ where: { commentId }, orderBy: { revision: "asc" }, include: { editor: { select: { id: true, name: true } } } });
  return rows.map((r) => ({ revision: r.revision, body: r.body, createdAt: r.createdAt, editor: r.editor, editorLabel: r.editorLabel }));
}

/** Records that a member has read a shortlist's discussion up to `at`. */
export async function markDiscussionRead(userId: string, shortlistId: string, at: Date = new Date()): Promise<void> {
  await db().commentRead.upsert({
    where: { userId_shortlistId: { userId, shortlistId } },
    create: { userId, shortlistId, lastReadAt: at },
    update: { lastReadAt: at },
  });
}

export interface UnreadCount {
  /** Live comments by others since the member last read the discussion. */
  unread: number;
  /** Of those, the ones that mention the member. */
  mentions: number;
}

/** Unread counts of one member for each of the given shortlists. */
export async function unreadCounts(userId: string, shortlistIds: string[]): Promise<Map<string, UnreadCount>> {
  const out = new Map<string, UnreadCount>(shortlistIds.map((id) => [id, { unread: 0, mentions: 0 }]));
  if (shortlistIds.length === 0) return out;
  const reads = await db().commentRead.findMany({ where: { userId, shortlistId: { in: shortlistIds } } });
  const lastRead = new Map(reads.map((r) => [r.shortlistId, r.lastReadAt]));
  // Two grouped queries for all the shortlists at once (not two per shortlist): each shortlist
  // contributes its own "since the member last read it" condition to one OR.
  const where = {
    deletedAt: null,
    AND: [
      { OR: [{ authorId: null }, { authorId: { not: userId } }] },
      { OR: shortlistIds.map((shortlistId) => {
        const since = lastRead.get(shortlistId);
        return { shortlistId, ...(since ? { createdAt: { gt: since } } : {}) };
      }) },
    ],
  };
  const [unread, mentions] = await Promise.all([
    db().comment.groupBy({ by: ["shortlistId"], where, _count: { _all: true } }),
    db().comment.groupBy({ by: ["shortlistId"], where: { ...where, mentions: { some: { userId } } }, _count: { _all: true } }),
  ]);
  for (const g of unread) out.get(g.shortlistId)!.unread = g._count._all;
  for (const g of mentions) out.get(g.shortlistId)!.mentions = g._count._all;
  return out;
}

/** Members who can be mentioned, with their handles (for the composer's hint). */
export async function mentionableMembers(): Promise<{ id: string; name: string; handle: string }[]> {
  const users = await db().user.findMany({ select: { id: true, name: true, email: true }, orderBy: { name: "asc" } });
  return users.map((u) => ({ id: u.id, name: u.name, handle: handleOf(u.email) }));
}
