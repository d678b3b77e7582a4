import { z } from "zod";
import { dummyPasswordHash, hashPassword, verifyPassword } from "@/lib/auth/password";
import { accountAddressKey, signInFailuresByAccount, signInFailuresByIp } from "@/lib/auth/rate-limit";
import { clearedSessionCookie, createSession, endRequestSession, getRequestUser, sessionCookie } from "@/lib/auth/session";
import { clientAddress, isHttps } from "@/lib/http/forwarded";
import type { SessionUser } from "@/lib/auth/permissions";
import { createUser, findUserForSignIn, listUsers, normalizeEmail, setUserRole } from "@/lib/db";
import { nameText, ROLES } from "@/shared/schemas";
import { ApiError, unauthenticated } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route, type RouteContext } from "@/lib/http/route";

const publicUser = (u: SessionUser) => ({ id: u.id, email: u.email, name: u.name, role: u.role });

const signUpBody = z.object({
  email: z.email({ error: "must be an email address" }).max(254, "must be at most 254 characters"),
  name: nameText(80),
  password: z.string({ error: "must be text" }).min(10, "must be at least 10 characters").max(1024, "must be at most 1024 characters"),
});

const signInBody = z.object({
  email: z.string({ error: "must be text" }).min(1, "must not be empty").max(254),
  password: z.string({ error: "must be text" }).min(1, "must not be empty").max(1024),
});

const roleBody = z.object({ role: z.enum(ROLES, { error: "must be admin, editor or viewer" }) });

async function startSession(req: Request, user: SessionUser, status: number): Promise<Response> {
  const { token, expiresAt } = await createSession(user.id);
  return json({ user: publicUser(user) }, status, { "set-cookie": sessionCookie(token, expiresAt, isHttps(req)) });
}

export const signUp = route(async (req) => {
  const body = parseWith(signUpBody, await readJsonObject(req));
  const user = await createUser({ email: body.email, name: body.name, passwordHash: await hashPassword(body.password) });
  return startSession(req, user, 201);
});

function rateLimited(ms: number): ApiError {
  const seconds = Math.ceil(ms / 1000);
  return new ApiError(429, "rate-limited", `too many failed sign-ins; try again in ${Math.ceil(seconds / 60)} min`, {
    headers: { "retry-after": String(seconds) },
  });
}

/**
 * Sign-in. Failures are limited per (account, client address) with growing back-off, and to 20
 * per client address in 15 minutes (in-memory, per server process), so a stranger's guesses
 * never lock the owner out of their own address. A success clears that pair's failures.
 */
export const signIn = route(async (req) => {
  const body = parseWith(signInBody, await readJsonObject(req));
  const email = normalizeEmail(body.email);
  const ip = clientAddress(req);
  const key = accountAddressKey(email, ip);
  const wait = Math.max(signInFailuresByAccount.retryAfterMs(key), signInFailuresByIp.retryAfterMs(ip));
  if (wait > 0) throw rateLimited(wait);
  const user = await findUserForSignIn(email);
  const ok = user ? await verifyPassword(body.password, user.passwordHash) : (await verifyPassword(body.password, await dummyPasswordHash()), false);
  if (!user || !ok) {
    signInFailuresByAccount.record(key);
    signInFailuresByIp.record(ip);
    throw new ApiError(401, "unauthenticated", "email or password is wrong");
  }
  signInFailuresByAccount.reset(key);
  return startSession(req, user, 200);
});

export const signOut = route(async (req) => {
  await endRequestSession(req);
  return new Response(null, { status: 204, headers: { "set-cookie": clearedSessionCookie(isHttps(req)) } });
});

export const me = route(async (req) => {
  const user = await getRequestUser(req);
  if (!user) throw unauthenticated();
  return json({ user: publicUser(user) });
});

export const usersList = route(async (req) => {
  await requireUser(req, "user:admin");
  const users = await listUsers();
  return json({ users: users.map(publicUser) });
});

export const userUpdate = route<{ id: string }>(async (req, ctx: RouteContext<{ id: string }>) => {
  const admin = await requireUser(req, "user:admin");
  const { id } = await ctx.params;
  const body = parseWith(roleBody, await readJsonObject(req));
  const user = await setUserRole(admin.id, id, body.role);
  return json({ user: publicUser(user) });
});
