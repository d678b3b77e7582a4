import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { cookies } from "next/headers";
import { deleteSession, findSessionUser, insertSession } from "@/lib/db";
import type { SessionUser } from "./permissions";

const SESSION_COOKIE = "armsift_session";
export const SESSION_TTL_MS = 14 * 24 * 60 * 60 * 1000;

export const hashToken = (token: string): string => createHash("sha256").update(token).digest("hex");

/** Starts a session: 32 random bytes (base64url) in the cookie, only their sha-256 in the database. */
export async function createSession(userId: string, now: Date = new Date()): Promise<{ token: string; expiresAt: Date }> {
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + SESSION_TTL_MS);
  await insertSession(hashToken(token), userId, expiresAt);
  return { token, expiresAt };
}

export function sessionCookie(token: string, expiresAt: Date, secure: boolean): string {
  const maxAge = Math.max(0, Math.floor((expiresAt.getTime() - Date.now()) / 1000));
  return [`${SESSION_COOKIE}=${token}`, "Path=/", "HttpOnly", "SameSite=Lax", `Max-Age=${maxAge}`, `Expires=${expiresAt.toUTCString()}`, ...(secure ? ["Secure"] : [])].join("; ");
}

export function clearedSessionCookie(secure: boolean): string {
  return [`${SESSION_COOKIE}=`, "Path=/", "HttpOnly", "SameSite=Lax", "Max-Age=0", "Expires=Thu, 01 Jan 1970 00:00:00 GMT", ...(secure ? ["Secure"] : [])].join("; ");
}

/** The session token from a Cookie header, or null. */
function tokenFromCookieHeader(header: string | null): string | null {
  if (!header) return null;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    if (part.slice(0, eq).trim() === SESSION_COOKIE) {
      const value = part.slice(eq + 1).trim();
      return /^[A-Za-z0-9_-]{16,128}$/.test(value) ? value : null;
    }
  }
  return null;
}

async function userForToken(token: string | null, now?: Date): Promise<SessionUser | null> {
  if (!token) return null;
  const u = await findSessionUser(hashToken(token), now);
  return u ? { id: u.id, email: u.email, name: u.name, role: u.role } : null;
}

/** The signed-in user of a route handler's request (reads the Cookie header). */
export function getRequestUser(req: Request, now?: Date): Promise<SessionUser | null> {
  return userForToken(tokenFromCookieHeader(req.headers.get("cookie")), now);
}

/** The signed-in user of the current request, for server components (reads the cookie via next/headers). */
export async function getCurrentUser(): Promise<SessionUser | null> {
  const jar = await cookies();
  const value = jar.get(SESSION_COOKIE)?.value ?? null;
  return userForToken(value && /^[A-Za-z0-9_-]{16,128}$/.test(value) ? value : null);
}

/** The stored id (hash) of the session a request's cookie holds, or null. */
export function requestSessionIdHash(req: Request): string | null {
  const token = tokenFromCookieHeader(req.headers.get("cookie"));
  return token ? hashToken(token) : null;
}

/** Ends the session of a request's cookie, if any. */
export async function endRequestSession(req: Request): Promise<void> {
  const token = tokenFromCookieHeader(req.headers.get("cookie"));
  if (token) await deleteSession(hashToken(token));
}
