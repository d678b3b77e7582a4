/**
 * Screenshots of every page at 1280 and 390 px wide, for looking at the UI (not a test):
 *   npx tsx tests/browser/screenshots.ts [outDir] [--only=cycle] [--widths=1366,390]
 * `--only=cycle` takes just the cycle-time screens (the joint table's acceleration column and
 * note, the sequences editor, the shortlist's cycle section and an arm's breakdown) on a set made
 * for them. Uses the harness: temporary seeded database, built server, headless Chromium.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { signUp, startHarness } from "./harness";

const flag = (name: string) => process.argv.find((a) => a.startsWith(`--${name}=`))?.split("=")[1];
const WIDTHS = (flag("widths") ?? "1280,390").split(",").map(Number);

/** The cycle-time screens: arms with and without acceleration limits, a set with two sequences, a shortlist of three arms. */
async function cycleShots(p: Page, out: string, shots: [string, string][]): Promise<void> {
  const element = async (name: string, testId: string) => {
    for (const width of WIDTHS) {
      await p.setViewportSize({ width, height: 900 });
      await p.waitForTimeout(300);
      const el = p.getByTestId(testId).first();
      await el.scrollIntoViewIfNeeded();
      const file = path.join(out, `${name}-${width}.png`);
      await el.screenshot({ path: file });
      shots.push([name, file]);
    }
  };
  const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
  // Page-side calls one by one (a named helper inside evaluate would need tsx's __name there).
  const post = (url: string, body: unknown) =>
    p.evaluate(async (a) => (await fetch(a.url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(a.body) })).json(), { url, body }) as Promise<{ id: string }>;
  const get = (url: string) => p.evaluate(async (u) => (await fetch(u)).json(), url);
  const arms = (await get("/api/arms")).arms as { id: string; name: string }[];
  const reach = arms.find((a) => a.name === "Reach Cobot 10")!.id;
  const src = (await get(`/api/arms/${reach}`)).arm as { joints: object[] };
  const stated = await post("/api/arms", { ...src, name: "Reach Cobot 10 (accelerations stated)", joints: src.joints.map((j, i) => ({ ...j, ...(i < 4 ? { maxAcceleration: 4 + i } : {}) })) });
  const req = await post("/api/requirements", {
    name: "Cycle screens", base: I, tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 0.5, cog: [0, 0, 0.05] }, payload: { mass: 0, cog: [0, 0, 0] },
    targets: [
      { name: "pick", position: [0.45, 0.2, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
      { name: "place", position: [0.4, -0.2, 0.25], rpy: [Math.PI, 0, 0], mode: "axis" },
      { name: "press", position: [0.5, 0, 0.35], rpy: [Math.PI, 0, 0], mode: "axis" },
    ],
    paths: [{ name: "inspect", mode: "axis", step: 0.005, speed: 0.1, waypoints: [{ position: [0.4, -0.1, 0.3], rpy: [Math.PI, 0, 0] }, { position: [0.4, 0.1, 0.3], rpy: [Math.PI, 0, 0] }] }],
    specs: [],
    sequences: [
      { name: "pick, press, place", steps: [{ kind: "move", target: "pick", dwell: 0.4 }, { kind: "move", target: "press", dwell: 1.2 }, { kind: "move", target: "place", dwell: 0.3 }, { kind: "wait", seconds: 0.5 }], required: 6 },
      { name: "inspection", steps: [{ kind: "move", target: "pick" }, { kind: "path", path: "inspect" }] },
    ],
  });
  const shortlist = await post("/api/shortlists", { name: "Cycle screens", requirementSetId: req.id, armIds: [reach, stated.id, arms.find((a) => a.name === "Compact Six 3")!.id] });
  const ids = { arm: stated.id, req: req.id, shortlist: shortlist.id };
  await p.goto(`/arms/${ids.arm}`);
  await element("cycle-arm-joints", "joint-table");
  await element("cycle-arm-note", "cycle-limits-note");
  await p.goto(`/requirements/${ids.req}`);
  await element("cycle-sequences", "sequences-panel");
  await p.getByTestId("sequence-1").getByLabel(/^Required/).first().selectOption("rate");
  await p.getByTestId("sequence-1").getByLabel("sequence 1 step 2 dwell (s)").fill("abc");
  await p.getByRole("button", { name: /^Save/ }).first().click();
  await element("cycle-sequences-errors", "sequence-1");
  await p.goto(`/shortlists/${ids.shortlist}`);
  await p.getByTestId("ranking").waitFor({ timeout: 180_000 });
  await element("cycle-section", "cycle-section");
  await element("cycle-arm-breakdown", "arm-cycle");
}

