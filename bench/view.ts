/**
 * 3-D view benchmark (`npm run bench`), in headless Chromium against the built server:
 *
 * 1. Chunks: the JavaScript and CSS the shortlist page loads on its first load, and what opening
 *    one arm's 3-D view adds (the view is a separate chunk). Sizes raw and gzip (level 9, as sent
 *    compressed). Whether any first-load chunk holds three.js is checked by its renderer's name.
 * 2. Frame time: a scene of a 7-joint arm, 20 obstacles and 50 target frames (with their labels)
 *    on this machine's software WebGL (SwiftShader); each frame is rendered while orbiting and
 *    finished on the GPU by a one-pixel read before the clock stops.
 *
 * Figures are printed, never asserted. The scenario is invented for the benchmark. To see what the
 * view adds to the first load, build once with the shortlist page's view panel left out and compare
 * the "first load" rows; done when the view came in, that gave 961.5 → 964.2 KiB raw and
 * 280.3 → 281.2 KiB gzip (the button and its loader), with three.js in no first-load chunk.
 */
import os from "node:os";
import { gzipSync } from "node:zlib";
import type { Page, Response } from "playwright-core";
import { loadSeedArms } from "@/seed-data/index";
import type { RequirementSetInput } from "@/shared/schemas/requirements";
import { rpyPose } from "@/shared/pose";
import { signUp, startHarness } from "../tests/browser/harness";

interface Asset {
  url: string;
  kind: "script" | "stylesheet";
  raw: number;
  gzip: number;
  three: boolean;
}

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
};
const kib = (n: number) => (n / 1024).toFixed(1);

function recorder(page: Page): { assets: Map<string, Promise<Asset | null>>; stop(): void } {
  const assets = new Map<string, Promise<Asset | null>>();
  const on = (res: Response) => {
    const type = res.request().resourceType();
    if (type !== "script" && type !== "stylesheet") return;
    const url = res.url();
    if (assets.has(url)) return;
    assets.set(
      url,
      res.body().then(
        (body) => ({ url, kind: type, raw: body.length, gzip: gzipSync(body, { level: 9 }).length, three: /WebGLRenderer|THREE\.WebGLRenderer|three\.js r\d+/.test(body.toString("latin1")) }),
        () => null,
      ),
    );
  };
  page.on("response", on);
  return { assets, stop: () => page.off("response", on) };
}

async function settle(m: Map<string, Promise<Asset | null>>): Promise<Asset[]> {
  return (await Promise.all(m.values())).filter((a): a is Asset => a !== null);
}

const sum = (xs: Asset[], k: "raw" | "gzip", kind?: Asset["kind"]) => xs.filter((a) => !kind || a.kind === kind).reduce((s, a) => s + a[k], 0);

/** An invented cell: 50 targets on a shell in front of the base and 20 obstacles around it. */
function benchCell(): RequirementSetInput {
  const targets = Array.from({ length: 50 }, (_, i) => {
    const az = -1.2 + (2.4 * (i % 10)) / 9;
    const ring = Math.floor(i / 10);
    const r = 0.35 + 0.07 * ring;
    return {
      name: `bench-${String(i + 1).padStart(2, "0")}`,
      position: [r * Math.cos(az), r * Math.sin(az), 0.25 + 0.05 * ring] as [number, number, number],
      rpy: [Math.PI, 0, az] as [number, number, number],
      mode: "axis" as const,
      positionTolerance: 1e-5,
      rotationTolerance: 1e-4,
    };
  });
  const obstacles = Array.from({ length: 20 }, (_, i) => {
    const az = (2 * Math.PI * i) / 20;
    const c: [number, number, number] = [0.95 * Math.cos(az), 0.95 * Math.sin(az), 0.1 + 0.05 * (i % 4)];
    return i % 2 === 0
      ? { shape: "box" as const, name: `bench box ${i + 1}`, center: c, size: [0.12, 0.1, 0.2] as [number, number, number] }
      : { shape: "sphere" as const, name: `bench ball ${i + 1}`, center: c, radius: 0.06 };
  });
  return {
    name: "Bench scene: 50 targets, 20 obstacles",
    base: rpyPose([0, 0, 0], [0, 0, 0]),
    tool: { tcp: rpyPose([0, 0, 0.1], [0, 0, 0]), mass: 0.5, cog: [0, 0, 0.05] },
    payload: { mass: 1, cog: [0, 0, 0.02] },
    targets,
    paths: [],
    specs: [],
    obstacles,
  };
}

async function post<T>(page: Page, url: string, body?: unknown): Promise<T> {
  return (await page.evaluate(
    async ([u, b]) => {
      const res = await fetch(u as string, { method: "POST", headers: { "content-type": "application/json" }, body: b === undefined ? undefined : JSON.stringify(b) });
      const text = await res.text();
      if (!res.ok) throw new Error(`${u} answered ${res.status}: ${text.slice(0, 300)}`);
      return JSON.parse(text);
    },
    [url, body] as const,
  )) as T;
}

