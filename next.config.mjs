/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  typedRoutes: false,
  // Loaded from node_modules at run time, not bundled: the queue (pg-boss on pg) and the database drivers.
  serverExternalPackages: ["pg", "pg-boss", "@prisma/adapter-pg", "better-sqlite3", "@prisma/adapter-better-sqlite3"],
};
export default nextConfig;
