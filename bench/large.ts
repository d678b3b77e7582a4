/**
 * Large-shortlist benchmark (`npm run bench`, after the page benchmark): the built server on a
 * temporary SQLite database (its own runner analyses in a thread of the server process), and for
 * the demo shortlists (every demo arm against each demo requirement set) and an invented large one
 * (bench/large-shortlist.ts: 40 arms × 500 targets × 10 paths of about 100 samples; with
 * ARMSIFT_BENCH_LARGE=limits the schema's limits: 40 arms of 12 joints × 500 targets × 50 paths of
 * 200 waypoints at the 0.1 mm step, which takes many minutes):
 * - the analysis: wall time and the server process's peak RSS while it runs;
 * - the stored result: bytes stored and bytes of its JSON; a second shortlist with the same inputs
 *   (reused, nothing copied: the count of stored results stays);
 * - the shortlist page: median time and HTML size;
 * - the XLSX, JSON and CSV exports: time, size, the server's peak RSS;
 * - another signed-in client's GET /api/auth/me, one after another, while the first client asks
 *   for the page, the XLSX and the JSON: p50, p99 and max (target p99 ≤ 100 ms).
 * Peak RSS is the kernel's high-water mark of the server process (reset before each phase through
 * /proc/<pid>/clear_refs where allowed, else the highest of samples every 50 ms). Timings vary
 * with the machine's load; they are printed, never asserted.
 */
import { readFileSync, writeFileSync } from "node:fs";
import Database from "better-sqlite3";
import { loadSeedArms, loadSeedRequirementSets } from "../seed-data/index";
import { startServer, tempDatabase, type Server } from "../tests/load/server";
import { largeShortlist } from "./large-shortlist";
import type { ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet } from "@/shared/schemas/requirements";

/** GETs of each shortlist page (2 at the schema limits, where one takes long). */
const PAGE_GETS = process.env.ARMSIFT_BENCH_LARGE === "limits" ? 2 : 5;

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))] : NaN;
};
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const mib = (b: number) => (b / 2 ** 20).toFixed(1);

/** The server process's resident set: now, and its peak since the last reset (kB → bytes). */
function rss(pid: number): { now: number; peak: number } {
  const status = readFileSync(`/proc/${pid}/status`, "utf8");
  const kb = (k: string) => Number(new RegExp(`${k}:\\s+(\\d+)`).exec(status)?.[1] ?? 0) * 1024;
  return { now: kb("VmRSS"), peak: kb("VmHWM") };
}

/** Measures the server's peak RSS while `f` runs. */
async function peakDuring<T>(pid: number, f: () => Promise<T>): Promise<{ value: T; peak: number }> {
  let reset = true;
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, "5");
  } catch {
    reset = false;
  }
  let sampled = rss(pid).now;
  const timer = setInterval(() => {
    try {
      sampled = Math.max(sampled, rss(pid).now);
    } catch {
      /* gone */
    }
  }, 50);
  try {
    const value = await f();
    const r = rss(pid);
    return { value, peak: reset ? Math.max(r.peak, sampled) : Math.max(sampled, r.now) };
  } finally {
    clearInterval(timer);
  }
}

interface Client {
  get(path: string): Promise<Response>;
  post(path: string, body?: unknown): Promise<Response>;
}

function client(s: Server, cookie = ""): Client {
  const headers = () => ({ cookie, "content-type": "application/json", origin: s.baseUrl });
  return {
    get: (p) => fetch(`${s.baseUrl}${p}`, { headers: headers() }),
    post: (p, body) => fetch(`${s.baseUrl}${p}`, { method: "POST", headers: headers(), body: body === undefined ? undefined : JSON.stringify(body) }),
  };
}

