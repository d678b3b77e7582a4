import "server-only";
import { db } from "./client";
import type { UserRecord } from "./users";
import { getUser } from "./users";

/** Stores a session under the hash of its token. */
export async function insertSession(idHash: string, userId: string, expiresAt: Date): Promise<void> {
  await db().session.create({ data: { id: idHash, userId, expiresAt } });
}

/** The user of a live session, or null (an expired session is removed). */
export async function findSessionUser(idHash: string, now: Date = new Date()): Promise<UserRecord | null> {
  const s = await db().session.findUnique({ where: { id: idHash } });
  if (!s) return null;
  if (s.expiresAt.getTime() <= now.getTime()) {
    await db().session.deleteMany({ where: { id: idHash } });
    return null;
  }
  return getUser(s.userId);
}

export async function deleteSession(idHash: string): Promise<void> {
  await db().session.deleteMany({ where: { id: idHash } });
}

/** Removes every expired session; returns how many. */
export async function deleteExpiredSessions(now: Date = new Date()): Promise<number> {
  const r = await db().session.deleteMany({ where: { expiresAt: { lte: now } } });
  return r.count;
}
