import { dummyPasswordHash, hashPassword, verifyPassword } from "@/lib/auth/password";
import { accountAddressKey, signInFailuresByAccount, signInFailuresByIp } from "@/lib/auth/rate-limit";
import { clearedSessionCookie, createSession, endRequestSession, getRequestUser, requestSessionIdHash, sessionCookie } from "@/lib/auth/session";
import { passwordProblem } from "@/lib/auth/password-policy";
import { clientAddress, isHttps } from "@/lib/http/forwarded";
import type { SessionUser } from "@/lib/auth/permissions";
import {
  approveUser, changePasswordHash, createInvitation, deleteOtherSessions, findUserForSignIn, getPasswordHash, getSignUpMode, listInvitations,
  listUsers, normalizeEmail, refuseUser, revokeInvitation, setSignUpMode, setUserRole, signUpAccount, type UserRecord,
} from "@/lib/db";
import { approvalInput, passwordChangeInput, roleInput, signInInput, signUpInput, signUpModeInput } from "@/shared/schemas/accounts";
import { toFieldErrors, type FieldError } from "@/shared/schemas";
import type { z } from "zod";
import { ApiError, badRequest, unauthenticated } from "@/lib/http/errors";
import { readJsonObject } from "@/lib/http/body";
import { json, parseWith, requireUser, route, type RouteContext } from "@/lib/http/route";

const publicUser = (u: SessionUser) => ({ id: u.id, email: u.email, name: u.name, role: u.role });
const listedUser = (u: UserRecord) => ({ ...publicUser(u), status: u.status, createdAt: u.createdAt });

/**
 * Parses a body with a new password in `field`: the schema's field errors together with the
 * password policy's (which knows the account's email and name).
 */
function parseWithPassword<S extends z.ZodType<Record<string, unknown>>>(schema: S, raw: Record<string, unknown>, field: string, ctx: { email?: unknown; name?: unknown }): z.output<S> {
  const r = schema.safeParse(raw);
  const errors: FieldError[] = r.success ? [] : toFieldErrors(r.error);
  const pw = raw[field];
  if (typeof pw === "string" && !errors.some((e) => e.path === field)) {
    const problem = passwordProblem(pw, { email: typeof ctx.email === "string" ? ctx.email : undefined, name: typeof ctx.name === "string" ? ctx.name : undefined });
    if (problem) errors.push({ path: field, message: problem });
  }
  if (errors.length > 0 || !r.success) throw badRequest(errors);
  return r.data;
}

async function startSession(req: Request, user: SessionUser, status: number): Promise<Response> {
  const { token, expiresAt } = await createSession(user.id);
  return json({ user: publicUser(user) }, status, { "set-cookie": sessionCookie(token, expiresAt, isHttps(req)) });
}

/** What a later sign-up answers, the same whether the email was free or not. */
const SIGN_UP_ANSWER = {
  active: "If this email address had no account yet, the account is ready: sign in with it. If it had one, nothing changed.",
  pending: "If this email address had no account yet, the account now waits for an administrator's approval; you can sign in once it is approved. If it had one, nothing changed.",
} as const;

/**
 * Sign-up. The very first account becomes the admin and is signed in at once (201). Every later
 * sign-up answers 202 with the same words whether the email was free or already had an account
 * (so the answer does not tell who has one), after the same password hashing either way.
 */
export const signUp = route(async (req) => {
  const raw = await readJsonObject(req);
  const body = parseWithPassword(signUpInput, raw, "password", { email: raw.email, name: raw.name });
  const outcome = await signUpAccount({ email: body.email, name: body.name, passwordHash: await hashPassword(body.password), invitation: body.invitation ?? null });
  if (outcome.kind === "first") return startSession(req, outcome.user, 201);
  return json({ signUp: { access: outcome.access, message: SIGN_UP_ANSWER[outcome.access] } }, 202);
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
  const body = parseWith(signInInput, await readJsonObject(req));
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
  if (user.status === "pending") throw new ApiError(403, "forbidden", "this account waits for an administrator's approval; you can sign in once it is approved");
  if (user.status !== "active") throw new ApiError(403, "forbidden", "an administrator did not approve this account; ask one if this is a mistake");
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
  return json({ users: users.map(listedUser) });
});