async function waitRun(page: Page, shortlistId: string, runId: string): Promise<void> {
  for (;;) {
    const r = (await page.evaluate(async (u) => (await fetch(u)).json(), `/api/shortlists/${shortlistId}/runs/${runId}`)) as { run: { status: string; error: string | null } };
    if (r.run.status === "done") return;
    if (r.run.status === "failed") throw new Error(`analysis failed: ${r.run.error}`);
    await page.waitForTimeout(200);
  }
}

export async function run(): Promise<void> {
  const h = await startHarness();
  try {
    const b = await h.browser();
    const t = await b.open("/signup");
    await signUp(t, { email: "bench-view@example.test", name: "Bench View", password: "a long bench passphrase" });
    const p = t.page;
    const arms = ((await p.evaluate(async () => (await fetch("/api/arms")).json())) as { arms: { id: string; name: string; axes: number }[] }).arms;
    const sets = ((await p.evaluate(async () => (await fetch("/api/requirements")).json())) as { requirementSets: { id: string; name: string }[] }).requirementSets;

    // 1. Chunks of the shortlist page, before and after opening a view.
    const set = sets.find((s) => /bench assembly/i.test(s.name)) ?? sets[0];
    const sl = await post<{ id: string; run: { id: string } }>(p, "/api/shortlists", { name: "Bench view chunks", requirementSetId: set.id, armIds: arms.slice(0, 2).map((a) => a.id) });
    await waitRun(p, sl.id, sl.run.id);
    const rec = recorder(p);
    await p.goto(`/shortlists/${sl.id}`, { waitUntil: "networkidle" });
    const first = await settle(rec.assets);
    const firstUrls = new Set(first.map((a) => a.url));
    const open = p.getByTestId("solution-view3d").first().getByRole("button", { name: "Show 3-D view" });
    const hasView = (await open.count()) > 0;
    let added: Asset[] = [];
    if (hasView) {
      await open.click();
      await p.getByTestId("view3d-canvas").first().waitFor();
      await p.waitForLoadState("networkidle");
      added = (await settle(rec.assets)).filter((a) => !firstUrls.has(a.url));
    }
    rec.stop();
    console.log("\n3-D view: chunks of the shortlist page (built server, headless Chromium)");
    console.table([
      { what: "first load, JS", files: first.filter((a) => a.kind === "script").length, "KiB raw": kib(sum(first, "raw", "script")), "KiB gzip": kib(sum(first, "gzip", "script")), "three.js inside": first.some((a) => a.three) ? "yes" : "no" },
      { what: "first load, CSS", files: first.filter((a) => a.kind === "stylesheet").length, "KiB raw": kib(sum(first, "raw", "stylesheet")), "KiB gzip": kib(sum(first, "gzip", "stylesheet")), "three.js inside": "" },
      { what: hasView ? "added by opening a view" : "(no 3-D view on this build)", files: added.length, "KiB raw": kib(sum(added, "raw")), "KiB gzip": kib(sum(added, "gzip")), "three.js inside": added.some((a) => a.three) ? "yes" : "no" },
    ]);

    // 2. Frame time: 7-joint arm, 20 obstacles, 50 targets.
    const seven = arms.find((a) => a.axes === 7) ?? arms[0];
    const seeds = loadSeedArms();
    if (!seeds.some((a) => a.joints.length === 7)) console.log("(no 7-joint demo arm; using %s)", seven.name);
    const cell = await post<{ id: string }>(p, "/api/requirements", benchCell());
    const big = await post<{ id: string; run: { id: string } }>(p, "/api/shortlists", { name: "Bench view frame time", requirementSetId: cell.id, armIds: [seven.id] });
    const t0 = performance.now();
    await waitRun(p, big.id, big.run.id);
    const analysisS = (performance.now() - t0) / 1000;
    await p.goto(`/shortlists/${big.id}`);
    if (!hasView) return;
    await p.getByTestId("solution-view3d").first().getByRole("button", { name: "Show 3-D view" }).click();
    const canvas = p.getByTestId("view3d-canvas").first();
    await canvas.waitFor();
    await p.getByTestId("solution-view").first().waitFor();
    await p.waitForTimeout(300);
    const res = (await canvas.evaluate((el) => {
      const v = (el as HTMLCanvasElement & { armsiftView: { frameTimes(n: number): number[]; stats(): Record<string, number> } }).armsiftView;
      v.frameTimes(10);
      return { times: v.frameTimes(60), stats: v.stats() };
    })) as { times: number[]; stats: { drawCalls: number; triangles: number; labels: number; width: number; height: number } };
    console.log("\n3-D view: frame time, %s (%d joints) with 50 target frames and 20 obstacles (analysis %s s)", seven.name, seven.axes, analysisS.toFixed(1));
    console.table([
      {
        canvas: `${res.stats.width}×${res.stats.height} px`,
        "draw calls": res.stats.drawCalls,
        triangles: res.stats.triangles,
        labels: res.stats.labels,
        "median ms": quantile(res.times, 0.5).toFixed(2),
        "p95 ms": quantile(res.times, 0.95).toFixed(2),
        "max ms": Math.max(...res.times).toFixed(2),
        // Software WebGL shares the CPU with whatever else runs: the figures scale with the load.
        "load (1 min)": os.loadavg()[0].toFixed(1),
        cpus: os.cpus().length,
      },
    ]);
    if (t.errors().length) console.log("console errors:\n" + t.errors().join("\n"));
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