async function signUp(s: Server, email: string): Promise<Client> {
  const password = "a long bench passphrase";
  const r = await client(s).post("/api/auth/signup", { email, name: email.split("@")[0], password });
  if (r.status === 201) return client(s, (r.headers.get("set-cookie") ?? "").split(";")[0]);
  // later sign-ups answer alike whether or not the address had an account: sign in
  if (r.status !== 202) throw new Error(`sign-up answered ${r.status}: ${await r.text()}`);
  const signIn = await client(s).post("/api/auth/signin", { email, password });
  if (signIn.status !== 200) throw new Error(`sign-in answered ${signIn.status}: ${await signIn.text()}`);
  return client(s, (signIn.headers.get("set-cookie") ?? "").split(";")[0]);
}

async function json<T>(r: Promise<Response>): Promise<T> {
  const res = await r;
  if (!res.ok) throw new Error(`${res.url} answered ${res.status}: ${(await res.text()).slice(0, 500)}`);
  return (await res.json()) as T;
}

/** Reads a response to the end; its size in bytes. */
async function drain(res: Response): Promise<number> {
  let n = 0;
  for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) n += chunk.byteLength;
  return n;
}

async function waitForRun(c: Client, shortlistId: string, runId: string): Promise<{ status: string; error: string | null }> {
  for (;;) {
    const { run } = await json<{ run: { status: string; error: string | null } }>(c.get(`/api/shortlists/${shortlistId}/runs/${runId}`));
    if (run.status === "done" || run.status === "failed" || run.status === "cancelled") return run;
    await sleep(250);
  }
}

interface Row { [k: string]: string }

async function scenario(s: Server, dbFile: string, a: Client, b: Client, label: string, arms: ArmDocument[], set: RequirementSet): Promise<Row> {
  const armIds: string[] = [];
  for (const arm of arms) armIds.push((await json<{ id: string }>(a.post("/api/arms", arm))).id);
  const setId = (await json<{ id: string }>(a.post("/api/requirements", set))).id;
  const t0 = performance.now();
  const analysed = await peakDuring(s.pid, async () => {
    const created = await json<{ id: string; run: { id: string } }>(a.post("/api/shortlists", { name: `Bench ${label}`, requirementSetId: setId, armIds }));
    return { created, run: await waitForRun(a, created.id, created.run.id) };
  });
  const wall = performance.now() - t0;
  const { created, run } = analysed.value;
  if (run.status !== "done") return { scenario: label, analysis: `${run.status}: ${run.error}` };
  const conn = new Database(dbFile, { readonly: true });
  const stored = conn.prepare(`SELECT r."bytes" AS bytes, r."jsonBytes" AS jsonBytes FROM "AnalysisResult" r JOIN "AnalysisRun" x ON x."resultKey" = r."key" WHERE x."id" = ?`).get(created.run.id) as { bytes: number; jsonBytes: number };
  const resultsBefore = (conn.prepare(`SELECT count(*) AS n FROM "AnalysisResult"`).get() as { n: number }).n;
  // A second shortlist with the same inputs: reused, the stored result is not copied.
  const r0 = performance.now();
  const twin = await json<{ cached: boolean }>(a.post("/api/shortlists", { name: `Bench ${label} again`, requirementSetId: setId, armIds }));
  const reuseMs = performance.now() - r0;
  const resultsAfter = (conn.prepare(`SELECT count(*) AS n FROM "AnalysisResult"`).get() as { n: number }).n;
  conn.close();

  const pageTimes: number[] = [];
  let html = 0;
  const page = await peakDuring(s.pid, async () => {
    for (let i = 0; i < PAGE_GETS; i++) {
      const p0 = performance.now();
      const res = await a.get(`/shortlists/${created.id}`);
      html = await drain(res);
      if (res.status !== 200) throw new Error(`page answered ${res.status}`);
      pageTimes.push(performance.now() - p0);
    }
  });
  const exports: Record<string, { ms: number; bytes: number; peak: number }> = {};
  for (const format of ["xlsx", "json", "csv"] as const) {
    const e0 = performance.now();
    const m = await peakDuring(s.pid, async () => {
      const res = await a.get(`/api/shortlists/${created.id}/export?format=${format}`);
      const n = await drain(res);
      if (res.status !== 200) throw new Error(`${format} export answered ${res.status}`);
      return n;
    });
    exports[format] = { ms: performance.now() - e0, bytes: m.value, peak: m.peak };
  }

  // Another user's requests while the page, the XLSX and the JSON are asked for.
  const me: number[] = [];
  let busy = true;
  const other = (async () => {
    while (busy) {
      const m0 = performance.now();
      const res = await b.get("/api/auth/me");
      await res.arrayBuffer();
      me.push(performance.now() - m0);
    }
  })();
  await sleep(100);
  await Promise.all([
    a.get(`/shortlists/${created.id}`).then(drain),
    a.get(`/api/shortlists/${created.id}/export?format=xlsx`).then(drain),
    a.get(`/api/shortlists/${created.id}/export?format=json`).then(drain),
  ]);
  busy = false;
  await other;

  return {
    scenario: label,
    "analysis s": (wall / 1000).toFixed(1),
    "analysis peak RSS MiB": mib(analysed.peak),
    "stored MiB (JSON MiB)": `${mib(stored.bytes)} (${mib(stored.jsonBytes)})`,
    "same inputs again": `${twin.cached ? "reused" : "analysed"} in ${reuseMs.toFixed(0)} ms, stored results ${resultsBefore}→${resultsAfter}`,
    "page median ms": quantile(pageTimes, 0.5).toFixed(0),
    "page HTML KiB": (html / 1024).toFixed(0),
    "page peak RSS MiB": mib(page.peak),
    ...Object.fromEntries(Object.entries(exports).map(([f, e]) => [`${f} s / KiB / peak MiB`, `${(e.ms / 1000).toFixed(2)} / ${(e.bytes / 1024).toFixed(0)} / ${mib(e.peak)}`])),
    "other user /api/auth/me p50/p99/max ms (n)": `${quantile(me, 0.5).toFixed(0)}/${quantile(me, 0.99).toFixed(0)}/${Math.max(...me).toFixed(0)} (${me.length})`,
  };
}

