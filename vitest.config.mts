import path from "node:path";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const __dirname = path.dirname(fileURLToPath(import.meta.url));

// `server-only` guards app code against client bundles; under vitest it resolves to its empty module.
const alias = { "@": path.resolve(__dirname), "server-only": path.resolve(__dirname, "node_modules/server-only/empty.js") };

// Projects: pure unit tests; database, API and security tests on temporary SQLite files (`db`)
// and the same files on temporary PostgreSQL databases (`db-pg`); queue tests with real worker
// processes on PostgreSQL (`queue`); browser tests against a built server in headless chromium.
// `npm test` runs them in that order (the PostgreSQL ones when a server is reachable).
const dbFiles = ["tests/db/**/*.test.ts", "tests/api/**/*.test.ts", "tests/security/**/*.test.ts"];
// The projects that run on PostgreSQL: the provider switch and the set-up that checks the server
// and migrates the template database the test databases are copied from.
const onPostgres = {
  env: { ARMSIFT_TEST_PROVIDER: "postgres" },
  globalSetup: ["tests/helpers/build-jobs-setup.ts", "tests/helpers/postgres-setup.ts"],
};
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          include: ["tests/**/*.test.ts"],
          exclude: ["tests/db/**", "tests/browser/**", "tests/api/**", "tests/security/**", "tests/load/**", "tests/queue/**"],
          environment: "node",
          // The command-line tests start a process each; a loaded machine needs more than 5 s.
          testTimeout: 30_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "db",
          include: dbFiles,
          exclude: ["tests/security/**/*.browser.test.ts"],
          environment: "node",
          pool: "forks",
          testTimeout: 30_000,
          // Each file migrates its own database first: allow for a busy machine.
          hookTimeout: 60_000,
          globalSetup: ["tests/helpers/build-jobs-setup.ts"],
        },
      },
      {
        resolve: { alias },
        test: {
          name: "db-pg",
          include: dbFiles,
          exclude: ["tests/security/**/*.browser.test.ts"],
          environment: "node",
          pool: "forks",
          testTimeout: 30_000,
          hookTimeout: 60_000,
          ...onPostgres,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "queue",
          include: ["tests/queue/**/*.test.ts"],
          environment: "node",
          pool: "forks",
          fileParallelism: false,
          testTimeout: 300_000,
          hookTimeout: 120_000,
          ...onPostgres,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "browser",
          include: ["tests/browser/**/*.test.ts", "tests/security/**/*.browser.test.ts", "tests/load/**/*.test.ts"],
          environment: "node",
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 300_000,
          // Rebuilds the production server first when it is missing or older than the sources.
          globalSetup: ["tests/browser/global-setup.ts"],
        },
      },
    ],
  },
});
