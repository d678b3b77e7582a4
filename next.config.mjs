/**
 * Headers on every response (pages, API, files): no framing by any other page (clickjacking),
 * no content-type sniffing, no referrer sent to other sites. The policy restricts only what a
 * page may be embedded in, where forms may post and what <base> may name, so Next's own scripts
 * and styles keep working.
 */
export const securityHeaders = [
  { key: "Content-Security-Policy", value: "frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  typedRoutes: false,
  // Loaded from node_modules at run time, not bundled: the queue (pg-boss on pg) and the database drivers.
  serverExternalPackages: ["pg", "pg-boss", "@prisma/adapter-pg", "better-sqlite3", "@prisma/adapter-better-sqlite3"],
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      // The address of a share view holds its token: never send it on, not even to this site.
      { source: "/share/:path*", headers: [{ key: "Referrer-Policy", value: "no-referrer" }] },
    ];
  },
};
export default nextConfig;
