// Which peers are trusted proxies (ARMSIFT_TRUSTED_PROXIES), in plain JavaScript so that the
// server entry (scripts/serve.mjs) and the request code (lib/http/forwarded.ts) share one parser.
import { BlockList, isIP } from "node:net";

/** "::ffff:192.0.2.1" → "192.0.2.1"; brackets and a port are dropped; lower case. */
export function normalizeAddress(raw) {
  let a = String(raw).trim();
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(a);
  if (bracketed) a = bracketed[1];
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(a)) a = a.slice(0, a.lastIndexOf(":"));
  const mapped = /^::ffff:(\d{1,3}(\.\d{1,3}){3})$/i.exec(a);
  if (mapped) a = mapped[1];
  return a.toLowerCase();
}

/**
 * Parses a list of addresses and CIDR ranges (IPv4 or IPv6, separated by commas or blanks; the
 * word `loopback` stands for 127.0.0.0/8 and ::1). Entries that are neither are returned in
 * `invalid` and ignored.
 */
export function parseTrustedProxies(value) {
  const list = new BlockList();
  const invalid = [];
  let count = 0;
  for (const entry of String(value ?? "").split(/[\s,]+/).filter(Boolean)) {
    if (entry.toLowerCase() === "loopback") {
      list.addSubnet("127.0.0.0", 8, "ipv4");
      list.addAddress("::1", "ipv6");
      count++;
      continue;
    }
    const [addr, bits, extra] = entry.split("/");
    const ip = normalizeAddress(addr);
    const family = isIP(ip);
    const prefix = bits === undefined ? null : /^\d{1,3}$/.test(bits) ? Number(bits) : NaN;
    if (family === 0 || extra !== undefined || Number.isNaN(prefix) || (prefix !== null && prefix > (family === 4 ? 32 : 128))) {
      invalid.push(entry);
      continue;
    }
    const type = family === 4 ? "ipv4" : "ipv6";
    if (prefix === null) list.addAddress(ip, type);
    else list.addSubnet(ip, prefix, type);
    count++;
  }
  return {
    trusts(address) {
      const ip = normalizeAddress(address);
      const family = isIP(ip);
      return family !== 0 && list.check(ip, family === 4 ? "ipv4" : "ipv6");
    },
    invalid,
    empty: count === 0,
  };
}
