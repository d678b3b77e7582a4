// The response headers Next adds to every page and API response (next.config.mjs). The browser
// tests check that they arrive on real responses of the built server.
import { describe, expect, it } from "vitest";
import type { NextConfig } from "next";
// @ts-expect-error: a plain ES module without type declarations
import rawConfig from "@/next.config.mjs";

type HeaderRule = { source: string; headers: { key: string; value: string }[] };
const config = rawConfig as NextConfig;

describe("security headers on every response", () => {
  it("forbid framing, sniffing and cross-site referrers on every path", async () => {
    const rules = (await config.headers!()) as HeaderRule[];
    const all = rules.find((r) => r.source === "/:path*");
    expect(all, "a rule for every path").toBeDefined();
    const h = Object.fromEntries(all!.headers.map((x) => [x.key.toLowerCase(), x.value]));
    expect(h["content-security-policy"]).toMatch(/(^|;\s*)frame-ancestors 'none'(;|$)/);
    expect(h["x-frame-options"]).toBe("DENY");
    expect(h["x-content-type-options"]).toBe("nosniff");
    expect(h["referrer-policy"]).toMatch(/^(same-origin|no-referrer|strict-origin-when-cross-origin)$/);
  });

  it("send no referrer at all from a share view (its address holds the token)", async () => {
    const rules = (await config.headers!()) as HeaderRule[];
    const share = rules.filter((r) => r.source.startsWith("/share/"));
    expect(share.flatMap((r) => r.headers).find((x) => x.key.toLowerCase() === "referrer-policy")?.value).toBe("no-referrer");
  });
});
