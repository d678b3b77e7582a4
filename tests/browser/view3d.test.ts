// The 3-D views in headless Chromium (WebGL through SwiftShader) against the built server on the
// demo data: the canvas draws the arm; the drawn TCP frame, read back from the scene, is the
// analysis library's forward kinematics of the stored solution to 1e-9 (and lies on the target
// within its tolerance, the requirement itself); switching the target or the branch and stepping
// along a path redraw the right configuration; the arm editor's sliders pose the arm by FK of the
// slider values; the keyboard moves the camera; the screenshot is a PNG; the cell view names every
// target; without WebGL the page says so and keeps its 2-D plots and tables.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Locator, Page } from "playwright-core";
import { createArmContext } from "@/lib/analysis/context";
import type { ShortlistAnalysis } from "@/lib/analysis";
import { createData, createModel, forwardKinematics } from "@/lib/kinematics";
import { poseFromRpy } from "@/lib/analysis/geometry";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { kinematicsOf, type ArmDocument } from "@/shared/schemas/arm";
import type { RequirementSet } from "@/shared/schemas/requirements";
import { signIn, signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

const USER = { email: "vera@example.test", name: "Vera Viewer", password: "a long three-d passphrase" };
const BENCH = "Bench assembly: sensor housing press-fit";
const SEAM = "Deburring cell: cast pump-cover seam";

type Inspect = {
  toolFrame(): number[] | null;
  jointFrames(): number[][];
  pairEnds(): number[][] | null;
  camera(): { position: number[]; target: number[] };
  pixel(x: number, y: number): number[];
  project(p: number[]): [number, number];
  background(): number[];
  coverage(): number;
};

const seedArms = new Map(loadSeedArms().map((a) => [a.name, a]));
const seedSets = new Map(loadSeedRequirementSets().map((r) => [r.name, r]));

/** Tool-point pose of the analysis model (arm placed in the cell, TCP as tool point) at q. */
function analysisTcp(arm: ArmDocument, req: RequirementSet, q: number[]): number[] {
  const ctx = createArmContext(arm, req);
  forwardKinematics(ctx.model, ctx.data, q);
  return Array.from(ctx.data.toolPose);
}
const maxDiff = (a: readonly number[], b: readonly number[]) => Math.max(...a.map((x, i) => Math.abs(x - b[i])));
const dist3 = (a: readonly number[], b: readonly number[]) => Math.hypot(a[3] - b[3], a[7] - b[7], a[11] - b[11]);

/** Calls a method of the view's read-only inspection surface on its canvas. */
function inspect(canvas: Locator, method: keyof Inspect, ...args: unknown[]): Promise<unknown> {
  return canvas.evaluate((el, [m, a]) => {
    const v = (el as unknown as { armsiftView: Record<string, (...x: unknown[]) => unknown> }).armsiftView;
    return v[m as string](...(a as unknown[]));
  }, [method, args] as const);
}
const toolFrame = (c: Locator) => inspect(c, "toolFrame") as Promise<number[] | null>;

async function post<T>(page: Page, url: string, body: unknown): Promise<T> {
  return (await page.evaluate(
    async ([u, b]) => {
      const res = await fetch(u as string, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(b) });
      if (!res.ok) throw new Error(`${u}: ${res.status} ${await res.text()}`);
      return res.json();
    },
    [url, body] as const,
  )) as T;
}

async function shortlistOf(page: Page, name: string, setName: string, armNames: string[]): Promise<{ id: string; analysis: ShortlistAnalysis }> {
  const arms = ((await page.evaluate(async () => (await fetch("/api/arms")).json())) as { arms: { id: string; name: string }[] }).arms;
  const sets = ((await page.evaluate(async () => (await fetch("/api/requirements")).json())) as { requirementSets: { id: string; name: string }[] }).requirementSets;
  const armIds = armNames.map((n) => arms.find((a) => a.name === n)!.id);
  const created = await post<{ id: string; run: { id: string } }>(page, "/api/shortlists", { name, requirementSetId: sets.find((s) => s.name === setName)!.id, armIds });
  for (;;) {
    const r = (await page.evaluate(async (u) => (await fetch(u)).json(), `/api/shortlists/${created.id}/runs/${created.run.id}`)) as { run: { status: string; error: string | null } };
    if (r.run.status === "done") break;
    if (r.run.status === "failed") throw new Error(`analysis failed: ${r.run.error}`);
    await page.waitForTimeout(200);
  }
  const exported = (await page.evaluate(async (id) => (await fetch(`/api/shortlists/${id}/export?format=json`)).json(), created.id)) as { analysis: ShortlistAnalysis };
  return { id: created.id, analysis: exported.analysis };
}

