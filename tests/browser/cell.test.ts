// The cell through the browser: an obstacle edited in the requirement-set editor (field errors for
// bad sizes and unknown contact names, then a real move), the analysis run again, and the
// verdict and reason of the target changing on the shortlist page; the cautions beside the cell.
import { describe, expect, it } from "vitest";
import { withAdminSession } from "./session";

const ADMIN = { email: "cora@example.test", name: "Cora Cell", password: "a long layout passphrase" };
const I = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

describe("the cell on the pages", () => {
  const s = withAdminSession(ADMIN);
  let reqId = "";
  let shortlistUrl = "";


  it("a target free in an empty corner of the cell: meets, with its clearance", async () => {
    const p = s.t.page;
    const ids = await p.evaluate(async (I) => {
      const arms = (await (await fetch("/api/arms")).json()).arms as { id: string; name: string }[];
      const arm = arms.find((a) => a.name === "Reach Cobot 10")!;
      const doc = {
        name: "Crate cell", base: I, tool: { tcp: [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0.1, 0, 0, 0, 1], mass: 0.5, cog: [0, 0, 0.05], collision: [{ from: [0, 0, 0.03], to: [0, 0, 0.09], radius: 0.025 }] },
        payload: { mass: 0, cog: [0, 0, 0] },
        targets: [{ name: "probe", position: [0.55, 0.2, 0.4], rpy: [Math.PI, 0, 0], mode: "axis" }],
        paths: [], specs: [],
        cell: { clearance: 0.01, obstacles: [{ name: "crate", shape: "box", pose: [1, 0, 0, 2.5, 0, 1, 0, 0, 0, 0, 1, 0.2, 0, 0, 0, 1], size: [0.3, 0.3, 0.3] }] },
      };
      const r = await (await fetch("/api/requirements", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(doc) })).json();
      const s = await (await fetch("/api/shortlists", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "Crate check", requirementSetId: r.id, armIds: [arm.id] }) })).json();
      return { req: r.id as string, shortlist: s.id as string };
    }, I);
    reqId = ids.req;
    shortlistUrl = `/shortlists/${ids.shortlist}`;
    await p.goto(shortlistUrl);
    await p.getByTestId("ranking").waitFor({ timeout: 120_000 });
    await p.getByTestId("cell-caution").getByText("not a safety function", { exact: false }).waitFor();
    await p.getByTestId("caution").getByText("Collisions are checked only between the rigid capsules", { exact: false }).waitFor();
    const cellRow = p.getByTestId("cell-table").getByRole("row", { name: /probe/ });
    await cellRow.getByText("yes", { exact: true }).waitFor();
    await p.getByTestId("compliance-clearance").getByText("Clearance in the cell", { exact: false }).waitFor();
    const cell = p.getByTestId("task-matrix").getByRole("button", { name: /probe/ }).first();
    expect(await cell.textContent()).toMatch(/meets|marginal/);
  });

  it("the editor refuses a zero side and an unknown contact name at their cells, then saves the crate moved onto the target", async () => {
    const p = s.t.page;
    await p.goto(`/requirements/${reqId}`);
    const table = p.getByTestId("obstacle-table");
    await table.getByLabel("obstacle 1 (crate) y side (mm)").fill("0");
    await p.getByLabel("target 1 contact: obstacle names, comma-separated").fill("crate, pallet");
    await p.getByRole("button", { name: /^Save/ }).first().click();
    await table.getByText("must be > 0").waitFor();
    await p.getByText('names obstacle "pallet", but the cell has no obstacle of that name', { exact: false }).first().waitFor();
    // nothing was saved
    const rev = await p.evaluate(async (id) => (await (await fetch(`/api/requirements/${id}`)).json()).revision, reqId);
    expect(rev).toBe(1);

    await table.getByLabel("obstacle 1 (crate) y side (mm)").fill("300");
    await p.getByLabel("target 1 contact: obstacle names, comma-separated").fill("");
    // the crate now stands where the tool has to go
    await table.getByLabel("obstacle 1 (crate) x (mm)").fill("550");
    await table.getByLabel("obstacle 1 (crate) y (mm)").fill("200");
    await table.getByLabel("obstacle 1 (crate) z (mm)").fill("350");
    await p.getByRole("button", { name: /^Save/ }).first().click();
    await p.getByText("Saved as revision 2", { exact: false }).waitFor();
    const saved = await p.evaluate(async (id) => (await (await fetch(`/api/requirements/${id}`)).json()).requirementSet.cell.obstacles[0], reqId);
    expect(saved.pose[3]).toBeCloseTo(0.55, 12);
    expect(saved.size).toEqual([0.3, 0.3, 0.3]);
  });

  it("analysed again, the target fails and the reason names what hits the crate", async () => {
    const p = s.t.page;
    await p.goto(shortlistUrl);
    const notice = p.getByTestId("stale-notice");
    await notice.getByText("requirement set Crate cell: revision 1 → 2", { exact: false }).waitFor();
    await notice.getByRole("button", { name: "Re-pin to latest and analyse" }).click();
    await p.getByTestId("stale-notice").waitFor({ state: "detached" });
    await p.getByTestId("result-label").getByText("Current result").waitFor({ timeout: 120_000 });
    const cell = p.getByTestId("task-matrix").getByRole("button", { name: /probe/ }).first();
    await expect.poll(async () => cell.textContent(), { timeout: 30_000 }).toMatch(/fails/);
    await cell.click();
    await p.getByText(/hits 'crate', overlap \d/).first().waitFor();
    const row = p.getByTestId("cell-table").getByRole("row", { name: /probe/ });
    await row.getByText("no", { exact: true }).waitFor();
    await row.getByText(/hits crate/).waitFor();
    expect(s.t.errors()).toEqual([]);
  });
});