async function main(): Promise<void> {
  const out = path.resolve(process.argv.slice(2).find((a) => !a.startsWith("--")) ?? "test-results/shots");
  mkdirSync(out, { recursive: true });
  const h = await startHarness();
  try {
    const b = await h.browser();
    const t = await b.open("/signin");
    const p = t.page;
    const shots: [string, string][] = [];
    if (flag("only") === "cycle") {
      await signUp(t, { email: "shots@example.test", name: "Sam Shots", password: "screenshots only 123" });
      await cycleShots(p, out, shots);
      console.log(shots.map(([, f]) => f).join("\n"));
      if (t.errors().length) console.log("console errors:\n" + t.errors().join("\n"));
      return;
    }
    const snap = async (name: string) => {
      for (const width of WIDTHS) {
        await p.setViewportSize({ width, height: 900 });
        await p.waitForTimeout(150);
        const file = path.join(out, `${name}-${width}.png`);
        await p.screenshot({ path: file, fullPage: true });
        shots.push([name, file]);
      }
      await p.setViewportSize({ width: 1280, height: 900 });
    };
    // A 3-D view: the viewport at the view (not the whole page), desktop and narrow.
    const snapView = async (name: string) => {
      for (const width of WIDTHS) {
        await p.setViewportSize({ width, height: 900 });
        await p.waitForTimeout(400);
        await p.getByTestId("view3d-open").first().scrollIntoViewIfNeeded();
        const section = p.locator("[data-testid$='view3d'][data-state='open']").first();
        const file = path.join(out, `${name}-${width}.png`);
        await section.screenshot({ path: file });
        shots.push([name, file]);
      }
      await p.setViewportSize({ width: 1280, height: 900 });
    };
    await snap("signin");
    await p.goto("/signup");
    await snap("signup");
    await signUp(t, { email: "shots@example.test", name: "Sam Shots", password: "screenshots only 123" });
    await snap("arms");
    await p.getByRole("button", { name: "Import URDF…" }).click();
    await p.getByTestId("urdf-import").getByLabel("URDF file").setInputFiles(path.join(__dirname, "..", "..", "seed-data", "urdf", "offset-wrist-8.urdf"));
    await p.getByTestId("urdf-preview").waitFor();
    await snap("urdf-import");
    const firstArm = await p.getByTestId("arm-table").locator("tbody tr a").first().getAttribute("href");
    // A DH arm for the table and paste screens (the catalog also holds chain arms imported from URDF).
    const dhArm = await p.getByTestId("arm-table").locator("tbody tr a", { hasText: "Compact Six 3" }).first().getAttribute("href");
    await p.goto("/arms/new");
    await snap("arm-new");
    await p.goto(dhArm!);
    await snap("arm-edit");
    await p.getByRole("button", { name: "Paste from spreadsheet…" }).click();
    await p.getByLabel("Pasted table").fill("type\ta\talpha\td\ttheta\tmin\tmax\nR\t0\t90\t300\t0\t-170\t170\nR\t250\tabc\t0\t0\t-120\t120");
    await p.getByLabel("joint 1 max (°)", { exact: true }).fill("-400");
    await p.getByRole("button", { name: "Save new revision" }).click();
    await snap("arm-edit-errors");
    // 3-D views: the arm editor's live view (a DH arm and the first arm of the catalog), the cell view, the shortlist's solution view.
    for (const [name, href] of [["arm-view3d", dhArm], ["arm-view3d-first", firstArm]] as const) {
      await p.goto(href!);
      await p.getByTestId("arm-view3d").getByRole("button", { name: "Show 3-D view" }).click();
      await p.getByTestId("view3d-canvas").waitFor();
      await p.getByTestId("arm-view3d").scrollIntoViewIfNeeded();
      await p.waitForTimeout(400);
      await snapView(name);
    }
    // A chain (URDF) arm's editor with its collision geometry.
    await p.goto(firstArm!);
    await p.getByTestId("collision-panel").waitFor();
    await p.getByTestId("arm-view3d").getByRole("button", { name: "Show 3-D view" }).click();
    await p.getByTestId("view3d-canvas").waitFor();
    await p.waitForTimeout(400);
    await snap("arm-edit-chain");
    await p.goto(dhArm! + "/history");
    await snap("arm-history");
    await p.goto(dhArm! + "/history/1");
    await snap("arm-revision");
    await p.goto("/requirements");
    await snap("requirements");
    const firstSet = await p.getByTestId("requirement-table").locator("tbody tr a").first().getAttribute("href").catch(() => null);
    await p.goto("/requirements/new");
    await snap("requirement-new");
    if (firstSet) {
      await p.goto(firstSet);
      await snap("requirement-edit");
      await p.getByTestId("cell-view3d").getByRole("button", { name: "Show 3-D view of the cell" }).click();
      await p.getByTestId("view3d-canvas").waitFor();
      await p.waitForTimeout(400);
      await snapView("cell-view3d");
    }
    // A shortlist of two demo arms on the first demo requirement set, its first arm's 3-D view.
    const armIds = ((await p.evaluate(async () => (await fetch("/api/arms")).json())) as { arms: { id: string }[] }).arms.map((a) => a.id);
    const setId = ((await p.evaluate(async () => (await fetch("/api/requirements")).json())) as { requirementSets: { id: string }[] }).requirementSets[0].id;
    const created = (await p.evaluate(
      async (body) => (await fetch("/api/shortlists", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) })).json(),
      { name: "Screenshot shortlist", requirementSetId: setId, armIds: armIds.slice(0, 2) },
    )) as { id: string };
    await p.goto(`/shortlists/${created.id}`);
    await p.getByTestId("ranking").waitFor({ timeout: 120_000 });
    await p.getByTestId("solution-view3d").first().getByRole("button", { name: "Show 3-D view" }).click();
    await p.getByTestId("solution-view").first().waitFor();
    await p.waitForTimeout(400);
    await snapView("shortlist-view3d");
    await snap("shortlist");
    await p.goto("/account");
    await snap("account");
    await p.goto("/admin/users");
    await p.getByRole("table").first().waitFor();
    await p.getByLabel("Invitation only").check();
    await p.getByTestId("invitations").getByLabel("Email").fill("new.colleague@example.test");
    await p.getByTestId("invitations").getByRole("button", { name: /invitation/i }).click();
    await p.getByLabel(/Invitation link/).waitFor();
    await snap("users");
    await p.goto("/admin/system");
    await p.getByTestId("system-status").waitFor();
    await snap("system");
    await p.goto("/no-such-page");
    await snap("not-found");
    console.log(shots.map(([, f]) => f).join("\n"));
    if (t.errors().length) console.log("console errors:\n" + t.errors().join("\n"));
  } finally {
    await h.close();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
