// Accounts for API tests: the first sign-up is admin; later sign-ups wait for approval (the
// default sign-up mode), are approved by the admin and get a session; an editor and a viewer are made.
import { afterAll, beforeAll, expect } from "vitest";
import * as signup from "@/app/api/auth/signup/route";
import * as userById from "@/app/api/users/[id]/route";
import { approveUser, findUserForSignIn, listUsers } from "@/lib/db";
import { createSession } from "@/lib/auth/session";
import { call, sessionCookieOf } from "./client";
import { createTestDb, type TestDb } from "../db/helpers";

export interface Accounts {
  admin: string;
  editor: string;
  viewer: string;
  ids: { admin: string; editor: string; viewer: string };
}

/**
 * Signs up through the API; a later account is approved by the first admin (when it waits for
 * approval) and given a session, so every account returned has one.
 */
export async function signUp(email: string, name: string, password = "a long enough password"): Promise<{ cookie: string; id: string; role: string }> {
  const r = await call(signup.POST, "/api/auth/signup", { body: { email, name, password } });
  if (r.status === 201) return { cookie: sessionCookieOf(r.res), id: r.body.user.id, role: r.body.user.role };
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  const account = await findUserForSignIn(email);
  expect(account, `no account for ${email}`).not.toBeNull();
  if (account!.status === "pending") {
    const admin = (await listUsers()).find((u) => u.role === "admin" && u.status === "active")!;
    await approveUser(admin.id, account!.id);
  }
  // A session as sign-in would make it (sign-in itself is tested in auth.test.ts).
  const { token } = await createSession(account!.id);
  return { cookie: `armsift_session=${token}`, id: account!.id, role: account!.role };
}

export async function makeAccounts(): Promise<Accounts> {
  const admin = await signUp("admin@example.test", "Ada Admin");
  const editor = await signUp("editor@example.test", "Ed Editor");
  const viewer = await signUp("viewer@example.test", "Vi Viewer");
  const r = await call(userById.PATCH, `/api/users/${editor.id}`, { method: "PATCH", cookie: admin.cookie, params: { id: editor.id }, body: { role: "editor" } });
  expect(r.status).toBe(200);
  return { admin: admin.cookie, editor: editor.cookie, viewer: viewer.cookie, ids: { admin: admin.id, editor: editor.id, viewer: viewer.id } };
}

/**
 * The set-up most API test files share: a fresh migrated database and the three accounts, made
 * before the file's tests and removed after them. The objects returned are filled in when the
 * tests start (read them inside tests and later hooks, not at module load); a `beforeAll`
 * registered after this call already sees them.
 */
export function withAccounts(): { acc: Accounts; t: TestDb } {
  const acc = {} as Accounts;
  const t = {} as TestDb;
  beforeAll(async () => {
    Object.assign(t, createTestDb());
    Object.assign(acc, await makeAccounts());
  }, 120_000);
  afterAll(async () => t.cleanup?.());
  return { acc, t };
}
