/**
 * Team set-up benchmark (`npm run bench`, when PostgreSQL answers at ARMSIFT_TEST_PG_URL or
 * 127.0.0.1:5432), on temporary databases copied from the migrated template:
 * 1. Queue throughput: JOBS CPU-bound analyses (the invented seed arms against one cell, each job
 *    with its own cell so no result is reused) drained by 1 worker process, then by 2; jobs per
 *    minute and the ratio (target on 2 cores: 2 workers ≥ 1.8 × one).
 * 2. The shortlist page and its API on PostgreSQL and on SQLite, same data (made through the API
 *    of each built server): median and p95 of N GETs, and the ratio (target ≤ 1.25).
 * 3. 100 concurrent commenters against PostgreSQL: each posts ROUNDS comments at once with a
 *    client key; lost = acknowledged but not stored (target 0); latency p50/p99.
 * Timings depend on the machine's load: they are printed, never asserted.
 */
import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { loadSeedArms, loadSeedRequirementSets } from "../seed-data/index";
import { adminUrl, createDatabase, ensureTemplate, reachable } from "../tests/helpers/postgres";
import { logFolder, startServer, tempDatabase, type Server } from "../tests/load/server";
import { killWorkers, startWorkerProcess } from "../tests/queue/workers";

const JOBS = Number(process.env.BENCH_QUEUE_JOBS ?? 8);
const N = 30;
const COMMENTERS = 100;
const ROUNDS = 3;

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
};
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

interface Client {
  cookie: string;
  get(path: string): Promise<Response>;
  post(path: string, body?: unknown): Promise<Response>;
}

function client(s: Server, cookie = ""): Client {
  const headers = () => ({ cookie, "content-type": "application/json", origin: s.baseUrl });
  return {
    cookie,
    get: (p) => fetch(`${s.baseUrl}${p}`, { headers: headers() }),
    post: (p, body) => fetch(`${s.baseUrl}${p}`, { method: "POST", headers: headers(), body: body === undefined ? undefined : JSON.stringify(body) }),
  };
}

/** First sign-up on a fresh database: the administrator. */
async function admin(s: Server): Promise<Client> {
  const r = await client(s).post("/api/auth/signup", { email: `bench-${randomBytes(3).toString("hex")}@example.test`, name: "Bench Admin", password: "a long bench passphrase" });
  if (r.status !== 201) throw new Error(`sign-up answered ${r.status}: ${await r.text()}`);
  return client(s, (r.headers.get("set-cookie") ?? "").split(";")[0]);
}

async function json<T>(r: Promise<Response>): Promise<T> {
  const res = await r;
  if (!res.ok) throw new Error(`${res.url} answered ${res.status}: ${await res.text()}`);
  return (await res.json()) as T;
}

/** Posts the seed arms and requirement sets, then one shortlist per set of the given arms; waits for the runs. */
async function populate(c: Client, shortlistsPerSet = 1): Promise<{ shortlists: string[] }> {
  const arms: string[] = [];
  for (const a of loadSeedArms()) arms.push((await json<{ id: string }>(c.post("/api/arms", a))).id);
  const shortlists: { id: string; run: string }[] = [];
  for (const set of loadSeedRequirementSets()) {
    const setId = (await json<{ id: string }>(c.post("/api/requirements", set))).id;
    for (let i = 0; i < shortlistsPerSet; i++) {
      const r = await json<{ id: string; run: { id: string } }>(c.post("/api/shortlists", { name: `Bench ${set.name} ${i}`, requirementSetId: setId, armIds: arms }));
      shortlists.push({ id: r.id, run: r.run.id });
    }
  }
  for (const s of shortlists) {
    for (;;) {
      const { run } = await json<{ run: { status: string; error: string | null } }>(c.get(`/api/shortlists/${s.id}/runs/${s.run}`));
      if (run.status === "done") break;
      if (run.status !== "queued" && run.status !== "running") throw new Error(`analysis ${run.status}: ${run.error}`);
      await sleep(200);
    }
  }
  return { shortlists: shortlists.map((s) => s.id) };
}

