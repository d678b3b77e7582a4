/**
 * Shortlist page benchmark (`npm run bench`): starts the built server on a seeded temporary
 * database, creates a shortlist of all demo arms for each demo requirement set, waits for the
 * analysis (run time reported), asks again (cache hit), then times N GETs of the cached shortlist
 * page and prints median and p95. Loopback wall time per request, so it includes the server's
 * whole response; timings vary with load and are reported, never asserted.
 */
import { startHarness } from "../tests/browser/harness";

const N = 40;
const WARMUP = 3;

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
};

export async function run(): Promise<void> {
  const h = await startHarness();
  try {
    const signup = await fetch(`${h.baseUrl}/api/auth/signup`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email: "bench@example.test", name: "Bench", password: "a long bench passphrase" }),
    });
    const cookie = (signup.headers.get("set-cookie") ?? "").split(";")[0];
    const get = (p: string) => fetch(`${h.baseUrl}${p}`, { headers: { cookie } });
    const post = (p: string, body?: unknown) =>
      fetch(`${h.baseUrl}${p}`, { method: "POST", headers: { cookie, "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
    const arms = ((await (await get("/api/arms")).json()) as { arms: { id: string }[] }).arms;
    const sets = ((await (await get("/api/requirements")).json()) as { requirementSets: { id: string; name: string }[] }).requirementSets;

    const rows: string[][] = [];
    for (const set of sets) {
      const t0 = performance.now();
      const created = (await (await post("/api/shortlists", { name: `Bench ${set.name}`, requirementSetId: set.id, armIds: arms.map((a) => a.id) })).json()) as { id: string; run: { id: string } };
      let run: { status: string; startedAt: string | null; finishedAt: string | null; error: string | null };
      for (;;) {
        run = ((await (await get(`/api/shortlists/${created.id}/runs/${created.run.id}`)).json()) as { run: typeof run }).run;
        if (run.status === "done" || run.status === "failed") break;
        await new Promise((r) => setTimeout(r, 100));
      }
      if (run.status !== "done") throw new Error(`analysis failed: ${run.error}`);
      const wall = performance.now() - t0;
      const inProcess = new Date(run.finishedAt!).getTime() - new Date(run.startedAt!).getTime();
      const c0 = performance.now();
      const again = (await (await post(`/api/shortlists/${created.id}/runs`)).json()) as { cached: boolean };
      const cacheMs = performance.now() - c0;

      const times: number[] = [];
      let bytes = 0;
      for (let i = 0; i < WARMUP + N; i++) {
        const s = performance.now();
        const res = await get(`/shortlists/${created.id}`);
        const text = await res.text();
        if (res.status !== 200) throw new Error(`page answered ${res.status}`);
        bytes = text.length;
        if (i >= WARMUP) times.push(performance.now() - s);
      }
      rows.push([
        set.name.slice(0, 40), String(arms.length), (wall / 1000).toFixed(2), (inProcess / 1000).toFixed(2), `${again.cached ? "hit" : "miss"} ${cacheMs.toFixed(0)}`,
        quantile(times, 0.5).toFixed(1), quantile(times, 0.95).toFixed(1), (bytes / 1024).toFixed(0),
      ]);
    }
    console.log("\nShortlist page (built server, loopback; N = %d GETs after %d warm-up)", N, WARMUP);
    const head = ["requirement set", "arms", "run wall s", "run in process s", "re-run ms", "page median ms", "page p95 ms", "HTML KiB"];
    console.table(rows.map((r) => Object.fromEntries(head.map((k, i) => [k, r[i]]))));
  } finally {
    await h.close();
  }
}

if (require.main === module) {
  run().catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  });
}
