// The shortlist page through the browser on the demo data: create, wait for the analysis, the
// ranking against the analysis library, weights, the task matrix by keyboard, CSV and XLSX
// downloads parsed back, print to PDF, and the stale-revision notice with re-pinning.
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadSeedArms, loadSeedRequirementSets } from "@/seed-data/index";
import { analyzeShortlist, rankArms, SUB_SCORE_KEYS, type ShortlistAnalysis } from "@/lib/analysis";
import { SUB_SCORES } from "@/shared/sub-scores";
import type { Weights } from "@/shared/schemas/requirements";
import { readCsvExport, readXlsx, sheetRecords } from "../export/parse";
import { withAdminSession } from "./session";

const ADMIN = { email: "pia@example.test", name: "Pia Buyer", password: "a long procurement passphrase" };
const SCENARIO = "Bench assembly: sensor housing press-fit";

interface ExportJson {
  meta: { arms: { id: string; name: string; revision: number }[]; requirement: { id: string; revision: number }; run: { id: string } };
  analysis: ShortlistAnalysis;
}

const inputsOf = (a: ShortlistAnalysis) => a.arms.map((x) => ({ armId: x.id, subScores: x.subScores, failedMusts: x.failedMusts, unknownMusts: x.unknownMusts }));

describe("shortlist page", () => {
  const s = withAdminSession(ADMIN);
  let shortlistUrl = "";
  let firstRunId = "";
  let tmp = "";

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "armsift-shortlist-"));
  });
  afterAll(async () => {
    rmSync(tmp, { recursive: true, force: true });
  });

  const domOrder = async () => {
    const p = s.t.page;
    const q = await p.getByTestId("ranking-row").evaluateAll((els) => els.map((e) => e.getAttribute("data-arm-id")!));
    const d = await p.getByTestId("disqualified-row").evaluateAll((els) => els.map((e) => e.getAttribute("data-arm-id")!));
    return [...q, ...d];
  };

  it("creates a shortlist from the demo catalog, analyses it and ranks as the analysis library does", async () => {
    const p = s.t.page;
    await p.goto("/shortlists");
    await p.getByRole("link", { name: "New shortlist" }).click();
    await p.waitForURL("**/shortlists/new");
    await p.getByLabel("Name", { exact: true }).fill("Press-fit cell candidates");
    await p.getByLabel("Requirement set").selectOption({ label: `${SCENARIO} (rev 1; 9 targets, 0 paths)` });
    // Filters narrow the catalog (demo reaches are between a few hundred and a few thousand mm).
    await p.getByLabel("Reach at least").fill("100000");
    await p.getByText("0 of 9 arms shown").waitFor();
    await p.getByLabel("Reach at least").fill("");
    await p.getByText("9 of 9 arms shown, 0 chosen").waitFor();
    await p.getByRole("button", { name: "Choose all shown" }).click();
    await p.getByRole("button", { name: "Create shortlist and analyse" }).click();
    await p.waitForURL(/\/shortlists\/[0-9a-f-]{36}$/);
    shortlistUrl = new URL(p.url()).pathname;

    // The analysis runs on the server: a progress bar while it runs, or the result if it is already done.
    const progress = p.getByTestId("run-progress");
    const ranking = p.getByTestId("ranking");
    await progress.or(ranking).first().waitFor({ timeout: 60_000 });
    if (await progress.isVisible()) await p.getByRole("progressbar", { name: "Analysis progress" }).waitFor();
    await ranking.waitFor({ timeout: 90_000 });
    await p.getByTestId("result-label").getByText("Current result").waitFor();
    await p.getByTestId("caution").getByText("ISO 12100", { exact: false }).waitFor();

    const id = shortlistUrl.split("/")[2];
    const exported = (await p.evaluate(async (sid) => (await fetch(`/api/shortlists/${sid}/export?format=json`)).json(), id)) as ExportJson;
    firstRunId = exported.meta.run.id;

    // Independent recomputation: the demo arms and requirement set, in the pinned order, through the library.
    const seeds = new Map(loadSeedArms().map((a) => [a.name, a]));
    const req = loadSeedRequirementSets().find((r) => r.name === SCENARIO)!;
    const own = analyzeShortlist(exported.meta.arms.map((a) => ({ id: a.id, revision: a.revision, arm: seeds.get(a.name)! })), req);
    expect(own.ranking.map((r) => r.armId)).toEqual(exported.analysis.ranking.map((r) => r.armId));
    expect(await domOrder()).toEqual(own.ranking.map((r) => r.armId));
    // Disqualified arms are listed apart with the failed must named.
    for (const r of own.ranking.filter((x) => x.disqualified)) {
      const row = p.locator(`[data-testid="disqualified-row"][data-arm-id="${r.armId}"]`);
      expect(await row.textContent()).toContain(r.failedMusts[0]);
    }
    expect(s.t.errors()).toEqual([]);
  });

  it("re-ranks when a weight moves, and resets", async () => {
    const p = s.t.page;
    const exported = (await p.evaluate(async (u) => (await fetch(`/api/shortlists/${u.split("/")[2]}/export?format=json`)).json(), shortlistUrl)) as ExportJson;
    const a = exported.analysis;
    const base = rankArms(inputsOf(a), a.weights).map((r) => r.armId);
    // Find a sub-score whose weight at the slider's maximum changes the order.
    const key = SUB_SCORE_KEYS.find((k) => rankArms(inputsOf(a), { ...a.weights, [k]: 10 } as Weights).map((r) => r.armId).join() !== base.join());
    expect(key).toBeDefined();
    const slider = p.getByLabel(`Weight: ${SUB_SCORES.label[key!]}`);
    await slider.focus();
    await p.keyboard.press("End");
    const expected = rankArms(inputsOf(a), { ...a.weights, [key!]: 10 } as Weights).map((r) => r.armId);
    await expect.poll(domOrder).toEqual(expected);
    expect(expected).not.toEqual(base);
    await p.getByText("Weights adjusted on this page (not saved).").waitFor();
    await p.getByRole("button", { name: "Reset weights" }).click();
    await expect.poll(domOrder).toEqual(base);
    // Leave the weights moved for the export checks below.
    await slider.focus();
    await p.keyboard.press("End");
    await expect.poll(domOrder).toEqual(expected);
  });

  it("opens a task-matrix cell's details with the keyboard", async () => {
    const p = s.t.page;
    const cells = p.getByTestId("task-matrix").locator("button.cellbtn");
    await cells.first().focus();
    await p.keyboard.press("Tab");
    const second = cells.nth(1);
    expect(await second.evaluate((el) => el === document.activeElement)).toBe(true);
    const label = (await second.getAttribute("aria-label"))!;
    // Focus shows the limiting factor as a tooltip.
    const tipId = (await second.getAttribute("aria-describedby"))!;
    await p.locator(`[id="${tipId}"]`).waitFor({ state: "visible" });
    await p.keyboard.press("Enter");
    const details = p.getByRole("region", { name: "Cell details" });
    await details.getByText("Limiting factor:").waitFor();
    // the page sent this 9-arm matrix without reasons and details: they load with the arm on opening
    await expect.poll(() => details.locator("li").count()).toBeGreaterThan(0);
    expect(await details.getByText("Loading the details…").count()).toBe(0);
    const heading = (await details.locator("h3").textContent())!;
    expect(label.startsWith(heading.split(":")[0].replace(" · ", ", "))).toBe(true);
    expect(await second.getAttribute("aria-expanded")).toBe("true");
  });

  it("downloads the CSV and the XLSX, whose values and units match the page", async () => {
    const p = s.t.page;
    const read = async (name: string) => {
      const [dl] = await Promise.all([p.waitForEvent("download"), p.getByTestId("exports").getByRole("link", { name }).click()]);
      const file = path.join(tmp, dl.suggestedFilename());
      await dl.saveAs(file);
      return readFileSync(file);
    };
    // The page's compliance table: requirement row × arm column → "value unit".
    const pageCells = await p.getByTestId("compliance-table").evaluate((table) => {
      const arms = [...table.querySelectorAll("thead th[data-arm-id]")].map((th) => th.childNodes[0].textContent!.trim());
      return [...table.querySelectorAll("tbody tr")].map((tr) => ({
        requirement: tr.querySelector("th")!.textContent!.trim(),
        unit: tr.querySelectorAll("td")[2].textContent!.trim(),
        values: [...tr.querySelectorAll("td.ccell")].map((td, i) => ({ arm: arms[i], value: td.querySelector(".cval")!.textContent!.trim(), verdict: td.querySelector(".verdict")!.textContent!.replace(/[✓△✗?]/g, "").trim() })),
      }));
    });
    expect(pageCells.length).toBeGreaterThan(3);

    const csv = readCsvExport((await read("Compliance CSV")).toString("utf8"));
    expect(csv.meta.some((l) => l.startsWith("Analysis version: analysis-"))).toBe(true);
    expect(csv.meta.some((l) => /^Requirement set: .* revision 1$/.test(l))).toBe(true);
    for (const row of pageCells) {
      for (const v of row.values) {
        const rec = csv.records.find((r) => r.Requirement === row.requirement && r.Arm === v.arm)!;
        expect(rec, `${row.requirement} / ${v.arm}`).toBeDefined();
        const text = rec["Arm value"] === "no data" ? "no data" : `${rec["Arm value"]}${rec["Arm value unit"] ? ` ${rec["Arm value unit"]}` : ""}`;
        expect(text).toBe(v.value);
        expect(rec.Verdict).toBe(v.verdict);
        expect(rec["Required unit"] || "–").toBe(row.unit);
      }
    }

    const order = await domOrder();
    const sheets = await readXlsx(await read("Ranking + compliance XLSX"));
    const ranking = sheetRecords(sheets.Ranking);
    const names = await p.getByTestId("ranking-row").evaluateAll((els) => els.map((e) => e.querySelector("th")!.childNodes[0].textContent!.trim()));
    expect(ranking.slice(0, names.length).map((r) => r.Arm)).toEqual(names);
    expect(ranking).toHaveLength(order.length);
    const scores = await p.getByTestId("ranking-row").evaluateAll((els) => els.map((e) => Number(e.querySelectorAll("td")[1].textContent)));
    // The page shows 3 decimals, the workbook 4: they agree within the page's rounding.
    ranking.slice(0, scores.length).forEach((r, i) => expect(Math.abs((r["Score (0–1)"] as number) - scores[i])).toBeLessThanOrEqual(0.00051 + 0.00005));
    const compliance = sheetRecords(sheets.Compliance);
    for (const row of pageCells) {
      for (const v of row.values) {
        const rec = compliance.find((r) => r.Requirement === row.requirement && r.Arm === v.arm)!;
        const text = rec["Arm value"] === "no data" ? "no data" : `${rec["Arm value"]}${rec["Arm value unit"] ? ` ${rec["Arm value unit"]}` : ""}`;
        expect(text).toBe(v.value);
        expect(rec.Verdict).toBe(v.verdict);
      }
    }
    // Bad export parameters are answered with field errors, an unknown run with 404.
    const sid = shortlistUrl.split("/")[2];
    const bad = await p.evaluate(async (u) => {
      const a = await fetch(`/api/shortlists/${u}/export?format=csv&weights=speed:3`);
      const b = await fetch(`/api/shortlists/${u}/export?format=pdf`);
      const c = await fetch(`/api/shortlists/${u}/export?format=csv&run=nope`);
      return [a.status, (await a.json()).error.fieldErrors[0].path, b.status, (await b.json()).error.fieldErrors[0].path, c.status];
    }, sid);
    expect(bad).toEqual([400, "weights", 400, "format", 404]);
    s.t.expect(/status of 40[04]/);
    const md = sheets.Metadata.map((r) => String(r[0]) + ": " + String(r[1]));
    expect(md.some((l) => l.startsWith("Weights: ") && l.includes("adjusted on the page"))).toBe(true);
  });

  it("prints to a PDF report without navigation and with the compliance table", async () => {
    const p = s.t.page;
    const file = path.join(tmp, "report.pdf");
    await p.emulateMedia({ media: "print" });
    await p.pdf({ path: file, format: "A4", printBackground: false });
    await p.emulateMedia({ media: "screen" });
    const info = execFileSync("pdfinfo", [file], { encoding: "utf8" });
    const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
    expect(pages).toBeGreaterThanOrEqual(2);
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    expect(text).toContain("Compliance table");
    expect(text).toContain("Rated payload");
    expect(text).toContain("ISO 12100");
    expect(text).not.toContain("Sign out");
    expect(text).not.toContain("Skip to content");
  });

  it("sends the arm sections beyond the first three collapsed and loads one on demand from the run's view endpoint", async () => {
    const p = s.t.page;
    await p.goto(shortlistUrl);
    const sections = p.getByTestId("arm-section");
    await sections.first().waitFor();
    expect(await sections.count()).toBe(9);
    const collapsed = p.locator('[data-testid="arm-section"][data-collapsed="true"]');
    expect(await collapsed.count()).toBe(6);
    // the page's HTML has the heading and summary of a collapsed arm, not its tables
    const fourth = sections.nth(3);
    expect(await fourth.getByRole("heading", { level: 4 }).count()).toBe(0);
    const asked = p.waitForRequest((r) => /\/api\/shortlists\/[^/]+\/runs\/[^/]+\/view\?arm=/.test(r.url()));
    await fourth.getByTestId("arm-section-load").click();
    await asked;
    await sections.nth(3).getByRole("heading", { name: "Payload", level: 4 }).waitFor();
    await sections.nth(3).getByTestId("solution-view3d").waitFor();
    expect(await collapsed.count()).toBe(5);
    await p.getByTestId("arm-sections-load-all").click();
    await expect.poll(() => collapsed.count()).toBe(0);
    expect(await p.getByRole("heading", { name: "Payload", level: 4 }).count()).toBe(9);
    expect(s.t.errors()).toEqual([]);
  });

  it("says when an arm has a newer revision; re-pinning gives a new result and keeps the old one readable", async () => {
    const p = s.t.page;
    const exported = (await p.evaluate(async (u) => (await fetch(`/api/shortlists/${u.split("/")[2]}/export?format=json`)).json(), shortlistUrl)) as ExportJson;
    const target = exported.meta.arms[0];
    const status = await p.evaluate(async (armId) => {
      const cur = await (await fetch(`/api/arms/${armId}`)).json();
      const arm = { ...cur.arm, specs: { ...cur.arm.specs, price: (cur.arm.specs.price ?? 10000) * 0.5 } };
      const r = await fetch(`/api/arms/${armId}`, { method: "PUT", headers: { "content-type": "application/json" }, body: JSON.stringify({ baseRevision: cur.revision, arm }) });
      return r.status;
    }, target.id);
    expect(status).toBe(200);
    await p.goto(shortlistUrl);
    const notice = p.getByTestId("stale-notice");
    await notice.getByText(`arm ${target.name}: revision 1 → 2`).waitFor();

    await notice.getByRole("button", { name: "Re-pin to latest and analyse" }).click();
    await p.getByTestId("stale-notice").waitFor({ state: "detached" });
    await p.getByTestId("result-label").getByText("Current result").waitFor({ timeout: 90_000 });
    await p.getByTestId("result-label").getByText(`${target.name} rev 2`, { exact: false }).waitFor();
    const history = p.getByTestId("run-history").locator("li");
    expect(await history.count()).toBe(2);

    await p.goto(`${shortlistUrl}?run=${firstRunId}`);
    const label = p.getByTestId("result-label");
    await label.getByText("Earlier result — not for the current pins").waitFor();
    await label.getByText(`${target.name} rev 1`, { exact: false }).waitFor();
    await p.getByTestId("ranking").waitFor();
    expect(await p.getByTestId("compliance-row").count()).toBeGreaterThan(3);
    expect(s.t.errors()).toEqual([]);
  });

  it("the shortlists list shows the signed-in member's unread comment count in words", async () => {
    const p = s.t.page;
    const id = shortlistUrl.split("/")[2];
    const cell = () => p.getByTestId("shortlist-table").getByRole("row").filter({ has: p.getByRole("link", { name: "Press-fit cell candidates" }) }).getByTestId("unread-count");
    await p.goto("/shortlists");
    expect(await cell().textContent()).toBe("0 unread");
    // Two comments by a link guest (not the member) are unread for the member.
    const posted = await p.evaluate(async (sid) => {
      const link = await (await fetch(`/api/shortlists/${sid}/links`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ access: "comment", label: "reviewer" }) })).json();
      const statuses: number[] = [];
      for (const body of ["Is the press-fit force checked?", "The far tray corner looks tight."]) {
        const r = await fetch(`/api/share/${link.token}/comments`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "Guest Reviewer", body }) });
        statuses.push(r.status);
      }
      return statuses;
    }, id);
    expect(posted).toEqual([201, 201]);
    await p.goto("/shortlists");
    expect(await cell().textContent()).toBe("2 unread");
    // Marking the discussion read clears it; the member's own comment is never unread for them.
    const after = await p.evaluate(async (sid) => {
      const a = await fetch(`/api/shortlists/${sid}/comments/read`, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
      const b = await fetch(`/api/shortlists/${sid}/comments`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ body: "Checked: 2.1x the required force." }) });
      return [a.status, b.status];
    }, id);
    expect(after[0]).toBeLessThan(300);
    expect(after[1]).toBe(201);
    await p.goto("/shortlists");
    expect(await cell().textContent()).toBe("0 unread");
    expect(s.t.errors()).toEqual([]);
  });
});