async function timeGets(c: Client, path: string): Promise<{ median: number; p95: number }> {
  const times: number[] = [];
  for (let i = 0; i < N + 3; i++) {
    const t0 = performance.now();
    const res = await c.get(path);
    await res.text();
    if (res.status !== 200) throw new Error(`${path} answered ${res.status}`);
    if (i >= 3) times.push(performance.now() - t0);
  }
  return { median: quantile(times, 0.5), p95: quantile(times, 0.95) };
}

async function queueThroughput(): Promise<void> {
  const rows: Record<string, string>[] = [];
  const perMinute: number[] = [];
  for (const workers of [1, 2]) {
    const pg = createDatabase("armsift_bench");
    const server = await startServer(logFolder(), { databaseUrl: pg.url });
    try {
      const c = await admin(server);
      const arms: string[] = [];
      for (const a of loadSeedArms()) arms.push((await json<{ id: string }>(c.post("/api/arms", a))).id);
      const base = loadSeedRequirementSets()[0];
      const runs: { id: string; run: string }[] = [];
      for (let i = 0; i < JOBS; i++) {
        const setId = (await json<{ id: string }>(c.post("/api/requirements", { ...base, name: `${base.name} #${i}` }))).id;
        const r = await json<{ id: string; run: { id: string } }>(c.post("/api/shortlists", { name: `Queue bench ${i}`, requirementSetId: setId, armIds: arms }));
        runs.push({ id: r.id, run: r.run.id });
      }
      const t0 = performance.now();
      for (let w = 0; w < workers; w++) startWorkerProcess(`W${w}`, pg.url, { ARMSIFT_WORKER_CONCURRENCY: "1" });
      for (const r of runs) {
        for (;;) {
          const { run } = await json<{ run: { status: string } }>(c.get(`/api/shortlists/${r.id}/runs/${r.run}`));
          if (run.status === "done") break;
          if (run.status !== "queued" && run.status !== "running") throw new Error(`queue bench run ${run.status}`);
          await sleep(100);
        }
      }
      const seconds = (performance.now() - t0) / 1000;
      perMinute.push((JOBS / seconds) * 60);
      rows.push({ workers: String(workers), jobs: String(JOBS), "drain s": seconds.toFixed(1), "jobs/min": perMinute[perMinute.length - 1].toFixed(1) });
    } finally {
      killWorkers();
      await server.kill("SIGKILL");
      pg.drop();
    }
  }
  console.log(`\nQueue throughput (worker processes, 1 analysis at a time each; ${JOBS} jobs of ${loadSeedArms().length} arms)`);
  console.table(rows);
  console.log(`2 workers / 1 worker: ${(perMinute[1] / perMinute[0]).toFixed(2)} × (target ≥ 1.8 on 2 free cores)`);
}

async function pageAndApi(): Promise<void> {
  const pg = createDatabase("armsift_bench");
  const file = tempDatabase();
  const rows: Record<string, string>[] = [];
  const medians: Record<string, { page: number; api: number }> = {};
  for (const [label, start] of [
    ["SQLite", () => startServer(file)],
    ["PostgreSQL", () => startServer(logFolder(), { databaseUrl: pg.url })],
  ] as const) {
    const server = await start();
    try {
      if (label === "PostgreSQL") startWorkerProcess("W", pg.url);
      const c = await admin(server);
      const { shortlists } = await populate(c);
      const page = await timeGets(c, `/shortlists/${shortlists[0]}`);
      const api = await timeGets(c, `/api/shortlists/${shortlists[0]}`);
      medians[label] = { page: page.median, api: api.median };
      rows.push({ database: label, "page median ms": page.median.toFixed(1), "page p95 ms": page.p95.toFixed(1), "API median ms": api.median.toFixed(1), "API p95 ms": api.p95.toFixed(1) });
    } finally {
      killWorkers();
      await server.kill("SIGKILL");
    }
  }
  pg.drop();
  file.cleanup();
  console.log(`\nShortlist page and API, same data (built server, loopback; N = ${N} GETs after 3 warm-up)`);
  console.table(rows);
  console.log(
    `PostgreSQL / SQLite: page ${(medians.PostgreSQL.page / medians.SQLite.page).toFixed(2)} ×, API ${(medians.PostgreSQL.api / medians.SQLite.api).toFixed(2)} × (target ≤ 1.25)`,
  );
}

