import "server-only";
import { db } from "./client";
import { recordAudit } from "./audit";
import type { UserRecord } from "./users";
import { getUser } from "./users";

/** Stores a session under the hash of its token. */
export async function insertSession(idHash: string, userId: string, expiresAt: Date): Promise<void> {
  await db().session.create({ data: { id: idHash, userId, expiresAt } });
}

/** The active user of a live session, or null (an expired session is removed; a pending account has none). */
export async function findSessionUser(idHash: string, now: Date = new Date()): Promise<UserRecord | null> {
  const s = await db().session.findUnique({ where: { id: idHash } });
  if (!s) return null;
  if (s.expiresAt.getTime() <= now.getTime()) {
    await db().session.deleteMany({ where: { id: idHash } });
    return null;
  }
  const user = await getUser(s.userId);
  return user && user.status === "active" ? user : null;
}

/** Ends every session of a user except one (the caller's); returns how many ended. */
export async function deleteOtherSessions(userId: string, keepIdHash: string): Promise<number> {
  return db().$transaction(async (tx) => {
    const r = await tx.session.deleteMany({ where: { userId, id: { not: keepIdHash } } });
    await recordAudit(tx, { actorId: userId, action: "user.signout-others", entityType: "user", entityId: userId, detail: { endedSessions: r.count } });
    return r.count;
  });
}

export async function deleteSession(idHash: string): Promise<void> {
  await db().session.deleteMany({ where: { id: idHash } });
}

