/**
 * Share links of a shortlist. A link carries 32 random bytes (256 bits, crypto.randomBytes) as a
 * base64url token; only the token's sha-256 is stored. Resolving a token looks the hash up and
 * compares it again in constant time; an unknown, expired or revoked token, or one whose
 * shortlist is gone, resolves to null, the same answer in every case.
 */
import "server-only";
import { createHash, randomBytes, randomUUID, timingSafeEqual } from "node:crypto";
import type { LinkAccess } from "@/shared/schemas/roles";
import type { CreateLinkInput } from "@/shared/schemas/share";
import { db } from "./client";
import { recordAudit } from "./audit";
import { NotFoundError } from "./errors";
import { userRef, type UserRef } from "./documents";

const TOKEN_BYTES = 32;
/** base64url of 32 bytes is 43 characters. */
export const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;

export const hashShareToken = (token: string): Buffer => createHash("sha256").update(token, "utf8").digest();

export type { LinkAccess };

/** What a valid token grants: one shortlist, view or comment access (a link guest in lib/auth). */
export interface ShareGrant {
  kind: "link";
  linkId: string;
  shortlistId: string;
  access: LinkAccess;
  hidePrices: boolean;
  label: string | null;
  expiresAt: Date | null;
}

interface ShareLinkRecord {
  id: string;
  shortlistId: string;
  access: LinkAccess;
  label: string | null;
  hidePrices: boolean;
  createdAt: Date;
  createdBy: UserRef | null;
  expiresAt: Date | null;
  revokedAt: Date | null;
  /** active | expired | revoked, at the time of reading. */
  state: "active" | "expired" | "revoked";
}

type LinkRow = {
  id: string; shortlistId: string; access: string; label: string | null; hidePrices: boolean; createdAt: Date;
  expiresAt: Date | null; revokedAt: Date | null; createdBy: { id: string; name: string } | null;
};

function toRecord(r: LinkRow, now: Date): ShareLinkRecord {
  return {
    id: r.id, shortlistId: r.shortlistId, access: r.access === "comment" ? "comment" : "view", label: r.label, hidePrices: r.hidePrices,
    createdAt: r.createdAt, createdBy: userRef(r.createdBy), expiresAt: r.expiresAt, revokedAt: r.revokedAt,
    state: r.revokedAt ? "revoked" : r.expiresAt && r.expiresAt.getTime() <= now.getTime() ? "expired" : "active",
  };
}

const linkInclude = { createdBy: { select: { id: true, name: true } } } as const;

/** Makes a link; the token is returned once and never stored. */
export async function createShareLink(
  actorId: string,
  shortlistId: string,
  body: CreateLinkInput,
  now: Date = new Date(),
): Promise<{ link: ShareLinkRecord; token: string }> {
  const token = randomBytes(TOKEN_BYTES).toString("base64url");
  const id = randomUUID();
  const expiresAt = body.expiresInDays ? new Date(now.getTime() + body.expiresInDays * 86_400_000) : null;
  return db().$transaction(async (tx) => {
    const s = await tx.shortlist.findUnique({ where: { id: shortlistId }, select: { deletedAt: true } });
    if (!s || s.deletedAt) throw new NotFoundError(`shortlist ${shortlistId} does not exist`);
    const row = await tx.shareLink.create({
      data: {
        id, shortlistId, tokenHash: hashShareToken(token).toString("hex"), access: body.access, label: body.label || null,
        createdById: actorId, createdAt: now, expiresAt, hidePrices: body.hidePrices ?? false,
      },
      include: linkInclude,
    });
    await recordAudit(tx, {
      actorId, action: "link.create", entityType: "shortlist", entityId: shortlistId,
      detail: { linkId: id, access: body.access, expiresAt, hidePrices: row.hidePrices, label: row.label },
    });
    return { link: toRecord(row, now), token };
  });
}

/** Links of a shortlist, newest first; `createdById` narrows to one member's links. */
export async function listShareLinks(shortlistId: string, opts: { createdById?: string } = {}, now: Date = new Date()): Promise<ShareLinkRecord[]> {
  const rows = await db().shareLink.findMany({
    where: { shortlistId, ...(opts.createdById ? { createdById: opts.createdById } : {}) },
    orderBy: [{ createdAt: "desc" }, { id: "asc" }],
    include: linkInclude,
  });
  return rows.map((r) => toRecord(r, now));
}

export async function getShareLink(linkId: string, now: Date = new Date()): Promise<(ShareLinkRecord & { createdById: string | null }) | null> {
  const r = await db().shareLink.findUnique({ where: { id: linkId }, include: linkInclude });
  return r ? { ...toRecord(r, now), createdById: r.createdById } : null;
}

/** Revokes at once (idempotent: a revoked link keeps its first revocation time). */
export async function revokeShareLink(actorId: string, linkId: string, now: Date = new Date()): Promise<ShareLinkRecord> {
  return db().$transaction(async (tx) => {
    const r = await tx.shareLink.findUnique({ where: { id: linkId } });
    if (!r) throw new NotFoundError(`share link ${linkId} does not exist`);
    if (!r.revokedAt) {
      await tx.shareLink.update({ where: { id: linkId }, data: { revokedAt: now, revokedById: actorId } });
      await recordAudit(tx, { actorId, action: "link.revoke", entityType: "shortlist", entityId: r.shortlistId, detail: { linkId, access: r.access } });
    }
    const row = await tx.shareLink.findUniqueOrThrow({ where: { id: linkId }, include: linkInclude });
    return toRecord(row, now);
  });
}

const ZERO = Buffer.alloc(32);

/**
 * The guest a token stands for, or null (unknown, malformed, expired, revoked, shortlist gone).
 * The stored hash is compared with timingSafeEqual as well, and a miss compares against zeros,
 * so a lookup costs the same whether or not a row was found.
 */
export async function resolveShareToken(token: string, now: Date = new Date()): Promise<ShareGrant | null> {
  const wellFormed = TOKEN_RE.test(token);
  const hash = hashShareToken(wellFormed ? token : "");
  const row = wellFormed
    ? await db().shareLink.findUnique({
        where: { tokenHash: hash.toString("hex") },
        select: { id: true, shortlistId: true, tokenHash: true, access: true, hidePrices: true, label: true, expiresAt: true, revokedAt: true, shortlist: { select: { deletedAt: true } } },
      })
    : null;
  const stored = row && /^[0-9a-f]{64}$/.test(row.tokenHash) ? Buffer.from(row.tokenHash, "hex") : ZERO;
  const same = timingSafeEqual(stored, hash);
  if (!wellFormed || !row || !same) return null;
  if (row.revokedAt || row.shortlist.deletedAt) return null;
  if (row.expiresAt && row.expiresAt.getTime() <= now.getTime()) return null;
  return {
    kind: "link", linkId: row.id, shortlistId: row.shortlistId, access: row.access === "comment" ? "comment" : "view",
    hidePrices: row.hidePrices, label: row.label, expiresAt: row.expiresAt,
  };
}
