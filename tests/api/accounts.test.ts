// Sign-up by mode (approval by default, open, invitation only), approval and refusal by an
// admin, invitations, password change with the password policy, and signing out one's other
// sessions.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb } from "../db/helpers";
import * as signup from "@/app/api/auth/signup/route";
import * as signin from "@/app/api/auth/signin/route";
import * as me from "@/app/api/auth/me/route";
import * as arms from "@/app/api/arms/route";
import * as users from "@/app/api/users/route";
import * as approval from "@/app/api/users/[id]/approval/route";
import * as mode from "@/app/api/settings/sign-up/route";
import * as invitations from "@/app/api/invitations/route";
import * as invitationById from "@/app/api/invitations/[id]/route";
import * as password from "@/app/api/auth/password/route";
import * as signoutOthers from "@/app/api/auth/signout-others/route";
import { signInFailuresByAccount, signInFailuresByIp } from "@/lib/auth/rate-limit";
import { PEER_HEADER } from "@/lib/http/forwarded";
import { call, expectFieldError, sessionCookieOf, type Body } from "./client";

let t: TestDb;
let admin: string;
beforeAll(async () => {
  t = createTestDb();
  const r = await call(signup.POST, "/api/auth/signup", { body: { email: "root@example.test", name: "Root Admin", password: "a long enough password" } });
  expect(r.status).toBe(201);
  admin = sessionCookieOf(r.res);
}, 120_000);
afterAll(async () => t.cleanup());

const PW = "a long enough password";
const signUp = (email: string, extra: Record<string, unknown> = {}) => call(signup.POST, "/api/auth/signup", { body: { email, name: `Member ${email.split("@")[0]}`, password: PW, ...extra } });
const signIn = (email: string, pw = PW) => call(signin.POST, "/api/auth/signin", { body: { email, password: pw }, headers: { [PEER_HEADER]: "192.0.2.10" } });
const listed = async () => (await call(users.GET, "/api/users", { cookie: admin })).body.users as Body[];
const setMode = (m: string, cookie = admin) => call(mode.PUT, "/api/settings/sign-up", { method: "PUT", cookie, body: { mode: m } });

