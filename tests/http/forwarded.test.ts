// The client's address and scheme: the socket address the server records (x-armsift-peer), and
// forwarding headers only from the proxies of ARMSIFT_TRUSTED_PROXIES.
import { afterEach, describe, expect, it } from "vitest";
import { clientAddress, forwardedHost, isHttps, normalizeAddress, parseTrustedProxies, PEER_HEADER, UNKNOWN_ADDRESS } from "@/lib/http/forwarded";

const req = (headers: Record<string, string>, url = "http://app.test/api/x") => new Request(url, { headers });
afterEach(() => {
  delete process.env.ARMSIFT_TRUSTED_PROXIES;
});

describe("client address", () => {
  it("is the socket address when no proxy is trusted (the default), whatever the client claims", () => {
    const r = req({ [PEER_HEADER]: "198.51.100.7", "x-forwarded-for": "127.0.0.1", "x-real-ip": "10.1.1.1" });
    expect(clientAddress(r)).toBe("198.51.100.7");
    expect(clientAddress(req({ [PEER_HEADER]: "::ffff:192.0.2.4" }))).toBe("192.0.2.4");
  });

  it("without the server's peer header the address is unknown (the client's headers never count)", () => {
    expect(clientAddress(req({ "x-forwarded-for": "192.0.2.9" }))).toBe(UNKNOWN_ADDRESS);
  });

  it("behind trusted proxies: the nearest X-Forwarded-For entry that is not a trusted proxy", () => {
    process.env.ARMSIFT_TRUSTED_PROXIES = "10.0.0.0/8, ::1";
    const peer = { [PEER_HEADER]: "10.0.0.2" };
    expect(clientAddress(req({ ...peer, "x-forwarded-for": "127.0.0.1, 203.0.113.9" }))).toBe("203.0.113.9");
    expect(clientAddress(req({ ...peer, "x-forwarded-for": "203.0.113.9, 10.0.0.7" }))).toBe("203.0.113.9");
    expect(clientAddress(req({ ...peer, "x-forwarded-for": "10.0.0.8, 10.0.0.7" }))).toBe("10.0.0.8");
    expect(clientAddress(req({ ...peer }))).toBe("10.0.0.2");
    expect(clientAddress(req({ ...peer, "x-real-ip": "203.0.113.10" }))).toBe("203.0.113.10");
    // A garbage entry appended to the right is not an address: the proxy's own view wins.
    expect(clientAddress(req({ ...peer, "x-forwarded-for": "203.0.113.9, not-an-ip" }))).toBe("10.0.0.2");
    // A peer that is not trusted: its headers do not count.
    expect(clientAddress(req({ [PEER_HEADER]: "192.0.2.50", "x-forwarded-for": "203.0.113.9" }))).toBe("192.0.2.50");
  });

  it("parses addresses, ranges and 'loopback'; reports entries that are neither", () => {
    const t = parseTrustedProxies("loopback 192.0.2.0/24,2001:db8::/32, 10.0.0.300, 1.2.3.4/40, proxy.test");
    expect(t.invalid).toEqual(["10.0.0.300", "1.2.3.4/40", "proxy.test"]);
    expect(["127.0.0.1", "127.8.0.1", "::1", "192.0.2.200", "2001:db8::5", "::ffff:192.0.2.1"].map((a) => t.trusts(a))).toEqual([true, true, true, true, true, true]);
    expect(["192.0.3.1", "2001:db9::1", "garbage", ""].map((a) => t.trusts(a))).toEqual([false, false, false, false]);
    expect(parseTrustedProxies("").empty).toBe(true);
    expect(normalizeAddress("[2001:DB8::1]:443")).toBe("2001:db8::1");
    expect(normalizeAddress("192.0.2.1:8080")).toBe("192.0.2.1");
  });
});

describe("forwarded host and scheme", () => {
  it("are ignored from an untrusted peer and used from a trusted one", () => {
    const claims = { "x-forwarded-host": "evil.test", "x-forwarded-proto": "https" };
    expect(forwardedHost(req({ [PEER_HEADER]: "198.51.100.7", ...claims }))).toBeNull();
    expect(isHttps(req({ [PEER_HEADER]: "198.51.100.7", ...claims }))).toBe(false);
    process.env.ARMSIFT_TRUSTED_PROXIES = "198.51.100.7";
    expect(forwardedHost(req({ [PEER_HEADER]: "198.51.100.7", ...claims }))).toBe("evil.test");
    expect(isHttps(req({ [PEER_HEADER]: "198.51.100.7", ...claims }))).toBe(true);
    expect(isHttps(req({ [PEER_HEADER]: "198.51.100.7", "x-forwarded-proto": "http" }, "https://app.test/"))).toBe(false);
    expect(isHttps(req({}, "https://app.test/"))).toBe(true);
  });
});
