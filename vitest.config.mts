import path from "node:path";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const __dirname = path.dirname(fileURLToPath(import.meta.url));

// `server-only` guards app code against client bundles; under vitest it resolves to its empty module.
const alias = { "@": path.resolve(__dirname), "server-only": path.resolve(__dirname, "node_modules/server-only/empty.js") };

// Three projects: pure unit tests, database tests on temporary SQLite files, and browser tests
// against a built server in headless chromium. `npm test` runs them in that order.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          include: ["tests/**/*.test.ts"],
          exclude: ["tests/db/**", "tests/browser/**", "tests/api/**", "tests/security/**", "tests/load/**"],
          environment: "node",
          // The command-line tests start a process each; a loaded machine needs more than 5 s.
          testTimeout: 30_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "db",
          include: ["tests/db/**/*.test.ts", "tests/api/**/*.test.ts", "tests/security/**/*.test.ts"],
          exclude: ["tests/security/**/*.browser.test.ts"],
          environment: "node",
          pool: "forks",
          testTimeout: 30_000,
          // Set-up hooks migrate a fresh database per file; on a loaded machine that can take
          // longer than vitest's 10 s default, which then fails the file without a failing test.
          hookTimeout: 60_000,
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
