/**
 * Browser-test harness: per test file a temporary database (migrated and seeded), the built
 * production server on a free loopback port, and fresh headless Chromium profiles. Every page
 * opened through the harness records console errors and uncaught page errors so tests can assert
 * that none occurred.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, openSync, readFileSync, rmSync, closeSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { buildIsStale } from "../helpers/build-freshness";

const ROOT = path.resolve(__dirname, "..", "..");
const CHROMIUM = "/usr/bin/chromium";
const CHROMIUM_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv, what: string, timeoutMs = 240_000): void {
  const r = spawnSync(cmd, args, { cwd: ROOT, env, encoding: "utf8", timeout: timeoutMs });
  if (r.status !== 0) throw new Error(`${what} failed (exit ${r.status}):\n${r.stdout}\n${r.stderr}`);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Builds the production server when it is missing or older than the sources (`npm test` builds first). */
export function ensureBuild(): void {
  run(process.execPath, [path.join(ROOT, "scripts", "build-jobs.mjs")], process.env, "build the analysis programs");
  if (!buildIsStale(ROOT)) return;
  // A production build takes minutes on a loaded machine: allow 15. The browser project builds
  // once in its global set-up (tests/browser/global-setup.ts), outside any hook's time limit.
  run(process.execPath, [path.join(ROOT, "node_modules", "next", "dist", "bin", "next"), "build"], { ...process.env, NEXT_TELEMETRY_DISABLED: "1" }, "next build", 900_000);
}

export interface TrackedPage {
  page: Page;
  /** Console errors and page errors seen so far, minus the ones a test declared expected. */
  errors(): string[];
  /** Declares console errors a step causes on purpose (e.g. the browser's log line for a 409). */
  expect(pattern: RegExp): void;
}

export interface Browser {
  context: BrowserContext;
  open(urlPath?: string): Promise<TrackedPage>;
  close(): Promise<void>;
}

export interface Harness {
  baseUrl: string;
  dbPath: string;
  serverLog(): string;
  /** A fresh Chromium profile; `args` adds command-line switches (e.g. `--disable-webgl`). */
  browser(opts?: { args?: string[] }): Promise<Browser>;
  close(): Promise<void>;
}

export interface HarnessOptions {
  /**
   * The sign-up mode the database starts with. Most tests make several accounts through the
   * sign-up page and run with open sign-up; null keeps the product's default (approval).
   */
  signUpMode?: "open" | "approval" | "invitation" | null;
}

