import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb } from "./helpers";
import { hashPassword, verifyPassword, SCRYPT_PARAMS } from "@/lib/auth/password";
import { can, type Action, type SessionUser } from "@/lib/auth/permissions";
import { SlidingWindowLimiter } from "@/lib/auth/rate-limit";
import { createSession, getRequestUser, hashToken, SESSION_TTL_MS } from "@/lib/auth/session";
import { createUser, listUsers, setUserRole } from "@/lib/db/users";
import { ValidationError } from "@/lib/db/errors";

let t: TestDb;
beforeAll(() => {
  t = createTestDb();
});
afterAll(async () => t.cleanup());

describe("password hashing (scrypt, RFC 7914)", () => {
  it("verifies the right password, refuses a wrong one, and stores parameters with a random salt", async () => {
    const h1 = await hashPassword("correct horse battery");
    const h2 = await hashPassword("correct horse battery");
    expect(h1).toMatch(/^scrypt\$32768\$8\$1\$[A-Za-z0-9+/]{22}==\$[A-Za-z0-9+/]{86}==$/);
    expect(SCRYPT_PARAMS.N).toBeGreaterThanOrEqual(2 ** 15);
    expect(h1).not.toBe(h2); // different salts
    expect(await verifyPassword("correct horse battery", h1)).toBe(true);
    expect(await verifyPassword("correct horse batterz", h1)).toBe(false);
    expect(await verifyPassword("", h1)).toBe(false);
    expect(await verifyPassword("correct horse battery", "plain-text")).toBe(false);
    expect(await verifyPassword("correct horse battery", h1.replace("$32768$", "$16384$"))).toBe(false);
  });
});

describe("accounts and roles", () => {
  it("makes the first account admin and later ones viewer; an admin changes roles", async () => {
    const first = await createUser({ email: "First@Example.test", name: "First", passwordHash: "x" });
    const second = await createUser({ email: "second@example.test", name: "Second", passwordHash: "x" });
    expect(first.role).toBe("admin");
    expect(first.email).toBe("first@example.test");
    expect(second.role).toBe("viewer");
    await expect(createUser({ email: "FIRST@example.test", name: "Again", passwordHash: "x" })).rejects.toBeInstanceOf(ValidationError);

    expect((await setUserRole(first.id, second.id, "editor")).role).toBe("editor");
    // The only admin cannot demote themselves.
    const err = await setUserRole(first.id, first.id, "viewer").catch((e) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect(err.fieldErrors[0].path).toBe("role");
    expect((await listUsers()).map((u) => [u.email, u.role])).toEqual([
      ["first@example.test", "admin"],
      ["second@example.test", "editor"],
    ]);
  });

  it("decides permissions in one table", () => {
    const user = (role: SessionUser["role"]): SessionUser => ({ id: role, email: `${role}@example.test`, name: role, role });
    const writes: Action[] = ["arm:write", "req:write"];
    for (const a of writes) {
      expect(can(user("admin"), a)).toBe(true);
      expect(can(user("editor"), a)).toBe(true);
      expect(can(user("viewer"), a)).toBe(false);
      expect(can(null, a)).toBe(false);
    }
    expect(can(user("viewer"), "arm:read")).toBe(true);
    expect(can(null, "arm:read")).toBe(false);
    expect(can(user("editor"), "user:admin")).toBe(false);
    expect(can(user("admin"), "user:admin")).toBe(true);
  });
});

describe("sessions", () => {
  it("stores only the token's hash and expires after the TTL", async () => {
    const u = await createUser({ email: "session@example.test", name: "S", passwordHash: "x" });
    const { token, expiresAt } = await createSession(u.id);
    expect(Buffer.from(token, "base64url")).toHaveLength(32);
    expect(expiresAt.getTime() - Date.now()).toBeGreaterThan(SESSION_TTL_MS - 60_000);
    const row = await t.client.session.findUniqueOrThrow({ where: { id: hashToken(token) } });
    expect(row.id).not.toContain(token);

    const req = (tok: string) => new Request("http://localhost/api/auth/me", { headers: { cookie: `other=1; armsift_session=${tok}` } });
    expect((await getRequestUser(req(token)))?.id).toBe(u.id);
    // One moment past expiry the session is gone (and removed).
    expect(await getRequestUser(req(token), new Date(expiresAt.getTime() + 1))).toBeNull();
    expect(await t.client.session.count({ where: { id: hashToken(token) } })).toBe(0);
    expect(await getRequestUser(req(token))).toBeNull();
    expect(await getRequestUser(req("not-a-token"))).toBeNull();
  });
});

describe("sliding-window rate limiter", () => {
  it("allows the limit within the window, then asks to wait until the oldest hit leaves it", () => {
    let now = 1_000_000;
    const lim = new SlidingWindowLimiter(5, 15 * 60_000, () => now);
    for (let i = 0; i < 5; i++) {
      expect(lim.retryAfterMs("k")).toBe(0);
      lim.record("k");
      now += 60_000;
    }
    // Five failures at t0 … t0+4 min; now t0+5 min: the first expires at t0+15 min.
    expect(lim.retryAfterMs("k")).toBe(10 * 60_000);
    expect(lim.retryAfterMs("other")).toBe(0);
    now += 10 * 60_000;
    expect(lim.retryAfterMs("k")).toBe(0);
    lim.record("k");
    lim.reset("k");
    expect(lim.retryAfterMs("k")).toBe(0);
  });
});