/** Opens the 3-D view of the i-th arm section and waits until it has drawn its arm. */
async function openSolutionView(page: Page, index: number): Promise<{ section: Locator; canvas: Locator }> {
  const section = page.getByTestId("arm-section").nth(index);
  await section.getByTestId("solution-view3d").getByRole("button", { name: "Show 3-D view" }).click();
  await section.getByTestId("solution-view").waitFor();
  const canvas = section.getByTestId("view3d-canvas");
  await expect.poll(() => toolFrame(canvas)).not.toBeNull();
  return { section, canvas };
}

describe("3-D views", () => {
  let h: Harness;
  let b: Browser;
  let t: TrackedPage;
  let bench: { id: string; analysis: ShortlistAnalysis };

  beforeAll(async () => {
    h = await startHarness();
    b = await h.browser();
    t = await b.open("/signup");
    await signUp(t, USER);
    bench = await shortlistOf(t.page, "3-D view checks", BENCH, ["Helper Seven 7", "Overhead Six 6"]);
  });
  afterAll(async () => {
    await h?.close();
  });

  it("draws the arm: the canvas differs from the background where the joints project", async () => {
    const p = t.page;
    await p.goto(`/shortlists/${bench.id}`);
    // Opening the view loads its chunk; nothing of it is on the page before.
    expect(await p.getByTestId("view3d-canvas").count()).toBe(0);
    const { canvas } = await openSolutionView(p, 0);
    const joints = (await inspect(canvas, "jointFrames")) as number[][];
    expect(joints.length).toBe(7);
    const bg = (await inspect(canvas, "background")) as number[];
    let drawn = 0;
    for (const f of joints) {
      const [x, y] = (await inspect(canvas, "project", [f[3], f[7], f[11]])) as [number, number];
      const px = (await inspect(canvas, "pixel", x, y)) as number[];
      if (Math.abs(px[0] - bg[0]) + Math.abs(px[1] - bg[1]) + Math.abs(px[2] - bg[2]) > 30) drawn++;
    }
    expect(drawn).toBeGreaterThanOrEqual(6);
    expect((await inspect(canvas, "coverage")) as number).toBeGreaterThan(0.02);
    expect(t.errors()).toEqual([]);
  });

  it("draws the TCP frame at the analysis FK of the chosen solution (1e-9 m), on the target, and follows target and branch", async () => {
    const p = t.page;
    await p.goto(`/shortlists/${bench.id}`);
    const { section, canvas } = await openSolutionView(p, 0);
    const arm = bench.analysis.arms[0];
    expect(arm.name).toBe("Helper Seven 7");
    const seedArm = seedArms.get(arm.name)!, req = seedSets.get(BENCH)!;
    const select = section.getByLabel("Target", { exact: true });
    const check = async (ti: number, branch: number) => {
      const ta = arm.targets[ti];
      const expected = analysisTcp(seedArm, req, ta.solutions[branch].q);
      await expect.poll(async () => maxDiff((await toolFrame(canvas))!, expected)).toBeLessThan(1e-9);
      // The requirement itself: the TCP is on the target within its position tolerance.
      const rt = req.targets[ti];
      expect(dist3(expected, Array.from(poseFromRpy(rt.position, rt.rpy)))).toBeLessThan(rt.positionTolerance * 1.0001);
      return expected;
    };
    const reached = arm.targets.map((x, i) => ({ x, i })).filter(({ x }) => x.reached);
    expect(reached.length).toBeGreaterThanOrEqual(2);
    // Default: the first reached target at its chosen branch.
    expect(Number(await select.inputValue())).toBe(reached[0].i);
    const first = await check(reached[0].i, reached[0].x.chosen!);
    await section.getByTestId("view-status").getByText(`Target ${reached[0].x.name}:`, { exact: false }).waitFor();
    // Switching the target switches the drawn configuration.
    const other = reached.find(({ x }) => dist3(analysisTcp(seedArm, req, x.solutions[x.chosen!].q), first) > 0.01)!;
    await select.selectOption(String(other.i));
    await check(other.i, other.x.chosen!);
    await section.getByTestId("view-status").getByText(`Target ${other.x.name}:`, { exact: false }).waitFor();
    // Another branch of a target with several.
    const multi = reached.find(({ x }) => x.solutions.length > 1);
    if (multi) {
      await select.selectOption(String(multi.i));
      const alt = multi.x.chosen === 0 ? 1 : 0;
      await section.getByLabel("Branch (IK solution)").selectOption(String(alt));
      await check(multi.i, alt);
      await section.getByText(`branch ${alt + 1} of ${multi.x.solutions.length}, another branch`, { exact: false }).waitFor();
    }
    // Reached and missed targets carry the task matrix's symbol and word in the view.
    const missed = arm.targets.find((x) => !x.reached)!;
    expect(missed).toBeDefined();
    await section.locator(".v3-label.target.missed", { hasText: `${missed.name} ✗ fails (not reached)` }).waitFor();
    await section.locator(".v3-label.target.reached", { hasText: `${reached[0].x.name} ✓` }).first().waitFor();
    // The closest pair of the chosen branch: its bodies drawn over, the gap between the analysis' closest points, in words.
    const withPair = reached.find(({ x }) => x.cell?.closest?.pointA && x.cell.closest.pointB)!;
    expect(withPair).toBeDefined();
    await select.selectOption(String(withPair.i));
    const closest = withPair.x.cell!.closest!;
    await expect.poll(() => inspect(canvas, "pairEnds")).toEqual([closest.pointA, closest.pointB]);
    const gap = `gap ${(closest.distance * 1000).toFixed(1)} mm`;
    await section.getByTestId("pair-legend").getByText(gap, { exact: false }).waitFor();
    await section.locator(".v3-label.pair", { hasText: `closest pair: ${closest.a}` }).waitFor();
    await section.getByTestId("view-status").getByText(gap, { exact: false }).waitFor();
    // Another branch: the analysis gives no pair for it, so none is drawn.
    if (withPair.x.solutions.length > 1) {
      await section.getByLabel("Branch (IK solution)").selectOption(String(withPair.x.chosen === 0 ? 1 : 0));
      await expect.poll(() => inspect(canvas, "pairEnds")).toBeNull();
    }
    // The force ellipsoid's legend states its scale.
    await select.selectOption(String(reached[0].i));
    await section.getByTestId("force-legend").getByText(/1 mm stands for [\d.]+ N/).waitFor();
    expect(t.errors()).toEqual([]);
  });

  it("moves the camera with the keyboard: arrows orbit, + zooms, R resets, T looks from the top", async () => {
    const p = t.page;
    const section = p.getByTestId("arm-section").nth(0);
    const canvas = section.getByTestId("view3d-canvas");
    const cam = () => inspect(canvas, "camera") as Promise<{ position: number[]; target: number[] }>;
    const dist = (c: { position: number[]; target: number[] }) => Math.hypot(...c.position.map((x, i) => x - c.target[i]));
    const home = await cam();
    await section.getByTestId("view3d-host").focus();
    await p.keyboard.press("ArrowLeft");
    const orbited = await cam();
    expect(maxDiff(orbited.position, home.position)).toBeGreaterThan(1e-3);
    expect(Math.abs(dist(orbited) - dist(home))).toBeLessThan(1e-9);
    expect(maxDiff(orbited.target, home.target)).toBeLessThan(1e-12);
    await p.keyboard.press("+");
    expect(dist(await cam()) / dist(home)).toBeCloseTo(0.8, 9);
    await p.keyboard.press("Shift+ArrowUp");
    expect(maxDiff((await cam()).target, home.target)).toBeGreaterThan(1e-3);
    await p.keyboard.press("r");
    expect(maxDiff((await cam()).position, home.position)).toBeLessThan(1e-9);
    await p.keyboard.press("t");
    const top = await cam();
    const d = top.position.map((x, i) => x - top.target[i]);
    expect(d[2] / Math.hypot(...d)).toBeGreaterThan(0.999);
    // The bindings are listed beside the view.
    await section.getByText("reset the view").waitFor();
    expect(t.errors()).toEqual([]);
  });

  it("saves a PNG screenshot of the view", async () => {
    const p = t.page;
    const section = p.getByTestId("arm-section").nth(0);
    const [download] = await Promise.all([p.waitForEvent("download"), section.getByRole("button", { name: "Save PNG" }).click()]);
    expect(download.suggestedFilename()).toMatch(/^armsift-Helper-Seven-7-target-.+\.png$/);
    const png = readFileSync((await download.path())!);
    expect(png.subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a");
    const width = png.readUInt32BE(16), height = png.readUInt32BE(20);
    const canvasWidth = (await section.getByTestId("view3d-canvas").evaluate((el) => (el as HTMLCanvasElement).width)) as number;
    expect(width).toBe(canvasWidth);
    expect(height).toBeGreaterThan(200);
    expect(t.errors()).toEqual([]);
  });

  it("steps along a path: the slider poses the arm at each sample's stored configuration", async () => {
    const p = t.page;
    const seam = await shortlistOf(p, "3-D path checks", SEAM, ["Foundry Six 12"]);
    await p.goto(`/shortlists/${seam.id}`);
    const { section, canvas } = await openSolutionView(p, 0);
    const arm = seam.analysis.arms[0];
    const seedArm = seedArms.get(arm.name)!, req = seedSets.get(SEAM)!;
    await section.getByRole("radio", { name: "a path" }).check();
    const path = arm.paths[0];
    expect(path.reached).toBe(path.samples);
    // The stored result keeps a bounded number of the samples (profile.index: their places), the last one among them.
    const kept = path.q.length;
    const no = (k: number) => (path.profile.index?.[k] ?? k) + 1;
    expect(no(kept - 1)).toBe(path.samples);
    const slider = section.getByTestId("path-slider");
    const at = async (k: number) => {
      await expect.poll(async () => Number(await slider.inputValue())).toBe(k);
      await expect.poll(async () => maxDiff((await toolFrame(canvas))!, analysisTcp(seedArm, req, path.q[k]!))).toBeLessThan(1e-9);
      await section.getByTestId("view-status").getByText(`sample ${no(k)} of ${path.samples}`, { exact: false }).waitFor();
    };
    await at(0);
    await slider.focus();
    await p.keyboard.press("End");
    await at(kept - 1);
    for (let i = 0; i < 5; i++) await p.keyboard.press("ArrowLeft");
    await at(kept - 6);
    // The path is drawn with its start labelled.
    await section.locator(".v3-label.path", { hasText: `${path.name}: start` }).waitFor();
    expect(t.errors()).toEqual([]);
  });

  it("arm editor: the sliders pose the arm by FK of their values; home and the limits", async () => {
    const p = t.page;
    const arms = ((await p.evaluate(async () => (await fetch("/api/arms")).json())) as { arms: { id: string; name: string }[] }).arms;
    const name = "Overhead Six 6";
    await p.goto(`/arms/${arms.find((a) => a.name === name)!.id}`);
    const frame = p.getByTestId("arm-view3d");
    await frame.getByRole("button", { name: "Show 3-D view" }).click();
    const canvas = frame.getByTestId("view3d-canvas");
    await expect.poll(() => toolFrame(canvas)).not.toBeNull();
    const doc = seedArms.get(name)!;
    const model = createModel(kinematicsOf(doc));
    const data = createData(model);
    const fk = (q: number[]) => {
      forwardKinematics(model, data, q);
      return Array.from(data.toolPose);
    };
    const sliders = frame.locator("input[type=range]");
    expect(await sliders.count()).toBe(doc.joints.length);
    const values = async () => (await sliders.evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value))).map(Number);
    const drawnIsFk = async () => {
      const q = await values();
      await expect.poll(async () => maxDiff((await toolFrame(canvas))!, fk(q))).toBeLessThan(1e-9);
      return q;
    };
    const q0 = await drawnIsFk();
    expect(q0.every((x) => x === 0)).toBe(true);
    const before = (await toolFrame(canvas))!;
    await frame.getByTestId("joint-slider-2").focus();
    for (let i = 0; i < 20; i++) await p.keyboard.press("ArrowRight");
    const q1 = await drawnIsFk();
    expect(q1[1]).toBeCloseTo((20 * 0.5 * Math.PI) / 180, 12);
    expect(dist3((await toolFrame(canvas))!, before)).toBeGreaterThan(0.01);
    await frame.getByRole("button", { name: "Show at upper limits" }).click();
    expect(await drawnIsFk()).toEqual(doc.joints.map((j) => j.max));
    await frame.getByRole("button", { name: "Show at lower limits" }).click();
    expect(await drawnIsFk()).toEqual(doc.joints.map((j) => j.min));
    await frame.getByRole("button", { name: "Home (q = 0)" }).click();
    await drawnIsFk();
    // Editing the table redraws the arm: a longer first offset moves the tool point up by as much.
    const d1 = frame.page().getByLabel("joint 1 d (mm)", { exact: true });
    const zBefore = (await toolFrame(canvas))![11];
    const j1 = doc.joints[0];
    if (!("d" in j1)) throw new Error(`${name} is expected to be a DH arm`);
    await d1.fill(String(j1.d * 1000 + 100));
    await expect.poll(async () => (await toolFrame(canvas))![11] - zBefore).toBeCloseTo(doc.base ? doc.base[10] * 0.1 : 0.1, 9);
    expect(t.errors()).toEqual([]);
  });

  it("requirement-set editor: the cell view names every target and obstacle", async () => {
    const p = t.page;
    const sets = ((await p.evaluate(async () => (await fetch("/api/requirements")).json())) as { requirementSets: { id: string; name: string }[] }).requirementSets;
    await p.goto(`/requirements/${sets.find((s) => s.name === BENCH)!.id}`);
    const frame = p.getByTestId("cell-view3d");
    await frame.getByRole("button", { name: "Show 3-D view of the cell" }).click();
    await frame.getByTestId("cell-view").waitFor();
    const req = seedSets.get(BENCH)!;
    await expect.poll(async () => (await frame.locator(".v3-label.target").allTextContents()).sort()).toEqual(req.targets.map((x) => x.name).sort());
    expect(req.cell.obstacles.length).toBeGreaterThan(0);
    await expect.poll(async () => (await frame.locator(".v3-label.obstacle").allTextContents()).sort()).toEqual(req.cell.obstacles.map((o) => o.name).sort());
    await frame.locator(".v3-label", { hasText: "arm base" }).waitFor();
    expect((await inspect(frame.getByTestId("view3d-canvas"), "coverage")) as number).toBeGreaterThan(0.01);
    expect(t.errors()).toEqual([]);
  });

  it("without WebGL says so and keeps the 2-D plots and tables", async () => {
    const nb = await h.browser({ args: ["--disable-webgl"] });
    const g = await nb.open("/signin");
    await signIn(g, USER);
    const p = g.page;
    await p.goto(`/shortlists/${bench.id}`);
    const section = p.getByTestId("arm-section").nth(0);
    await section.getByTestId("solution-view3d").getByRole("button", { name: "Show 3-D view" }).click();
    await section.getByTestId("view3d-fallback").getByText("WebGL is switched off or not available", { exact: false }).waitFor();
    expect(await p.getByTestId("view3d-canvas").count()).toBe(0);
    await section.getByText("Workspace").first().waitFor();
    await section.locator("figure.chart").first().waitFor();
    await p.getByTestId("task-matrix").waitFor();
    expect(g.errors()).toEqual([]);
    await nb.close();
  });
});