export async function startHarness(opts: HarnessOptions = {}): Promise<Harness> {
  ensureBuild();
  const dir = mkdtempSync(path.join(os.tmpdir(), "armsift-browser-"));
  const dbPath = path.join(dir, "armsift.db");
  const env: NodeJS.ProcessEnv = { ...process.env, ARMSIFT_DB: dbPath, DATABASE_URL: `file:${dbPath}`, NEXT_TELEMETRY_DISABLED: "1" };
  run(process.execPath, [path.join(ROOT, "scripts", "prisma.mjs"), "migrate", "deploy"], env, "migrate deploy");
  run(process.execPath, [path.join(ROOT, "dist", "jobs", "seed.mjs")], env, "seed");
  const mode = opts.signUpMode === undefined ? "open" : opts.signUpMode;
  if (mode !== null) {
    const conn = new Database(dbPath);
    conn.prepare(`INSERT INTO "Setting" ("key", "value", "updatedAt") VALUES ('signUpMode', ?, ?)`).run(JSON.stringify(mode), new Date().toISOString());
    conn.close();
  }

  const port = await freePort();
  const logPath = path.join(dir, "server.log");
  const logFd = openSync(logPath, "a");
  const server: ChildProcess = spawn(process.execPath, [path.join(ROOT, "scripts", "serve.mjs")], {
    cwd: ROOT,
    env: { ...env, PORT: String(port), HOST: "127.0.0.1" },
    detached: true,
    stdio: ["ignore", logFd, logFd],
  });
  closeSync(logFd);
  // If the test process ends without running close() (a crash or a timeout), take the server along.
  const killOnExit = () => {
    try {
      if (server.pid !== undefined && server.exitCode === null) process.kill(-server.pid, "SIGKILL");
    } catch {
      /* already gone */
    }
  };
  process.once("exit", killOnExit);
  const baseUrl = `http://127.0.0.1:${port}`;
  const serverLog = () => (existsSync(logPath) ? readFileSync(logPath, "utf8") : "");

  const stopServer = async () => {
    if (server.pid === undefined || server.exitCode !== null) return;
    const exited = new Promise<void>((resolve) => server.once("exit", () => resolve()));
    try {
      process.kill(-server.pid, "SIGTERM");
    } catch {
      return;
    }
    const timer = setTimeout(() => {
      try {
        process.kill(-server.pid!, "SIGKILL");
      } catch {
        /* already gone */
      }
    }, 5000);
    await exited;
    clearTimeout(timer);
  };

  const deadline = Date.now() + 60_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`server exited with ${server.exitCode}:\n${serverLog()}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) {
      await stopServer();
      throw new Error(`server did not answer /api/health within 60 s:\n${serverLog()}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }

  const browsers: Browser[] = [];
  return {
    baseUrl,
    dbPath,
    serverLog,
    async browser(opts = {}) {
      const profile = mkdtempSync(path.join(dir, "profile-"));
      const context = await chromium.launchPersistentContext(profile, {
        executablePath: CHROMIUM,
        headless: true,
        args: [...CHROMIUM_ARGS, ...(opts.args ?? [])],
        baseURL: baseUrl,
        viewport: { width: 1280, height: 900 },
      });
      context.setDefaultTimeout(15_000);
      const b: Browser = {
        context,
        async open(urlPath = "/") {
          const page = context.pages()[0] && context.pages()[0].url() === "about:blank" ? context.pages()[0] : await context.newPage();
          const seen: string[] = [];
          const expected: RegExp[] = [];
          page.on("console", (msg) => {
            if (msg.type() === "error") seen.push(`console: ${msg.text()} (${page.url()})`);
          });
          page.on("pageerror", (err) => seen.push(`page error: ${err.message} (${page.url()})`));
          await page.goto(urlPath);
          return {
            page,
            errors: () => seen.filter((s) => !expected.some((re) => re.test(s))),
            expect: (re) => expected.push(re),
          };
        },
        async close() {
          await context.close();
        },
      };
      browsers.push(b);
      return b;
    },
    async close() {
      for (const b of browsers) await b.close().catch(() => undefined);
      await stopServer();
      process.removeListener("exit", killOnExit);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/**
 * Signs up through the page; returns when the arm catalog shows. The first account is signed in
 * at once; a later one (open sign-up) reads the sign-up answer and then signs in.
 */
export async function signUp(t: TrackedPage, user: { email: string; name: string; password: string }): Promise<void> {
  const { page } = t;
  await page.goto("/signup");
  await page.getByLabel("Email").fill(user.email);
  await page.getByLabel("Name").fill(user.name);
  await page.getByLabel("Password").fill(user.password);
  await page.getByRole("button", { name: "Create account" }).click();
  const done = page.getByTestId("signup-done");
  // Whichever comes first; the other wait is dropped (its timeout must not surface later).
  await Promise.race([page.waitForURL("**/arms").catch(() => undefined), done.waitFor().catch(() => undefined)]);
  if (new URL(page.url()).pathname === "/arms") return;
  await done.waitFor();
  await signIn(t, user);
}

export async function signIn(t: TrackedPage, user: { email: string; password: string }): Promise<void> {
  const { page } = t;
  await page.goto("/signin");
  await page.getByLabel("Email").fill(user.email);
  await page.getByLabel("Password").fill(user.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL("**/arms");
}
