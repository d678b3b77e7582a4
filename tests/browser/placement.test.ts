// The mount placement panel through the browser: a requirement set with a mounting region made
// through the API, a shortlist of two demo arms analysed on the server, then on the page the two
// rankings with the change per arm, the placement in mm and degrees, the coverage map (switched
// between arms with the keyboard-usable select) and saving a placement as the set's nominal base
// (a new revision, whose base is the placement shown).
import { describe, expect, it } from "vitest";
import { withAdminSession } from "./session";

const ADMIN = { email: "lea@example.test", name: "Lea Layout", password: "a long cell layout passphrase" };
const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

describe("mount placement on the shortlist page", () => {
  const s = withAdminSession(ADMIN);
  let reqId = "";


  it("shows both rankings, the placement and its coverage map, and saves a placement as a new revision", async () => {
    const p = s.t.page;
    const ids = await p.evaluate(async (I) => {
      const arms = (await (await fetch("/api/arms")).json()).arms as { id: string; name: string }[];
      const pick = ["Reach Cobot 10", "Compact Six 3"].map((n) => arms.find((a) => a.name === n)!.id);
      const doc = {
        name: "Placement cell", base: I, tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 0.5, cog: [0, 0, 0.05] },
        payload: { mass: 0, cog: [0, 0, 0] },
        // two picks 1.3 m apart: no base at the origin reaches both with the small arm
        targets: [
          { name: "left", position: [-0.15, 0.4, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
          { name: "right", position: [1.15, 0.4, 0.3], rpy: [Math.PI, 0, 0], mode: "axis" },
        ],
        paths: [], specs: [],
        mounting: { region: { x: [0, 1], y: [0, 0.4], z: [0, 0], yaw: [-Math.PI / 2, Math.PI / 2] }, orientation: I },
      };
      const r = await (await fetch("/api/requirements", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(doc) })).json();
      const s = await (await fetch("/api/shortlists", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "Where do they stand", requirementSetId: r.id, armIds: pick }) })).json();
      return { req: r.id as string, shortlist: s.id as string };
    }, I);
    reqId = ids.req;
    await p.goto(`/shortlists/${ids.shortlist}`);
    const panel = p.getByTestId("placement");
    await panel.waitFor({ timeout: 180_000 });
    await panel.getByRole("heading", { name: "Mount placement" }).waitFor();
    const rows = panel.getByTestId("placement-row");
    expect(await rows.count()).toBe(2);
    // each row: both ranks, the change in words, the placement in mm and the yaw in degrees
    for (let i = 0; i < 2; i++) {
      const text = (await rows.nth(i).textContent()) ?? "";
      expect(text).toMatch(/up \d|down \d|same/);
      expect(text).toMatch(/-?\d+, -?\d+, -?\d+/);
    }
    const compact = panel.locator('[data-testid="placement-row"]', { hasText: "Compact Six 3" });
    expect(await compact.textContent()).toContain("of 2");
    // the coverage map: one SVG figure, switched between the arms with the select
    const select = panel.getByRole("combobox", { name: "Coverage map of" });
    await select.selectOption({ label: "Compact Six 3" });
    const map = panel.getByTestId("coverage-map");
    await map.waitFor();
    const armId = await map.getAttribute("data-arm-id");
    await select.selectOption({ label: "Reach Cobot 10" });
    await p.waitForFunction((id) => document.querySelector('[data-testid="coverage-map"]')?.getAttribute("data-arm-id") !== id, armId);
    expect(await map.locator("rect").count()).toBeGreaterThan(1);
    expect(await map.getByRole("img").getAttribute("aria-label")).toContain("Coverage map of Reach Cobot 10");

    // save the small arm's placement as the nominal base: a new revision with that base
    const exported = await p.evaluate(async (sid) => (await fetch(`/api/shortlists/${sid}/export?format=json`)).json(), ids.shortlist);
    const placed = (exported.analysis.placement.arms as { id: string; base: number[] }[]).find((a) => a.id === exported.analysis.arms.find((x: { name: string }) => x.name === "Compact Six 3").id)!;
    await compact.getByRole("button", { name: /Save Compact Six 3's placement/ }).click();
    await panel.getByText("Saved Compact Six 3's placement as the nominal base: revision 2", { exact: false }).waitFor();
    const saved = await p.evaluate(async (id) => (await (await fetch(`/api/requirements/${id}`)).json()), reqId);
    expect(saved.revision).toBe(2);
    saved.requirementSet.base.forEach((v: number, i: number) => expect(v).toBeCloseTo(placed.base[i], 9));
    expect(saved.requirementSet.mounting.region.x).toEqual([0, 1]);
    // a second save from the same (now stale) result is refused: the set moved on
    await compact.getByRole("button", { name: /Save Compact Six 3's placement/ }).click();
    await panel.getByText("Not saved: the requirement set is at revision 2", { exact: false }).waitFor();
    expect(s.t.errors()).toEqual([]);
  });
});