export async function run(): Promise<void> {
  const limits = process.env.ARMSIFT_BENCH_LARGE === "limits";
  console.log(`\n== Large shortlists (built server, SQLite, the server's own runner${limits ? "; schema limits" : ""}) ==`);
  const db = tempDatabase();
  const conn = new Database(db.file);
  conn.prepare(`INSERT INTO "Setting" ("key", "value", "updatedAt") VALUES ('signUpMode', ?, ?)`).run(JSON.stringify("open"), new Date().toISOString());
  conn.close();
  const s = await startServer(db);
  try {
    const a = await signUp(s, "bench-large@example.test");
    const b = await signUp(s, "bench-other@example.test");
    const rows: Row[] = [];
    for (const set of loadSeedRequirementSets()) rows.push(await scenario(s, db.file, a, b, `demo: ${set.name.slice(0, 30)}`, loadSeedArms(), set));
    const large = limits
      ? largeShortlist({ arms: 40, joints: 12, targets: 500, paths: 50, waypoints: 200, step: 1e-4 })
      : largeShortlist({ arms: 40, targets: 500, paths: 10, waypoints: 20 });
    rows.push(await scenario(s, db.file, a, b, limits ? "40 × 12 joints × 500 × 50 × 200 at 0.1 mm" : "40 × 500 × 10 paths of ~100 samples", large.arms, large.requirementSet));
    for (const r of rows) {
      console.log(`\n${r.scenario}`);
      for (const [k, v] of Object.entries(r)) if (k !== "scenario") console.log(`  ${k.padEnd(44)} ${v}`);
    }
    console.log("\ntargets: analysis ≤ 60 s and peak RSS ≤ 1 GB, XLSX ≤ 10 s and ≤ 600 MB, page ≤ 300 ms and HTML ≤ 1 MB, other user's p99 ≤ 100 ms; stored ≤ 50 MB at the limits");
  } finally {
    await s.kill("SIGTERM");
    db.cleanup();
  }
}

if (require.main === module) {
  run().catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  });
}
