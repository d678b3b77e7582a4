import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb } from "../db/helpers";
import * as signup from "@/app/api/auth/signup/route";
import * as signin from "@/app/api/auth/signin/route";
import * as signout from "@/app/api/auth/signout/route";
import * as me from "@/app/api/auth/me/route";
import * as users from "@/app/api/users/route";
import * as userById from "@/app/api/users/[id]/route";
import * as health from "@/app/api/health/route";
import { PEER_HEADER } from "@/lib/http/forwarded";
import { call, expectFieldError, sessionCookieOf } from "./client";
import { signUp } from "./setup";

let t: TestDb;
beforeAll(() => {
  t = createTestDb();
});
afterAll(async () => t.cleanup());

describe("accounts over the API", () => {
  it("answers the health check: the database, the runner and the runs", async () => {
    const r = await call(health.GET, "/api/health", { method: "GET" });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ ok: true, database: { provider: t.provider, ok: true }, runs: { queued: 0, running: 0, done: 0, failed: 0, cancelled: 0 } });
    expect(r.body.database.latencyMs).toBeGreaterThanOrEqual(0);
    // SQLite: the web server's own runner; PostgreSQL: the queue and its workers (none here).
    if (t.provider === "sqlite") expect(r.body.runner).toMatchObject({ kind: "local", running: 0, waiting: 0 });
    else expect(r.body.runner).toEqual({ kind: "queue", depth: { waiting: 0, active: 0, failed: 0 }, liveWorkers: 0 });
  });

  it("signs up (first admin, then viewer), signs in, reads /me and signs out", async () => {
    const admin = await signUp("owner@example.test", "Olga Owner");
    expect(admin.role).toBe("admin");
    const later = await signUp("later@example.test", "Larry Later");
    expect(later.role).toBe("viewer");

    const r = await call(signin.POST, "/api/auth/signin", { body: { email: "Owner@Example.test", password: "a long enough password" } });
    expect(r.status).toBe(200);
    expect(r.body.user).toEqual({ id: admin.id, email: "owner@example.test", name: "Olga Owner", role: "admin" });
    const setCookie = r.res.headers.get("set-cookie")!;
    expect(setCookie).toMatch(/^armsift_session=[A-Za-z0-9_-]{43}; Path=\/; HttpOnly; SameSite=Lax; Max-Age=1209\d{3}; Expires=/);
    expect(setCookie).not.toMatch(/Secure/);
    const cookie = sessionCookieOf(r.res);

    expect((await call(me.GET, "/api/auth/me", { cookie })).body.user.id).toBe(admin.id);
    const out = await call(signout.POST, "/api/auth/signout", { method: "POST", cookie });
    expect(out.status).toBe(204);
    expect(out.res.headers.get("set-cookie")).toMatch(/armsift_session=; Path=\/; HttpOnly; SameSite=Lax; Max-Age=0/);
    expect((await call(me.GET, "/api/auth/me", { cookie })).status).toBe(401);
    expect((await call(me.GET, "/api/auth/me")).body.error.code).toBe("unauthenticated");
  });

  it("marks the cookie Secure behind a trusted HTTPS proxy", async () => {
    process.env.ARMSIFT_TRUSTED_PROXIES = "10.0.0.1";
    try {
      const r = await call(signin.POST, "/api/auth/signin", {
        body: { email: "owner@example.test", password: "a long enough password" },
        headers: { [PEER_HEADER]: "10.0.0.1", "x-forwarded-proto": "https" },
      });
      expect(r.status).toBe(200);
      expect(r.res.headers.get("set-cookie")).toMatch(/; Secure$/);
    } finally {
      delete process.env.ARMSIFT_TRUSTED_PROXIES;
    }
  });

  it("validates sign-up fields", async () => {
    const r = await call(signup.POST, "/api/auth/signup", { body: { email: "not-an-email", name: "", password: "short" } });
    expectFieldError(r, "email");
    expectFieldError(r, "name");
    expectFieldError(r, "password", /at least 10 characters/);
  });

  it("answers a sign-up for a taken email exactly as for a free one", async () => {
    const taken = await call(signup.POST, "/api/auth/signup", { body: { email: "OWNER@example.test", name: "Dup", password: "another long passphrase" } });
    const free = await call(signup.POST, "/api/auth/signup", { body: { email: "never.seen@example.test", name: "New", password: "another long passphrase" } });
    expect(taken.status).toBe(202);
    expect(free.status).toBe(202);
    expect(taken.body).toEqual(free.body);
    expect(taken.res.headers.get("set-cookie")).toBeNull();
    expect(JSON.stringify(taken.body)).not.toMatch(/exists|taken|already/);
    // The taken account is untouched: its own password still signs in, the other one does not.
    expect((await call(signin.POST, "/api/auth/signin", { body: { email: "owner@example.test", password: "another long passphrase" }, headers: { [PEER_HEADER]: "192.0.2.200" } })).status).toBe(401);
  });

  it("refuses a wrong password with 401 and rate-limits failures per account and address (429, Retry-After)", async () => {
    await signUp("target@example.test", "Tara Target");
    const attempt = (password: string, ip = "198.51.100.7") =>
      call(signin.POST, "/api/auth/signin", { body: { email: "target@example.test", password }, headers: { [PEER_HEADER]: ip } });
    for (let i = 0; i < 5; i++) {
      const r = await attempt("wrong password " + i);
      expect(r.status).toBe(401);
      expect(r.body.error.code).toBe("unauthenticated");
    }
    // Sixth try from that address, even with the right password: refused for a minute.
    const limited = await attempt("a long enough password");
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe("rate-limited");
    const retry = Number(limited.res.headers.get("retry-after"));
    expect(retry).toBeGreaterThan(50);
    expect(retry).toBeLessThanOrEqual(60);
    // The owner elsewhere is not locked out.
    expect((await attempt("a long enough password", "198.51.100.99")).status).toBe(200);
  });

  it("rate-limits failures per client address (20 in 15 min), unknown emails included", async () => {
    const ip = "203.0.113.5";
    for (let i = 0; i < 20; i++) {
      const r = await call(signin.POST, "/api/auth/signin", { body: { email: `nobody${i}@example.test`, password: "whatever it is" }, headers: { [PEER_HEADER]: ip } });
      expect(r.status).toBe(401);
    }
    const r = await call(signin.POST, "/api/auth/signin", { body: { email: "owner@example.test", password: "a long enough password" }, headers: { [PEER_HEADER]: ip } });
    expect(r.status).toBe(429);
    const other = await call(signin.POST, "/api/auth/signin", { body: { email: "owner@example.test", password: "a long enough password" }, headers: { [PEER_HEADER]: "203.0.113.6" } });
    expect(other.status).toBe(200);
  }, 60_000);

  it("lets only an admin list users and change roles", async () => {
    const admin = (await call(signin.POST, "/api/auth/signin", { body: { email: "owner@example.test", password: "a long enough password" }, headers: { [PEER_HEADER]: "192.0.2.1" } })).res;
    const adminCookie = sessionCookieOf(admin);
    const viewer = await signUp("plain@example.test", "Pat Plain");

    expect((await call(users.GET, "/api/users")).status).toBe(401);
    expect((await call(users.GET, "/api/users", { cookie: viewer.cookie })).status).toBe(403);
    const list = await call(users.GET, "/api/users", { cookie: adminCookie });
    expect(list.status).toBe(200);
    expect(list.body.users.map((u: { email: string }) => u.email)).toContain("plain@example.test");
    expect(Object.keys(list.body.users[0]).sort()).toEqual(["createdAt", "email", "id", "name", "role", "status"]);

    const patch = (cookie: string, id: string, body: unknown) => call(userById.PATCH, `/api/users/${id}`, { method: "PATCH", cookie, params: { id }, body });
    expect((await patch(viewer.cookie, viewer.id, { role: "admin" })).status).toBe(403);
    expectFieldError(await patch(adminCookie, viewer.id, { role: "owner" }), "role");
    expect((await patch(adminCookie, "no-such-user", { role: "editor" })).status).toBe(404);
    const promoted = await patch(adminCookie, viewer.id, { role: "editor" });
    expect(promoted.status).toBe(200);
    expect(promoted.body.user.role).toBe("editor");
    expect((await call(me.GET, "/api/auth/me", { cookie: viewer.cookie })).body.user.role).toBe("editor");
  });

  it("refuses a state-changing request from another origin (403)", async () => {
    const r = await call(signup.POST, "/api/auth/signup", {
      body: { email: "csrf@example.test", name: "C", password: "a long enough password" },
      headers: { origin: "https://attacker.example" },
    });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe("forbidden");
    const same = await call(signup.POST, "/api/auth/signup", {
      body: { email: "csrf@example.test", name: "C", password: "a long enough password" },
      headers: { origin: "http://localhost:3000" },
    });
    expect(same.status).toBe(202);
  });
});