async function commenters(): Promise<void> {
  const pg = createDatabase("armsift_bench");
  const server = await startServer(logFolder(), { databaseUrl: pg.url });
  try {
    startWorkerProcess("W", pg.url);
    const c = await admin(server);
    const { shortlists } = await populate(c);
    const shortlist = shortlists[0];
    // Members made through the data layer, as sign-in makes them (the sign-up mode may need approval).
    const cookies = JSON.parse(
      execFileSync(process.execPath, ["--import", "tsx", "--conditions=react-server", path.join(__dirname, "team-members.ts"), String(COMMENTERS)], {
        cwd: path.resolve(__dirname, ".."),
        env: { ...process.env, DATABASE_URL: pg.url },
        encoding: "utf8",
      }),
    ) as string[];
    const members = cookies.map((cookie) => client(server, cookie));
    const latencies: number[] = [];
    let acked = 0, refused = 0, noAnswer = 0;
    let firstError = "";
    for (let round = 0; round < ROUNDS; round++) {
      await Promise.all(
        members.map(async (m, i) => {
          const t0 = performance.now();
          try {
            const res = await m.post(`/api/shortlists/${shortlist}/comments`, { body: `round ${round} from commenter ${i}`, clientKey: `bench-${round}-${i}` });
            latencies.push(performance.now() - t0);
            if (res.status === 201) acked++;
            else refused++;
            await res.text();
          } catch (err) {
            // No answer (connection closed): not acknowledged, so not counted as lost either.
            noAnswer++;
            if (!firstError) firstError = err instanceof Error ? `${err.message} (${String((err as { cause?: unknown }).cause)})` : String(err);
          }
        }),
      );
    }
    const { threads } = await json<{ threads: { body: string; replies: unknown[] }[] }>(c.get(`/api/shortlists/${shortlist}/comments`));
    const stored = threads.filter((t) => t.body.startsWith("round ")).length;
    console.log(`\n${COMMENTERS} concurrent commenters on PostgreSQL, ${ROUNDS} rounds (all at once per round)`);
    console.table([{
      posted: String(COMMENTERS * ROUNDS), acknowledged: String(acked), refused: String(refused), "no answer": String(noAnswer), stored: String(stored), lost: String(acked - stored),
      "p50 ms": quantile(latencies, 0.5).toFixed(0), "p99 ms": quantile(latencies, 0.99).toFixed(0), "max ms": Math.max(...latencies).toFixed(0),
    }]);
    if (noAnswer) console.log(`requests without an answer: ${firstError}\nserver log (end):\n${server.log().slice(-1500)}`);
  } finally {
    killWorkers();
    await server.kill("SIGKILL");
    pg.drop();
  }
}

export async function run(): Promise<void> {
  if (!(await reachable())) {
    console.log(`\nTeam set-up benchmark skipped: PostgreSQL at ${new URL(adminUrl()).host} does not answer (ARMSIFT_TEST_PG_URL)`);
    return;
  }
  ensureTemplate();
  const only = process.env.BENCH_TEAM_ONLY;
  if (!only || only === "queue") await queueThroughput();
  if (!only || only === "page") await pageAndApi();
  if (!only || only === "comments") await commenters();
}

if (require.main === module) {
  run().catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  });
}
