// Route handlers for the discussion of a shortlist (members), its share links, and the share
// view of link guests. Every handler asks lib/auth/permissions `can()` (directly or through
// requireUser) before it touches data.
import { createCommentInput, editCommentInput, guestCommentInput, resolveCommentInput } from "@/shared/schemas/comments";
import { createLinkInput } from "@/shared/schemas/share";
import { can, type LinkGuest, type SessionUser } from "@/lib/auth/permissions";
import { commentPosts } from "@/lib/auth/rate-limit";
import { lookUpShareToken } from "@/lib/auth/share-access";
import { clientAddress } from "@/lib/http/forwarded";
import {
  createComment, deleteComment, editComment, getCommentOwner, listCommentRevisions, listCommentThreads, markDiscussionRead,
  mentionableMembers, setCommentResolved, threadForGuest, unreadCounts, type CommentOwner,
} from "@/lib/db";
import { createShareLink, getShareLink, listShareLinks, revokeShareLink } from "@/lib/db";
import { shortlistForGuest } from "@/lib/views/share-view";
import { getShortlist } from "@/lib/db";
import { ApiError, forbidden, notFound } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route } from "@/lib/http/route";

type IdParams = { id: string };
type CommentParams = { id: string; commentId: string };
type LinkParams = { id: string; linkId: string };
type TokenParams = { token: string };

/** 404 for a shortlist that does not exist or is deleted. */
async function existingShortlist(id: string) {
  const s = await getShortlist(id);
  if (!s) throw notFound(`shortlist ${id} does not exist`);
  return s;
}

function rateLimited(ms: number, what: string): ApiError {
  const seconds = Math.max(1, Math.ceil(ms / 1000));
  return new ApiError(429, "rate-limited", `too many ${what}; try again in ${seconds} s`, { headers: { "retry-after": String(seconds) } });
}

/** Counts one comment post of `key`; 429 past the limit. */
function limitCommentPosts(key: string): void {
  const wait = commentPosts.retryAfterMs(key);
  if (wait > 0) throw rateLimited(wait, "comments");
  commentPosts.record(key);
}

/** A comment of this shortlist, or 404. */
async function commentOf(shortlistId: string, commentId: string): Promise<CommentOwner> {
  const c = await getCommentOwner(commentId);
  if (!c || c.shortlistId !== shortlistId) throw notFound(`shortlist ${shortlistId} has no comment ${commentId}`);
  return c;
}

function requireOn(user: SessionUser, action: Parameters<typeof can>[1], owner: { ownerId: string | null; shortlistId: string }, message: string): void {
  if (!can(user, action, owner)) throw forbidden(message);
}

// ---- Discussion (members) ----

export const listComments = route<IdParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:read");
  const { id } = await ctx.params;
  await existingShortlist(id);
  const [threads, unread, members] = await Promise.all([listCommentThreads(id), unreadCounts(user.id, [id]), mentionableMembers()]);
  return json({ threads, unread: unread.get(id), members: members.map((m) => ({ name: m.name, handle: m.handle })) });
});

export const postComment = route<IdParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:write");
  const { id } = await ctx.params;
  const raw = await readJsonObject(req);
  limitCommentPosts(`member:${user.id}`);
  const r = await createComment({ kind: "member", userId: user.id }, id, parseWith(createCommentInput, raw));
  return json(r, r.created ? 201 : 200);
});

export const markRead = route<IdParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:read");
  const { id } = await ctx.params;
  await existingShortlist(id);
  await markDiscussionRead(user.id, id);
  return new Response(null, { status: 204 });
});

export const editOwnComment = route<CommentParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:edit");
  const { id, commentId } = await ctx.params;
  const c = await commentOf(id, commentId);
  requireOn(user, "comment:edit", { ownerId: c.authorId, shortlistId: id }, "only the author may edit a comment");
  return json(await editComment(user.id, commentId, parseWith(editCommentInput, await readJsonObject(req))));
});

export const deleteOwnComment = route<CommentParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:delete");
  const { id, commentId } = await ctx.params;
  const c = await commentOf(id, commentId);
  requireOn(user, "comment:delete", { ownerId: c.authorId, shortlistId: id }, "only the author or an admin may delete a comment");
  return json(await deleteComment(user.id, commentId));
});

