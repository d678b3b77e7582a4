import "server-only";
import { randomUUID } from "node:crypto";
import { ROLES, USER_STATUSES, type Role, type SignUpMode, type UserStatus } from "@/shared/schemas/roles";
import { db } from "./client";
import { recordAudit } from "./audit";
import { NotFoundError, ValidationError } from "./errors";
import { isUniqueViolation } from "./documents";
import { openInvitation } from "./invitations";
import { getSignUpMode } from "./settings";

export type { Role, UserStatus };

export interface UserRecord {
  id: string;
  email: string;
  name: string;
  role: Role;
  /** active; pending (signed up while approval is required, not yet approved); refused. */
  status: UserStatus;
  createdAt: Date;
}

const toRole = (r: string): Role => ((ROLES as readonly string[]).includes(r) ? (r as Role) : "viewer");
const toRecord = (u: { id: string; email: string; name: string; role: string; status: string; createdAt: Date }): UserRecord => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: toRole(u.role),
  status: (USER_STATUSES as readonly string[]).includes(u.status) ? (u.status as UserStatus) : "pending",
  createdAt: u.createdAt,
});

export const normalizeEmail = (email: string): string => email.trim().toLowerCase();

/**
 * Creates an account. The first account becomes admin, later ones viewer. The insert comes
 * first, so concurrent sign-ups serialize on the write lock and only one can be first.
 */
export async function createUser(input: { email: string; name: string; passwordHash: string }): Promise<UserRecord> {
  const email = normalizeEmail(input.email);
  try {
    return await db().$transaction(async (tx) => {
      const id = randomUUID();
      const created = await tx.user.create({ data: { id, email, name: input.name.trim(), role: "viewer", passwordHash: input.passwordHash } });
      const count = await tx.user.count();
      const user = count === 1 ? await tx.user.update({ where: { id }, data: { role: "admin" } }) : created;
      await recordAudit(tx, { actorId: id, action: "user.signup", entityType: "user", entityId: id, detail: { role: user.role } });
      return toRecord(user);
    });
  } catch (err) {
    if ((err as { code?: unknown }).code === "P2002") {
      throw new ValidationError([{ path: "email", message: "an account with this email already exists" }]);
    }
    throw err;
  }
}

/** What a sign-up did, as far as the person signing up may learn it. */
type SignUpOutcome =
  /** The very first account: an active admin (the server is being set up). */
  | { kind: "first"; user: UserRecord }
  /**
   * Any later sign-up, whether the email was free or not (the answer must not tell): `access`
   * is what the account has if it was created: active at once (open sign-up or an invitation)
   * or pending an administrator's approval.
   */
  | { kind: "later"; access: "active" | "pending"; created: UserRecord | null };

/**
 * Signs up by the sign-up mode: the first account is an active admin; after it, open mode makes
 * active viewers, approval mode pending viewers, invitation mode accepts only a valid invitation
 * (which, in any mode, makes an active account of the invitation's role and is used up). An email
 * that already has an account changes nothing and is not reported: the outcome is the same as
 * for a new one (and an invitation stays unused).
 */
export async function signUpAccount(
  input: { email: string; name: string; passwordHash: string; invitation?: string | null },
  now: Date = new Date(),
): Promise<SignUpOutcome> {
  const email = normalizeEmail(input.email);
  const run = () => db().$transaction(async (tx) => {
    const mode: SignUpMode = await getSignUpMode(tx);
    const others = await tx.user.count();
    const invitation = input.invitation ? await openInvitation(tx, input.invitation, email, now) : null;
    if (others > 0 && mode === "invitation" && !invitation) {
      throw new ValidationError([{ path: "invitation", message: "new accounts need an invitation here; ask an administrator for one" }]);
    }
    const access: "active" | "pending" = invitation || mode === "open" ? "active" : "pending";
    const id = randomUUID();
    const existing = await tx.user.findUnique({ where: { email }, select: { id: true } });
    if (existing) return { kind: "later", access, created: null } satisfies SignUpOutcome;
    await tx.user.create({ data: { id, email, name: input.name.trim(), role: invitation?.role ?? "viewer", status: access, passwordHash: input.passwordHash, createdAt: now } });
    const first = (await tx.user.count()) === 1;
    const user = first
      ? await tx.user.update({ where: { id }, data: { role: "admin", status: "active" } })
      : await tx.user.findUniqueOrThrow({ where: { id } });
    if (invitation) await tx.invitation.update({ where: { id: invitation.id }, data: { usedAt: now, usedById: id } });
    await recordAudit(tx, {
      actorId: id, action: "user.signup", entityType: "user", entityId: id,
      detail: { role: user.role, status: user.status, mode, ...(invitation ? { invitationId: invitation.id } : {}) },
    });
    return first ? ({ kind: "first", user: toRecord(user) } satisfies SignUpOutcome) : ({ kind: "later", access, created: toRecord(user) } satisfies SignUpOutcome);
  });
  try {
    return await run();
  } catch (err) {
    // Two sign-ups of one new email at once: the second finds it taken, like any taken email.
    if (isUniqueViolation(err)) return { kind: "later", access: "pending", created: null };
    throw err;
  }
}