describe("sign-up needs an admin's approval by default", () => {
  it("a new account waits, cannot sign in, and reads nothing until approved", async () => {
    expect((await call(mode.GET, "/api/settings/sign-up", { cookie: admin })).body.mode).toBe("approval");
    const r = await signUp("pending@example.test");
    expect(r.status).toBe(202);
    expect(r.body.signUp.access).toBe("pending");
    expect(r.res.headers.get("set-cookie")).toBeNull();
    const denied = await signIn("pending@example.test");
    expect(denied.status).toBe(403);
    expect(denied.body.error.message).toMatch(/waits for an administrator's approval/);
    expect(denied.res.headers.get("set-cookie")).toBeNull();
    const wrong = await signIn("pending@example.test", "not the password at all");
    expect(wrong.status).toBe(401);

    const u = (await listed()).find((x) => x.email === "pending@example.test")!;
    expect(u.status).toBe("pending");
    const ok = await call(approval.POST, "/x", { cookie: admin, params: { id: u.id }, body: { decision: "approve" } });
    expect(ok.status).toBe(200);
    expect(ok.body.user.status).toBe("active");
    const s = await signIn("pending@example.test");
    expect(s.status).toBe(200);
    expect((await call(arms.GET, "/api/arms", { cookie: sessionCookieOf(s.res) })).status).toBe(200);
  });

  it("a refused account cannot sign in; refusing an active account is a field error", async () => {
    await signUp("refused@example.test");
    const u = (await listed()).find((x) => x.email === "refused@example.test")!;
    const r = await call(approval.POST, "/x", { cookie: admin, params: { id: u.id }, body: { decision: "refuse" } });
    expect(r.body.user).toMatchObject({ id: u.id, status: "refused" });
    const s = await signIn("refused@example.test");
    expect(s.status).toBe(403);
    expect(s.body.error.message).toMatch(/did not approve/);
    const active = (await listed()).find((x) => x.email === "root@example.test")!;
    expectFieldError(await call(approval.POST, "/x", { cookie: admin, params: { id: active.id }, body: { decision: "refuse" } }), "decision", /only an account waiting/);
    expectFieldError(await call(approval.POST, "/x", { cookie: admin, params: { id: active.id }, body: { decision: "maybe" } }), "decision");
  });
});

describe("open sign-up and invitation-only sign-up", () => {
  it("open: the account is active at once (a viewer)", async () => {
    expect((await setMode("open")).body.mode).toBe("open");
    const r = await signUp("open@example.test");
    expect(r.body.signUp.access).toBe("active");
    const s = await signIn("open@example.test");
    expect(s.status).toBe(200);
    expect(s.body.user.role).toBe("viewer");
  });

  it("invitation only: without one, a field error on invitation (for a taken and a free email alike)", async () => {
    await setMode("invitation");
    const free = await signUp("uninvited@example.test");
    const taken = await signUp("open@example.test");
    expectFieldError(free, "invitation", /need an invitation/);
    expect(taken.body).toEqual(free.body);
    expect((await listed()).some((x) => x.email === "uninvited@example.test")).toBe(false);
  });

  it("an invitation makes an active account of its role once; used, revoked and bound-to-another-email ones fail", async () => {
    const made = await call(invitations.POST, "/api/invitations", { cookie: admin, body: { role: "editor", expiresInDays: 3 } });
    expect(made.status).toBe(201);
    expect(made.body.path).toBe(`/signup?invitation=${made.body.token}`);
    expect(made.body.invitation).toMatchObject({ role: "editor", email: null, state: "open" });
    const r = await signUp("invited@example.test", { invitation: made.body.token });
    expect(r.status).toBe(202);
    expect(r.body.signUp.access).toBe("active");
    expect((await signIn("invited@example.test")).body.user.role).toBe("editor");
    expectFieldError(await signUp("second@example.test", { invitation: made.body.token }), "invitation", /does not work/);

    const bound = await call(invitations.POST, "/api/invitations", { cookie: admin, body: { email: "Bound@Example.test" } });
    expectFieldError(await signUp("other@example.test", { invitation: bound.body.token }), "email", /for another email address/);
    expect((await signUp("bound@example.test", { invitation: bound.body.token })).body.signUp.access).toBe("active");

    const revoked = await call(invitations.POST, "/api/invitations", { cookie: admin, body: {} });
    const rv = await call(invitationById.DELETE, "/x", { method: "DELETE", cookie: admin, params: { id: revoked.body.invitation.id } });
    expect(rv.body.invitation.state).toBe("revoked");
    expectFieldError(await signUp("late@example.test", { invitation: revoked.body.token }), "invitation", /does not work/);

    const list = (await call(invitations.GET, "/api/invitations", { cookie: admin })).body.invitations as Body[];
    expect(list.map((i) => i.state).sort()).toEqual(["revoked", "used", "used"]);
    expect(JSON.stringify(list)).not.toContain(made.body.token);
  });

  it("an invitation used with a taken email stays unused, and the answer is the one for a free email", async () => {
    const made = await call(invitations.POST, "/api/invitations", { cookie: admin, body: {} });
    const taken = await signUp("open@example.test", { invitation: made.body.token });
    expect(taken.status).toBe(202);
    expect(taken.body.signUp.access).toBe("active");
    const list = (await call(invitations.GET, "/api/invitations", { cookie: admin })).body.invitations as Body[];
    expect(list.find((i) => i.id === made.body.invitation.id)!.state).toBe("open");
  });

  it("only admins see and change the mode and the invitations; the mode is one of three", async () => {
    const viewer = sessionCookieOf((await signIn("open@example.test")).res);
    expect((await setMode("open", viewer)).status).toBe(403);
    expect((await call(invitations.POST, "/api/invitations", { cookie: viewer, body: {} })).status).toBe(403);
    expectFieldError(await setMode("everyone"), "mode", /open, approval or invitation/);
    expectFieldError(await call(invitations.POST, "/api/invitations", { cookie: admin, body: { role: "owner", expiresInDays: 400 } }), "role");
    await setMode("approval");
  });
});

describe("one's own account", () => {
  it("changes the password under the policy, ending the other sessions but not this one", async () => {
    signInFailuresByAccount.clear();
    signInFailuresByIp.clear();
    await setMode("open");
    await signUp("changer@example.test");
    const here = sessionCookieOf((await signIn("changer@example.test")).res);
    const there = sessionCookieOf((await signIn("changer@example.test")).res);
    const change = (body: unknown) => call(password.POST, "/api/auth/password", { cookie: here, body, headers: { [PEER_HEADER]: "192.0.2.11" } });
    expectFieldError(await change({ currentPassword: "wrong password here", newPassword: "a fresh long passphrase" }), "currentPassword", /not your current password/);
    expectFieldError(await change({ currentPassword: PW, newPassword: "1234567890" }), "newPassword", /consecutive|common/);
    expectFieldError(await change({ currentPassword: PW, newPassword: "changer@example.test" }), "newPassword", /email address or name/);
    expectFieldError(await change({ currentPassword: PW, newPassword: PW }), "newPassword", /must differ/);
    const ok = await change({ currentPassword: PW, newPassword: "a fresh long passphrase" });
    expect(ok.body).toEqual({ changed: true, endedSessions: 1 });
    expect((await call(me.GET, "/api/auth/me", { cookie: here })).status).toBe(200);
    expect((await call(me.GET, "/api/auth/me", { cookie: there })).status).toBe(401);
    expect((await signIn("changer@example.test")).status).toBe(401);
    expect((await signIn("changer@example.test", "a fresh long passphrase")).status).toBe(200);
    await setMode("approval");
  });

  it("signs out every other session of the account", async () => {
    const a = sessionCookieOf((await signIn("open@example.test")).res);
    const b = sessionCookieOf((await signIn("open@example.test")).res);
    const c = sessionCookieOf((await signIn("open@example.test")).res);
    const r = await call(signoutOthers.POST, "/api/auth/signout-others", { cookie: a, body: {} });
    expect(r.body.endedSessions).toBeGreaterThanOrEqual(2);
    expect((await call(me.GET, "/api/auth/me", { cookie: a })).status).toBe(200);
    for (const other of [b, c]) expect((await call(me.GET, "/api/auth/me", { cookie: other })).status).toBe(401);
    expect((await call(signoutOthers.POST, "/api/auth/signout-others", { body: {} })).status).toBe(401);
  });

  it("sign-up refuses trivial and common passwords and the password = email", async () => {
    for (const [pw, re] of [["aaaaaaaaaa", /repeated/], [" ".repeat(10), /only spaces/], ["\u0000".repeat(10), /control characters/], ["1234567890", /consecutive|common/], ["trivial@example.test", /email address or name/]] as const) {
      expectFieldError(await call(signup.POST, "/api/auth/signup", { body: { email: "trivial@example.test", name: "Tri Vial", password: pw } }), "password", re);
    }
  });
});