export const resolveThread = route<CommentParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:resolve");
  const { id, commentId } = await ctx.params;
  await commentOf(id, commentId);
  const body = parseWith(resolveCommentInput, await readJsonObject(req));
  return json(await setCommentResolved(user.id, commentId, body.resolved));
});

export const commentRevisions = route<CommentParams>(async (req, ctx) => {
  const user = await requireUser(req, "comment:read");
  const { id, commentId } = await ctx.params;
  const c = await commentOf(id, commentId);
  const revisions = (await listCommentRevisions(commentId)) ?? [];
  if (c.deletedAt === null) return json({ revisions });
  // A deleted comment's text stays readable to admins only; others see that versions existed.
  if (can(user, "comment:read-deleted", { shortlistId: id })) return json({ revisions, deletedAt: c.deletedAt });
  return json({ revisions: revisions.map((r) => ({ ...r, body: null })), deletedAt: c.deletedAt, bodiesHidden: true });
});

// ---- Share links (members) ----

export const listLinks = route<IdParams>(async (req, ctx) => {
  const user = await requireUser(req, "share:manage");
  const { id } = await ctx.params;
  await existingShortlist(id);
  // An admin sees every link; an editor the links they made.
  const all = can(user, "share:revoke", { ownerId: null, shortlistId: id });
  return json({ links: await listShareLinks(id, all ? {} : { createdById: user.id }) });
});

export const createLink = route<IdParams>(async (req, ctx) => {
  const user = await requireUser(req, "share:manage");
  const { id } = await ctx.params;
  await existingShortlist(id);
  const { link, token } = await createShareLink(user.id, id, parseWith(createLinkInput, await readJsonObject(req)));
  return json({ link, token, path: `/share/${token}` }, 201);
});

export const revokeLink = route<LinkParams>(async (req, ctx) => {
  const user = await requireUser(req, "share:revoke");
  const { id, linkId } = await ctx.params;
  const link = await getShareLink(linkId);
  if (!link || link.shortlistId !== id) throw notFound(`shortlist ${id} has no share link ${linkId}`);
  requireOn(user, "share:revoke", { ownerId: link.createdById, shortlistId: id }, "an editor may revoke only the links they made");
  return json({ link: await revokeShareLink(user.id, linkId) });
});

// ---- Share view (link guests) ----

const GONE = "this link does not exist or no longer works";

/**
 * The guest a token stands for. Rate limited per client address (all token requests, and
 * separately the failed ones, against guessing); any failure is the same 404.
 */
async function guestOf(req: Request, token: string): Promise<LinkGuest> {
  const r = await lookUpShareToken(clientAddress(req), token);
  if (r.kind === "limited") throw rateLimited(r.retryAfterMs, "share-link requests");
  if (r.kind === "gone") throw notFound(GONE);
  return r.guest;
}

export const shareView = route<TokenParams>(async (req, ctx) => {
  const { token } = await ctx.params;
  const guest = await guestOf(req, token);
  if (!can(guest, "shortlist:read", { shortlistId: guest.shortlistId })) throw notFound(GONE);
  const view = await shortlistForGuest(guest);
  if (!view) throw notFound(GONE);
  return json(view);
});

export const shareComments = route<TokenParams>(async (req, ctx) => {
  const { token } = await ctx.params;
  const guest = await guestOf(req, token);
  if (!can(guest, "comment:read", { shortlistId: guest.shortlistId })) throw notFound(GONE);
  return json({ threads: (await listCommentThreads(guest.shortlistId)).map(threadForGuest) });
});

export const sharePostComment = route<TokenParams>(async (req, ctx) => {
  const { token } = await ctx.params;
  const guest = await guestOf(req, token);
  if (!can(guest, "comment:write", { shortlistId: guest.shortlistId })) throw forbidden("this link allows reading only");
  const raw = await readJsonObject(req);
  limitCommentPosts(`link:${guest.linkId}:${clientAddress(req)}`);
  const { name, ...rest } = parseWith(guestCommentInput, raw);
  const r = await createComment({ kind: "guest", linkId: guest.linkId, name }, guest.shortlistId, rest);
  return json(r, r.created ? 201 : 200);
});