/** Approves a pending (or refused) account: it can sign in from now on. */
export async function approveUser(actorId: string, id: string, now: Date = new Date()): Promise<UserRecord> {
  return db().$transaction(async (tx) => {
    const target = await tx.user.findUnique({ where: { id } });
    if (!target) throw new NotFoundError(`user ${id} does not exist`);
    if (target.status === "active") return toRecord(target);
    const updated = await tx.user.update({ where: { id }, data: { status: "active", approvedAt: now, approvedById: actorId } });
    await recordAudit(tx, { actorId, action: "user.approve", entityType: "user", entityId: id, detail: { email: target.email } });
    return toRecord(updated);
  });
}

/**
 * Refuses a pending account: it stays (the audit trail names it) but can never sign in, unless
 * an administrator approves it later after all.
 */
export async function refuseUser(actorId: string, id: string): Promise<UserRecord> {
  return db().$transaction(async (tx) => {
    const target = await tx.user.findUnique({ where: { id } });
    if (!target) throw new NotFoundError(`user ${id} does not exist`);
    if (target.status === "refused") return toRecord(target);
    if (target.status !== "pending") throw new ValidationError([{ path: "decision", message: "only an account waiting for approval can be refused; change an active account's role instead" }]);
    await tx.session.deleteMany({ where: { userId: id } });
    const updated = await tx.user.update({ where: { id }, data: { status: "refused" } });
    await recordAudit(tx, { actorId, action: "user.refuse", entityType: "user", entityId: id, detail: { email: target.email } });
    return toRecord(updated);
  });
}

/** The stored password hash of an account (for a password change). */
export async function getPasswordHash(id: string): Promise<string | null> {
  const u = await db().user.findUnique({ where: { id }, select: { passwordHash: true } });
  return u?.passwordHash ?? null;
}

/**
 * Sets a new password hash and ends every session of the account except `keepSessionIdHash`
 * (the one the change was made from); returns how many sessions ended.
 */
export async function changePasswordHash(id: string, passwordHash: string, keepSessionIdHash: string | null): Promise<{ endedSessions: number }> {
  return db().$transaction(async (tx) => {
    await tx.user.update({ where: { id }, data: { passwordHash } });
    const ended = await tx.session.deleteMany({ where: { userId: id, ...(keepSessionIdHash ? { id: { not: keepSessionIdHash } } : {}) } });
    await recordAudit(tx, { actorId: id, action: "user.password", entityType: "user", entityId: id, detail: { endedSessions: ended.count } });
    return { endedSessions: ended.count };
  });
}

/** The account with its password hash, for sign-in only. */
export async function findUserForSignIn(email: string): Promise<(UserRecord & { passwordHash: string }) | null> {
  const u = await db().user.findUnique({ where: { email: normalizeEmail(email) } });
  return u ? { ...toRecord(u), passwordHash: u.passwordHash } : null;
}

export async function getUser(id: string): Promise<UserRecord | null> {
  const u = await db().user.findUnique({ where: { id } });
  return u ? toRecord(u) : null;
}

/** True once any account exists (the first sign-up sets the server up). */
export async function hasAccounts(): Promise<boolean> {
  return (await db().user.count()) > 0;
}

export async function listUsers(): Promise<UserRecord[]> {
  const rows = await db().user.findMany({ orderBy: [{ createdAt: "asc" }, { email: "asc" }] });
  return rows.map(toRecord);
}

/** Changes a user's role; refuses to leave the system without an admin. */
export async function setUserRole(actorId: string, id: string, role: Role): Promise<UserRecord> {
  return db().$transaction(async (tx) => {
    const target = await tx.user.findUnique({ where: { id } });
    if (!target) throw new NotFoundError(`user ${id} does not exist`);
    if (target.role === role) return toRecord(target);
    if (target.role === "admin") {
      const admins = await tx.user.count({ where: { role: "admin" } });
      if (admins <= 1) throw new ValidationError([{ path: "role", message: "this is the only admin; promote another user to admin first" }]);
    }
    const updated = await tx.user.update({ where: { id }, data: { role } });
    await recordAudit(tx, { actorId, action: "user.role", entityType: "user", entityId: id, detail: { from: target.role, to: role } });
    return toRecord(updated);
  });
}
