// Accounts for API tests: the first sign-up is admin; an editor and a viewer are made by the admin.
import { expect } from "vitest";
import * as signup from "@/app/api/auth/signup/route";
import * as userById from "@/app/api/users/[id]/route";
import { call, sessionCookieOf } from "./client";

export interface Accounts {
  admin: string;
  editor: string;
  viewer: string;
  ids: { admin: string; editor: string; viewer: string };
}

export async function signUp(email: string, name: string, password = "a long enough password"): Promise<{ cookie: string; id: string; role: string }> {
  const r = await call(signup.POST, "/api/auth/signup", { body: { email, name, password } });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return { cookie: sessionCookieOf(r.res), id: r.body.user.id, role: r.body.user.role };
}

export async function makeAccounts(): Promise<Accounts> {
  const admin = await signUp("admin@example.test", "Ada Admin");
  const editor = await signUp("editor@example.test", "Ed Editor");
  const viewer = await signUp("viewer@example.test", "Vi Viewer");
  const r = await call(userById.PATCH, `/api/users/${editor.id}`, { method: "PATCH", cookie: admin.cookie, params: { id: editor.id }, body: { role: "editor" } });
  expect(r.status).toBe(200);
  return { admin: admin.cookie, editor: editor.cookie, viewer: viewer.cookie, ids: { admin: admin.id, editor: editor.id, viewer: viewer.id } };
}
