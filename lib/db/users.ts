import "server-only";
import { randomUUID } from "node:crypto";
import { ROLES, type Role } from "@/shared/schemas/roles";
import { db } from "./client";
import { recordAudit } from "./audit";
import { NotFoundError, ValidationError } from "./errors";

export type { Role };

export interface UserRecord {
  id: string;
  email: string;
  name: string;
  role: Role;
  createdAt: Date;
}

const toRole = (r: string): Role => ((ROLES as readonly string[]).includes(r) ? (r as Role) : "viewer");
const toRecord = (u: { id: string; email: string; name: string; role: string; createdAt: Date }): UserRecord => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: toRole(u.role),
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

/** The account with its password hash, for sign-in only. */
export async function findUserForSignIn(email: string): Promise<(UserRecord & { passwordHash: string }) | null> {
  const u = await db().user.findUnique({ where: { email: normalizeEmail(email) } });
  return u ? { ...toRecord(u), passwordHash: u.passwordHash } : null;
}

export async function getUser(id: string): Promise<UserRecord | null> {
  const u = await db().user.findUnique({ where: { id } });
  return u ? toRecord(u) : null;
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
