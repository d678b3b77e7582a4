// The cycle time through the browser: the arm editor names the joints without an acceleration
// limit; a shortlist shows each arm's cycle, its verdict, the estimate mark and the stacked bars;
// a step added by keyboard in the requirement-set editor (and a required rate entered as parts per
// hour) changes the cycle and the chart after the analysis runs again. The page's figures are
// compared with the stored analysis result the export returns, and the XLSX download's cycle
// sheet with the page.
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ShortlistAnalysis } from "@/lib/analysis";
import { readXlsx, sheetRecords } from "../export/parse";
import { withAdminSession } from "./session";

const ADMIN = { email: "cyra@example.test", name: "Cyra Cycle", password: "a long takt-time passphrase" };
const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

describe("cycle time on the pages", () => {
  const s = withAdminSession(ADMIN);
  let reqId = "";
  let shortlistId = "";
  let armIds: string[] = [];
  let tmp = "";

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "armsift-cycle-"));
  });
  afterAll(async () => {
    rmSync(tmp, { recursive: true, force: true });
  });

  const exported = async () =>
    (await s.t.page.evaluate(async (id) => (await (await fetch(`/api/shortlists/${id}/export?format=json`)).json()).analysis, shortlistId)) as ShortlistAnalysis;
  const segments = (armId: string) => s.t.page.getByTestId("cycle-chart").locator(`[data-testid='cycle-segment'][data-arm-id='${armId}']`);

  it("two copies of a demo arm, one with acceleration limits on joints 1 to 4: the arm editor names the joints without one", async () => {
    const p = s.t.page;
    armIds = await p.evaluate(async () => {
      const arms = (await (await fetch("/api/arms")).json()).arms as { id: string; name: string }[];
      const src = (await (await fetch(`/api/arms/${arms.find((a) => a.name === "Reach Cobot 10")!.id}`)).json()).arm;
      const make = async (name: string, acc: (i: number) => number | undefined) => {
        const arm = { ...src, name, joints: src.joints.map((j: Record<string, unknown>, i: number) => {
          const { maxAcceleration: _, ...rest } = j;
          const a = acc(i);
          return a === undefined ? rest : { ...rest, maxAcceleration: a };
        }) };
        const r = await fetch("/api/arms", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(arm) });
        return (await r.json()).id as string;
      };
      return [await make("Cycle Probe Plain", () => undefined), await make("Cycle Probe Stated", (i) => (i < 4 ? 6 : undefined))];
    });
    await p.goto(`/arms/${armIds[1]}`);
    const note = p.getByTestId("cycle-limits-note");
    await note.getByText("Joints 5, 6", { exact: true }).waitFor();
    expect(await note.textContent()).toContain("no max acceleration: cycle times assume each reaches its max speed in 0.5 s");
    // 6 rad/s² shown in °/s²
    const shown = await p.getByLabel("joint 1 max acceleration (°/s²)").inputValue();
    expect(Number(shown)).toBeCloseTo((6 * 180) / Math.PI, 3);
    expect(await p.getByLabel("joint 5 max acceleration (°/s²)").getAttribute("placeholder")).toBe("assumed");
  });

  it("a shortlist shows the cycle of each arm, its verdict, the estimate mark and one bar segment per step", async () => {
    const p = s.t.page;
    const ids = await p.evaluate(
      async ({ I, armIds }) => {
        const doc = {
          name: "Two-point loop", base: I, tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 0.5, cog: [0, 0, 0.05] },
          payload: { mass: 0, cog: [0, 0, 0] },
          targets: [
            { name: "pick", position: [0.55, 0.2, 0.4], rpy: [Math.PI, 0, 0], mode: "axis" },
            { name: "place", position: [0.45, -0.25, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
          ],
          paths: [], specs: [],
          sequences: [{ name: "pick and place", steps: [{ kind: "move", target: "pick", dwell: 0.4 }, { kind: "move", target: "place", dwell: 0.3 }], required: 30 }],
        };
        const r = await (await fetch("/api/requirements", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(doc) })).json();
        const s = await (await fetch("/api/shortlists", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "Cycle check", requirementSetId: r.id, armIds }) })).json();
        return { req: r.id as string, shortlist: s.id as string };
      },
      { I, armIds },
    );
    reqId = ids.req;
    shortlistId = ids.shortlist;
    await p.goto(`/shortlists/${shortlistId}`);
    await p.getByTestId("ranking").waitFor({ timeout: 120_000 });
    const section = p.getByTestId("cycle-section");
    await section.getByTestId("cycle-caution").getByText("not a promise", { exact: false }).waitFor();
    expect(await section.getByTestId("cycle-caution").textContent()).toMatch(/ISO 10218 and ISO\/TS 15066/);

    const a = await exported();
    for (const [k, id] of armIds.entries()) {
      const c = a.arms.find((x) => x.id === id)!.cycles[0];
      expect(c.time).not.toBeNull();
      const row = section.locator(`[data-testid='cycle-row'][data-arm-id='${id}']`);
      expect(await row.getByTestId("cycle-time").textContent()).toBe(c.time!.toFixed(2));
      // both rest on an assumed acceleration: the plain copy for every joint, the other for joints 5 and 6
      expect(c.estimate).toBe(true);
      await row.getByTestId("cycle-estimate").waitFor();
      expect(await row.textContent()).toContain(k === 0 ? "joints 1, 2, 3, 4, 5, 6" : "joints 5, 6");
      expect(await row.textContent()).toContain("meets"); // well under 30 s
      await expect.poll(() => segments(id).count()).toBe(2);
    }
    // the per-arm breakdown: each step's time and limiting joint, summing to the cycle
    const steps = p.getByTestId("cycle-steps").first();
    expect(await steps.locator("tbody tr").count()).toBe(2);
    expect(await steps.locator("tfoot").textContent()).toContain(a.arms[0].cycles[0].time!.toFixed(2));
    expect(s.t.errors()).toEqual([]);
  });

  it("a wait added by keyboard and a required rate: saved, analysed again, the cycle 2 s longer and a third segment per bar", async () => {
    const p = s.t.page;
    const before = (await exported()).arms.map((x) => x.cycles[0].time!);
    await p.goto(`/requirements/${reqId}`);
    const seq = p.getByTestId("sequence-1");
    await seq.getByRole("button", { name: "Add wait to sequence 1" }).focus();
    await p.keyboard.press("Enter");
    const wait = seq.getByLabel("sequence 1 step 3 wait (s)");
    await wait.focus();
    await p.keyboard.press("Control+A");
    await p.keyboard.type("2");
    // the requirement as a rate: 240 parts per hour is a 15 s cycle, shown both ways
    await seq.getByLabel(/^Required/).first().selectOption("rate");
    expect(await seq.getByLabel("Required rate").inputValue()).toBe("120"); // 3600 / 30 s
    await seq.getByLabel("Required rate").fill("240");
    await seq.getByTestId("sequence-1-required-other").getByText("= 15.00 s per cycle", { exact: false }).waitFor();
    // a bad wait is refused at its cell and nothing is saved
    await wait.fill("-1");
    await p.getByRole("button", { name: /^Save/ }).first().click();
    await seq.locator("[aria-invalid='true'][aria-label='sequence 1 step 3 wait (s)']").waitFor();
    expect(await p.evaluate(async (id) => (await (await fetch(`/api/requirements/${id}`)).json()).revision, reqId)).toBe(1);
    await wait.fill("2");
    await p.getByRole("button", { name: /^Save/ }).first().click();
    await p.getByText("Saved as revision 2", { exact: false }).waitFor();
    const saved = await p.evaluate(async (id) => (await (await fetch(`/api/requirements/${id}`)).json()).requirementSet.sequences[0], reqId);
    expect(saved.steps).toEqual([{ kind: "move", target: "pick", dwell: 0.4 }, { kind: "move", target: "place", dwell: 0.3 }, { kind: "wait", seconds: 2 }]);
    expect(saved.required).toBe(15);

    await p.goto(`/shortlists/${shortlistId}`);
    await p.getByTestId("stale-notice").getByRole("button", { name: "Re-pin to latest and analyse" }).click();
    await p.getByTestId("stale-notice").waitFor({ state: "detached" });
    await p.getByTestId("result-label").getByText("Current result").waitFor({ timeout: 120_000 });
    await expect.poll(() => segments(armIds[0]).count(), { timeout: 30_000 }).toBe(3);
    const after = await exported();
    for (const [k, id] of armIds.entries()) {
      const c = after.arms.find((x) => x.id === id)!.cycles[0];
      // a wait keeps the configuration: the moves and the branches chosen are unchanged
      expect(c.time! - before[k]).toBeCloseTo(2, 9);
      expect(c.required).toBe(15);
      const row = p.locator(`[data-testid='cycle-row'][data-arm-id='${id}']`);
      expect(await row.getByTestId("cycle-time").textContent()).toBe(c.time!.toFixed(2));
      expect(await segments(id).count()).toBe(3);
    }
    await p.getByTestId("cycle-section").getByText("required 15.00 s per cycle (240 parts per hour)").waitFor();
    expect(s.t.errors()).toEqual([]);
  });

  it("the XLSX download has the cycle of each arm as the page shows it, and its steps", async () => {
    const p = s.t.page;
    const [dl] = await Promise.all([p.waitForEvent("download"), p.getByTestId("exports").getByRole("link", { name: "Ranking + compliance XLSX" }).click()]);
    const file = path.join(tmp, dl.suggestedFilename());
    await dl.saveAs(file);
    const sheets = await readXlsx(readFileSync(file));
    const cycles = sheetRecords(sheets["Cycle time"]);
    const steps = sheetRecords(sheets["Cycle steps"]);
    const names = ["Cycle Probe Plain", "Cycle Probe Stated"];
    for (const [k, id] of armIds.entries()) {
      const rec = cycles.find((r) => r.Arm === names[k] && r.Sequence === "pick and place")!;
      expect(rec).toBeDefined();
      const shown = await p.locator(`[data-testid='cycle-row'][data-arm-id='${id}']`).getByTestId("cycle-time").textContent();
      // the sheet keeps 3 decimals, the page shows 2
      expect(Math.abs((rec["Cycle time (s)"] as number) - Number(shown))).toBeLessThanOrEqual(0.0051);
      expect(rec["Required cycle time (s)"]).toBe(15);
      expect(rec.Verdict).toBe("meets");
      expect(rec["Estimate (assumed acceleration)"]).toBe("yes");
      const own = steps.filter((r) => r.Arm === names[k]);
      expect(own.map((r) => r.Kind)).toEqual(["move", "move", "wait"]);
    }
  });
});
