// The production server: Next's request handler behind a plain Node HTTP server, so that every
// request carries the address of the socket it came from (x-armsift-peer, which a client cannot
// set) and forwarding headers (X-Forwarded-For/-Host/-Proto/-Port, X-Real-IP, Forwarded) reach
// the app only from the proxies named in ARMSIFT_TRUSTED_PROXIES (none by default).
// Env: PORT (3000), HOST (127.0.0.1), ARMSIFT_TRUSTED_PROXIES. `npm start` runs it after the build.
import http from "node:http";
import path from "node:path";
import next from "next";
import { normalizeAddress, parseTrustedProxies } from "../lib/http/proxy-trust.mjs";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const port = Number(process.env.PORT ?? "3000");
const host = process.env.HOST || "127.0.0.1";
const trust = parseTrustedProxies(process.env.ARMSIFT_TRUSTED_PROXIES);
if (trust.invalid.length) {
  console.error(`✖ ARMSIFT_TRUSTED_PROXIES: ${trust.invalid.map((e) => JSON.stringify(e)).join(", ")} is not an IP address or CIDR range`);
  process.exit(2);
}

const PEER_HEADER = "x-armsift-peer";
const FORWARDING = ["x-forwarded-for", "x-forwarded-host", "x-forwarded-proto", "x-forwarded-port", "x-real-ip", "forwarded"];

const app = next({ dev: false, dir: root, hostname: host, port });
const handle = app.getRequestHandler();
await app.prepare();

const server = http.createServer((req, res) => {
  const peer = normalizeAddress(req.socket.remoteAddress ?? "");
  req.headers[PEER_HEADER] = peer;
  if (!trust.trusts(peer)) for (const h of FORWARDING) delete req.headers[h];
  handle(req, res).catch((err) => {
    console.error("[serve] request failed:", err);
    if (!res.headersSent) res.statusCode = 500;
    res.end();
  });
});
server.listen(port, host, () => {
  const shown = host.includes(":") ? `[${host}]` : host;
  console.log(`▶ serving on http://${shown}:${port}${trust.empty ? "" : " (trusting forwarding headers from ARMSIFT_TRUSTED_PROXIES)"}`);
});
for (const sig of ["SIGINT", "SIGTERM"]) {
  process.on(sig, () => {
    server.close(() => process.exit(0));
    // Open keep-alive connections would hold close() up; end them after a moment.
    setTimeout(() => process.exit(0), 3000).unref();
  });
}
