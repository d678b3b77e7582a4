// Sign-in and share-token limits count the address the server saw (x-armsift-peer), not what
// the client writes in X-Forwarded-For; failures are counted per (account, address) with growing
// back-off, so nobody else can lock an account; one limiter serves every bundle of the app.
import { describe, expect, it, vi } from "vitest";
import * as signin from "@/app/api/auth/signin/route";
import * as arms from "@/app/api/arms/route";
import { BackoffLimiter, signInFailuresByAccount, signInFailuresByIp } from "@/lib/auth/rate-limit";
import { PEER_HEADER } from "@/lib/http/forwarded";
import { call } from "./client";
import { withAccounts } from "./setup";

const { acc } = withAccounts();

const PASSWORD = "a long enough password";
const signIn = (email: string, password: string, headers: Record<string, string>) => call(signin.POST, "/api/auth/signin", { body: { email, password }, headers });
const clear = () => [signInFailuresByAccount, signInFailuresByIp].forEach((l) => l.clear());

describe("client address of the limits", () => {
  it("rotating X-Forwarded-For does not escape the per-address limit", async () => {
    clear();
    for (let i = 0; i < 20; i++) {
      const r = await signIn(`nobody${i}@example.test`, "wrong password", { [PEER_HEADER]: "198.51.100.66", "x-forwarded-for": `203.0.113.${i}` });
      expect(r.status).toBe(401);
    }
    const r = await signIn("nobody99@example.test", "wrong password", { [PEER_HEADER]: "198.51.100.66", "x-forwarded-for": "203.0.113.200" });
    expect(r.status).toBe(429);
  }, 60_000);

  it("naming the victim's address in X-Forwarded-For does not lock the victim out", async () => {
    clear();
    for (let i = 0; i < 25; i++) await signIn(`nobody${i}@example.test`, "wrong password", { [PEER_HEADER]: "198.51.100.66", "x-forwarded-for": "127.0.0.1" });
    const victim = await signIn("viewer@example.test", PASSWORD, { [PEER_HEADER]: "127.0.0.1" });
    expect(victim.status).toBe(200);
  }, 60_000);

  it("behind a configured proxy, the address the proxy appended counts", async () => {
    clear();
    process.env.ARMSIFT_TRUSTED_PROXIES = "10.0.0.1";
    try {
      for (let i = 0; i < 20; i++) await signIn(`nobody${i}@example.test`, "wrong password", { [PEER_HEADER]: "10.0.0.1", "x-forwarded-for": `192.0.2.${i}, 198.51.100.70` });
      expect((await signIn("viewer@example.test", PASSWORD, { [PEER_HEADER]: "10.0.0.1", "x-forwarded-for": "198.51.100.70" })).status).toBe(429);
      expect((await signIn("viewer@example.test", PASSWORD, { [PEER_HEADER]: "10.0.0.1", "x-forwarded-for": "198.51.100.71" })).status).toBe(200);
    } finally {
      delete process.env.ARMSIFT_TRUSTED_PROXIES;
    }
  }, 60_000);

  it("X-Forwarded-Host from an untrusted peer does not satisfy the origin check; X-Forwarded-Proto does not make the cookie Secure", async () => {
    const cross = await call(arms.POST, "/api/arms", {
      cookie: acc.editor, body: { name: "x" },
      headers: { [PEER_HEADER]: "198.51.100.66", origin: "http://evil.test", "x-forwarded-host": "evil.test" },
    });
    expect(cross.status).toBe(403);
    clear();
    const r = await signIn("viewer@example.test", PASSWORD, { [PEER_HEADER]: "198.51.100.66", "x-forwarded-proto": "https" });
    expect(r.status).toBe(200);
    expect(r.res.headers.get("set-cookie")).not.toMatch(/Secure/);
    process.env.ARMSIFT_TRUSTED_PROXIES = "198.51.100.66";
    try {
      const behind = await signIn("viewer@example.test", PASSWORD, { [PEER_HEADER]: "198.51.100.66", "x-forwarded-proto": "https" });
      expect(behind.res.headers.get("set-cookie")).toMatch(/; Secure$/);
    } finally {
      delete process.env.ARMSIFT_TRUSTED_PROXIES;
    }
  });
});

describe("failures per account and address", () => {
  it("wrong passwords from other addresses do not lock the owner out of their own address", async () => {
    clear();
    for (let i = 0; i < 12; i++) {
      expect((await signIn("admin@example.test", `guess ${i}`, { [PEER_HEADER]: `203.0.113.${i}` })).status).toBe(401);
    }
    expect((await signIn("admin@example.test", PASSWORD, { [PEER_HEADER]: "192.0.2.10" })).status).toBe(200);
  }, 60_000);

  it("from one address: 5 free failures, then a wait (Retry-After 60 s), the right password included", async () => {
    clear();
    const from = { [PEER_HEADER]: "203.0.113.77" };
    for (let i = 0; i < 5; i++) expect((await signIn("editor@example.test", `guess ${i}`, from)).status).toBe(401);
    const limited = await signIn("editor@example.test", PASSWORD, from);
    expect(limited.status).toBe(429);
    expect(Number(limited.res.headers.get("retry-after"))).toBeGreaterThan(55);
    expect(Number(limited.res.headers.get("retry-after"))).toBeLessThanOrEqual(60);
    expect((await signIn("editor@example.test", PASSWORD, { [PEER_HEADER]: "203.0.113.78" })).status).toBe(200);
  }, 60_000);

  it("the back-off grows: 1, 2, 4, 8, then at most 15 minutes; a day without failures forgets", () => {
    let now = 0;
    const l = new BackoffLimiter(5, 60_000, 15 * 60_000, 24 * 3600_000, () => now);
    const waits: number[] = [];
    for (let i = 0; i < 10; i++) {
      l.record("k");
      waits.push(l.retryAfterMs("k") / 60_000);
      now += l.retryAfterMs("k");
    }
    expect(waits).toEqual([0, 0, 0, 0, 1, 2, 4, 8, 15, 15]);
    now += 24 * 3600_000;
    l.record("k");
    expect(l.retryAfterMs("k")).toBe(0);
  });
});

describe("one limiter per process", () => {
  it("a second copy of the module (another bundle) counts in the same limiters", async () => {
    const first = await import("@/lib/auth/rate-limit");
    vi.resetModules();
    const second = await import("@/lib/auth/rate-limit");
    expect(second).not.toBe(first);
    expect(second.shareTokenFailures).toBe(first.shareTokenFailures);
    expect(second.shareTokenRequests).toBe(first.shareTokenRequests);
    expect(second.commentPosts).toBe(first.commentPosts);
    expect(second.signInFailuresByIp).toBe(first.signInFailuresByIp);
  });
});

