/**
 * Screenshots of every page at 1280 and 390 px wide, for looking at the UI (not a test):
 *   npx tsx tests/browser/screenshots.ts [outDir]
 * Uses the harness: temporary seeded database, built server, headless Chromium.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import { signUp, startHarness } from "./harness";

async function main(): Promise<void> {
  const out = path.resolve(process.argv[2] ?? "test-results/shots");
  mkdirSync(out, { recursive: true });
  const h = await startHarness();
  try {
    const b = await h.browser();
    const t = await b.open("/signin");
    const p = t.page;
    const shots: [string, string][] = [];
    const snap = async (name: string) => {
      for (const width of [1280, 390]) {
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
      for (const width of [1280, 390]) {
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
