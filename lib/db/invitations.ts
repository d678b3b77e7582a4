import "server-only";
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { ROLES, type Role } from "@/shared/schemas/roles";
import { createInvitationInput, DEFAULT_INVITATION_DAYS } from "@/shared/schemas/accounts";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";
import { NotFoundError, ValidationError } from "./errors";
import { userRef, type UserRef } from "./documents";

const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;

const hashInvitationToken = (token: string): string => createHash("sha256").update(`invitation:${token}`).digest("hex");

interface InvitationRecord {
  id: string;
  email: string | null;
  role: Role;
  createdAt: Date;
  createdBy: UserRef | null;
  expiresAt: Date;
  usedAt: Date | null;
  revokedAt: Date | null;
  /** open | used | expired | revoked, at the time of reading. */
  state: "open" | "used" | "expired" | "revoked";
}

type Row = {
  id: string; email: string | null; role: string; createdAt: Date; expiresAt: Date; usedAt: Date | null; revokedAt: Date | null;
  createdBy: { id: string; name: string } | null;
};

function toRecord(r: Row, now: Date): InvitationRecord {
  const state = r.revokedAt ? "revoked" : r.usedAt ? "used" : r.expiresAt.getTime() <= now.getTime() ? "expired" : "open";
  return {
    id: r.id, email: r.email, role: (ROLES as readonly string[]).includes(r.role) ? (r.role as Role) : "viewer",
    createdAt: r.createdAt, createdBy: r.createdBy ? userRef(r.createdBy) : null, expiresAt: r.expiresAt, usedAt: r.usedAt, revokedAt: r.revokedAt, state,
  };
}

const include = { createdBy: { select: { id: true, name: true } } } as const;

/** Makes an invitation; the token is returned once and only its hash is stored. */
export async function createInvitation(actorId: string, input: unknown, now: Date = new Date()): Promise<{ invitation: InvitationRecord; token: string }> {
  const r = createInvitationInput.safeParse(input);
  if (!r.success) throw new ValidationError(r.error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message })));
  const token = randomBytes(32).toString("base64url");
  const days = r.data.expiresInDays ?? DEFAULT_INVITATION_DAYS;
  return db().$transaction(async (tx) => {
    const row = await tx.invitation.create({
      data: {
        id: randomUUID(), tokenHash: hashInvitationToken(token), email: r.data.email ? r.data.email.trim().toLowerCase() : null, role: r.data.role,
        createdById: actorId, createdAt: now, expiresAt: new Date(now.getTime() + days * 86_400_000),
      },
      include,
    });
    await recordAudit(tx, { actorId, action: "invitation.create", entityType: "invitation", entityId: row.id, detail: { role: row.role, email: row.email, days } });
    return { invitation: toRecord(row, now), token };
  });
}

/** Every invitation, newest first. */
export async function listInvitations(now: Date = new Date()): Promise<InvitationRecord[]> {
  const rows = await db().invitation.findMany({ orderBy: [{ createdAt: "desc" }, { id: "asc" }], include });
  return rows.map((r) => toRecord(r, now));
}

/** Revokes an open invitation (a used one stays as it is). */
export async function revokeInvitation(actorId: string, id: string, now: Date = new Date()): Promise<InvitationRecord> {
  return db().$transaction(async (tx) => {
    const row = await tx.invitation.findUnique({ where: { id }, include });
    if (!row) throw new NotFoundError(`invitation ${id} does not exist`);
    if (row.revokedAt || row.usedAt) return toRecord(row, now);
    const updated = await tx.invitation.update({ where: { id }, data: { revokedAt: now }, include });
    await recordAudit(tx, { actorId, action: "invitation.revoke", entityType: "invitation", entityId: id });
    return toRecord(updated, now);
  });
}

/**
 * The open invitation a token stands for, checked inside a sign-up's transaction: unknown,
 * malformed, used, revoked and expired tokens all give the same error on `invitation`.
 */
export async function openInvitation(tx: Tx, token: string, email: string, now: Date): Promise<{ id: string; role: Role }> {
  const row = TOKEN_RE.test(token) ? await tx.invitation.findUnique({ where: { tokenHash: hashInvitationToken(token) } }) : null;
  if (!row || row.usedAt || row.revokedAt || row.expiresAt.getTime() <= now.getTime()) {
    throw new ValidationError([{ path: "invitation", message: "this invitation does not work (unknown, used, revoked or expired); ask an administrator for a new one" }]);
  }
  if (row.email && row.email !== email) {
    throw new ValidationError([{ path: "email", message: "this invitation is for another email address" }]);
  }
  return { id: row.id, role: (ROLES as readonly string[]).includes(row.role) ? (row.role as Role) : "viewer" };
}
