/**
 * Who is on the other end of a request, without trusting what the client says about itself.
 *
 * The server (scripts/serve.mjs) writes the socket's address into PEER_HEADER on every request,
 * replacing anything a client sent under that name. Forwarding headers (X-Forwarded-For,
 * X-Forwarded-Host, X-Forwarded-Proto, X-Real-IP) count only when that peer is one of the proxies
 * named in ARMSIFT_TRUSTED_PROXIES (empty by default: no proxy is trusted and the socket address
 * is the client). The list holds addresses and CIDR ranges, IPv4 or IPv6, separated by commas or
 * blanks, e.g. `127.0.0.1, 10.0.0.0/8, ::1`; the word `loopback` stands for 127.0.0.0/8 and ::1.
 */
import { isIP } from "node:net";
import { normalizeAddress, parseTrustedProxies, type ProxyTrust } from "./proxy-trust.mjs";

export { normalizeAddress, parseTrustedProxies, type ProxyTrust };

/** Header the server sets to the socket's remote address. */
export const PEER_HEADER = "x-armsift-peer";
/** Stands for every client whose address is not known (a request that did not come through the server). */
export const UNKNOWN_ADDRESS = "unknown";

let cached: { value: string | undefined; trust: ProxyTrust } | null = null;

/** The trusted proxies of ARMSIFT_TRUSTED_PROXIES (re-read when the variable changes). */
function trustedProxies(): ProxyTrust {
  const value = process.env.ARMSIFT_TRUSTED_PROXIES;
  if (cached === null || cached.value !== value) {
    const trust = parseTrustedProxies(value);
    if (trust.invalid.length) console.error(`[armsift] ARMSIFT_TRUSTED_PROXIES: ignoring ${trust.invalid.map((e) => JSON.stringify(e)).join(", ")}: not an IP address or CIDR range`);
    cached = { value, trust };
  }
  return cached.trust;
}

/** The socket address the server recorded, or null when the request did not come through it. */
function peerAddress(req: Request): string | null {
  const peer = req.headers.get(PEER_HEADER);
  return peer ? normalizeAddress(peer) : null;
}

/** The peer, when it is a trusted proxy (so its forwarding headers count). */
function trustedPeer(req: Request): string | null {
  const peer = peerAddress(req);
  return peer !== null && trustedProxies().trusts(peer) ? peer : null;
}

/**
 * The client's address, for rate limits and the audit trail: the socket address, or behind
 * trusted proxies the nearest X-Forwarded-For entry that is not itself a trusted proxy (each
 * proxy appends the address it saw, so entries left of that one are the client's own claims).
 */
export function clientAddress(req: Request): string {
  const peer = peerAddress(req);
  if (peer === null) return UNKNOWN_ADDRESS;
  if (!trustedProxies().trusts(peer)) return peer;
  const trust = trustedProxies();
  const hops = (req.headers.get("x-forwarded-for") ?? "").split(",").map((s) => normalizeAddress(s)).filter(Boolean);
  if (hops.length === 0) {
    const real = normalizeAddress(req.headers.get("x-real-ip") ?? "");
    return isIP(real) ? real : peer;
  }
  for (let i = hops.length - 1; i >= 0; i--) {
    if (isIP(hops[i]) === 0) return i === hops.length - 1 ? peer : hops[i + 1];
    if (!trust.trusts(hops[i])) return hops[i];
  }
  return hops[0];
}

/** X-Forwarded-Host (its first entry) when a trusted proxy sent it, else null. */
export function forwardedHost(req: Request): string | null {
  if (trustedPeer(req) === null) return null;
  return req.headers.get("x-forwarded-host")?.split(",")[0]?.trim().toLowerCase() || null;
}

/** True when the client reached us over HTTPS: directly, or through a trusted proxy that says so. */
export function isHttps(req: Request): boolean {
  if (trustedPeer(req) !== null) {
    const proto = req.headers.get("x-forwarded-proto")?.split(",")[0]?.trim().toLowerCase();
    if (proto) return proto === "https";
  }
  return new URL(req.url).protocol === "https:";
}
