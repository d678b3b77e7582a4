import { dummyPasswordHash, hashPassword, verifyPassword } from "@/lib/auth/password";
import { clientAddress, signInFailuresByEmail, signInFailuresByIp } from "@/lib/auth/rate-limit";
import { clearedSessionCookie, createSession, endRequestSession, getRequestUser, isHttps, sessionCookie } from "@/lib/auth/session";
import type { SessionUser } from "@/lib/auth/permissions";
import { createUser, findUserForSignIn, listUsers, normalizeEmail, setUserRole } from "@/lib/db";
import { roleInput, signInInput, signUpInput } from "@/shared/schemas/accounts";
import { ApiError, unauthenticated } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route, type RouteContext } from "@/lib/http/route";

const publicUser = (u: SessionUser) => ({ id: u.id, email: u.email, name: u.name, role: u.role });


async function startSession(req: Request, user: SessionUser, status: number): Promise<Response> {
  const { token, expiresAt } = await createSession(user.id);
  return json({ user: publicUser(user) }, status, { "set-cookie": sessionCookie(token, expiresAt, isHttps(req)) });
}

export const signUp = route(async (req) => {
  const body = parseWith(signUpInput, await readJsonObject(req));
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
 * Sign-in, limited to 5 failures per email and 20 per client address in 15 minutes
 * (in-memory, per server process). A success clears the email's failures.
 */
export const signIn = route(async (req) => {
  const body = parseWith(signInInput, await readJsonObject(req));
  const email = normalizeEmail(body.email);
  const ip = clientAddress(req);
  const wait = Math.max(signInFailuresByEmail.retryAfterMs(email), signInFailuresByIp.retryAfterMs(ip));
  if (wait > 0) throw rateLimited(wait);
  const user = await findUserForSignIn(email);
  const ok = user ? await verifyPassword(body.password, user.passwordHash) : (await verifyPassword(body.password, await dummyPasswordHash()), false);
  if (!user || !ok) {
    signInFailuresByEmail.record(email);
    signInFailuresByIp.record(ip);
    throw new ApiError(401, "unauthenticated", "email or password is wrong");
  }
  signInFailuresByEmail.reset(email);
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
  const body = parseWith(roleInput, await readJsonObject(req));
  const user = await setUserRole(admin.id, id, body.role);
  return json({ user: publicUser(user) });
});