export const userUpdate = route<{ id: string }>(async (req, ctx: RouteContext<{ id: string }>) => {
  const admin = await requireUser(req, "user:admin");
  const { id } = await ctx.params;
  const body = parseWith(roleInput, await readJsonObject(req));
  const user = await setUserRole(admin.id, id, body.role);
  return json({ user: publicUser(user) });
});

// ---- One's own account ----

/**
 * Changes one's password: the current one must be given (its failures count like sign-in
 * failures of this account and address), the new one must pass the password policy and differ;
 * every other session of the account ends, this one stays.
 */
export const changePassword = route(async (req) => {
  const user = await requireUser(req, "account:manage");
  const body = parseWithPassword(passwordChangeInput, await readJsonObject(req), "newPassword", { email: user.email, name: user.name });
  const ip = clientAddress(req);
  const key = accountAddressKey(user.email, ip);
  const wait = Math.max(signInFailuresByAccount.retryAfterMs(key), signInFailuresByIp.retryAfterMs(ip));
  if (wait > 0) throw rateLimited(wait);
  const stored = await getPasswordHash(user.id);
  if (!stored || !(await verifyPassword(body.currentPassword, stored))) {
    signInFailuresByAccount.record(key);
    signInFailuresByIp.record(ip);
    throw badRequest([{ path: "currentPassword", message: "is not your current password" }]);
  }
  if (body.newPassword.normalize("NFC") === body.currentPassword.normalize("NFC")) throw badRequest([{ path: "newPassword", message: "must differ from the current password" }]);
  const r = await changePasswordHash(user.id, await hashPassword(body.newPassword), requestSessionIdHash(req));
  return json({ changed: true, endedSessions: r.endedSessions });
});

/** Ends every session of one's account except the one making the request. */
export const signOutOthers = route(async (req) => {
  const user = await requireUser(req, "account:manage");
  const keep = requestSessionIdHash(req);
  if (!keep) throw unauthenticated();
  return json({ endedSessions: await deleteOtherSessions(user.id, keep) });
});

// ---- Administration of accounts ----

/** Approves a pending account, or refuses it (it stays, unable to sign in). */
export const userApproval = route<{ id: string }>(async (req, ctx: RouteContext<{ id: string }>) => {
  const admin = await requireUser(req, "user:admin");
  const { id } = await ctx.params;
  const body = parseWith(approvalInput, await readJsonObject(req));
  const user = body.decision === "refuse" ? await refuseUser(admin.id, id) : await approveUser(admin.id, id);
  return json({ user: listedUser(user) });
});

export const signUpModeGet = route(async (req) => {
  await requireUser(req, "user:admin");
  return json({ mode: await getSignUpMode() });
});

export const signUpModeSet = route(async (req) => {
  const admin = await requireUser(req, "user:admin");
  const body = parseWith(signUpModeInput, await readJsonObject(req));
  return json({ mode: await setSignUpMode(admin.id, body.mode) });
});

export const invitationsList = route(async (req) => {
  await requireUser(req, "user:admin");
  return json({ invitations: await listInvitations() });
});

/** Makes an invitation; its token is in the answer once (as the sign-up path to hand on). */
export const invitationCreate = route(async (req) => {
  const admin = await requireUser(req, "user:admin");
  const { invitation, token } = await createInvitation(admin.id, await readJsonObject(req));
  return json({ invitation, token, path: `/signup?invitation=${token}` }, 201);
});

export const invitationRevoke = route<{ id: string }>(async (req, ctx: RouteContext<{ id: string }>) => {
  const admin = await requireUser(req, "user:admin");
  const { id } = await ctx.params;
  return json({ invitation: await revokeInvitation(admin.id, id) });
});
