// The arm editor through the browser: create, paste a DH table with a bad row, edit and read the
// history, and a stale save answered with the conflict panel.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

const ADMIN = { email: "ann@example.test", name: "Ann Lead", password: "a long admin passphrase" };
const EDITOR = { email: "ed@example.test", name: "Ed Second", password: "a long editor passphrase" };

describe("arm editor", () => {
  let h: Harness;
  let a: Browser;
  let b: Browser;
  let ta: TrackedPage;
  let tb: TrackedPage;
  let armPath = "";

  beforeAll(async () => {
    h = await startHarness();
    a = await h.browser();
    ta = await a.open("/signup");
    await signUp(ta, ADMIN);
  });
  afterAll(async () => {
    await h?.close();
  });

  it("creates an arm through the editor", async () => {
    const p = ta.page;
    await p.getByRole("link", { name: "New arm" }).click();
    await p.waitForURL("**/arms/new");
    await p.getByLabel("Name", { exact: true }).fill("Test arm TA-2");
    await p.getByLabel("Maker", { exact: true }).fill("Invented Works");
    await p.getByLabel("Model code", { exact: true }).fill("TA-2");
    await p.getByRole("button", { name: "Add revolute joint" }).click();
    await p.getByLabel("joint 1 d (mm)", { exact: true }).fill("300");
    await p.getByLabel("joint 1 α (°)", { exact: true }).fill("90");
    await p.getByLabel("joint 2 a (mm)", { exact: true }).fill("250");
    // A client-side check names the joint, the value and the reason, and keeps what was typed.
    await p.getByLabel("joint 2 min (°)", { exact: true }).fill("20");
    await p.getByLabel("joint 2 max (°)", { exact: true }).fill("-10");
    await p.getByLabel("Reach", { exact: true }).fill("550");
    await p.getByLabel("Rated payload", { exact: true }).fill("3");
    await p.getByRole("button", { name: "Create arm" }).click();
    await p.getByTestId("error-summary").getByText("joint 2 max (-10.0°) is below min (20.0°)").waitFor();
    expect(await p.getByLabel("joint 2 max (°)", { exact: true }).getAttribute("aria-invalid")).toBe("true");
    expect(await p.getByLabel("joint 2 a (mm)", { exact: true }).inputValue()).toBe("250");

    await p.getByLabel("joint 2 max (°)", { exact: true }).fill("150");
    await p.getByRole("button", { name: "Create arm" }).click();
    await p.waitForURL(/\/arms\/[0-9a-f-]{36}/);
    armPath = new URL(p.url()).pathname;
    await p.getByText("revision 1", { exact: true }).waitFor();
    await p.getByTestId("save-status").getByText("Created as revision 1.").waitFor();
    expect(await p.getByLabel("joint 2 a (mm)", { exact: true }).inputValue()).toBe("250");
    expect(await p.getByLabel("Reach", { exact: true }).inputValue()).toBe("550");

    await p.goto("/arms");
    await p.getByRole("link", { name: "Test arm TA-2" }).waitFor();
    expect(ta.errors()).toEqual([]);
  });

  it("previews a pasted DH table, reports the bad row, and saves once fixed", async () => {
    const p = ta.page;
    await p.goto(armPath);
    await p.getByRole("button", { name: "Paste from spreadsheet…" }).click();
    const area = p.getByLabel("Pasted table");
    const table = (alpha2: string) =>
      ["type\ta (mm)\talpha (deg)\td (mm)\ttheta (deg)\tmin\tmax\tmax speed", `R\t0\t90\t320\t0\t-170\t170\t200`, `R\t260\t${alpha2}\t0\t90\t-120\t120\t180`, `P\t0\t0\t50\t0\t0\t400\t500`].join("\n");
    await area.fill(table("abc"));
    const panel = p.getByTestId("dh-paste");
    await panel.getByText("row 2: α 'abc' is not a number").waitFor();
    expect(await panel.getByRole("button", { name: "Apply all rows" }).isDisabled()).toBe(true);
    expect(await panel.getByRole("button", { name: "Apply only valid rows (2)" }).isEnabled()).toBe(true);

    await area.fill(table("0"));
    await panel.getByText("3 valid, 0 with errors", { exact: false }).waitFor();
    await panel.getByRole("button", { name: "Apply all rows" }).click();
    expect(await p.getByLabel("joint 2 a (mm)", { exact: true }).inputValue()).toBe("260");
    expect(await p.getByLabel("joint 3 type").inputValue()).toBe("prismatic");
    expect(await p.getByLabel("joint 3 max (mm)", { exact: true }).inputValue()).toBe("400");

    await p.getByRole("button", { name: "Save new revision" }).click();
    await p.getByTestId("save-status").getByText("Saved as revision 2.").waitFor();
    await p.reload();
    expect(await p.getByLabel("joint 3 max speed (mm/s)", { exact: true }).inputValue()).toBe("500");
    expect(await p.getByLabel("joint 1 d (mm)", { exact: true }).inputValue()).toBe("320");
    expect(ta.errors()).toEqual([]);
  });

  it("lists every save in the history and shows an old revision read-only", async () => {
    const p = ta.page;
    await p.goto(armPath);
    await p.getByLabel("Name", { exact: true }).fill("Test arm TA-2b");
    await p.getByRole("button", { name: "Move joint 3 up" }).click();
    await p.getByRole("button", { name: "Save new revision" }).click();
    await p.getByTestId("save-status").getByText("Saved as revision 3.").waitFor();

    await p.getByRole("link", { name: "History" }).click();
    await p.waitForURL("**/history");
    const rows = p.getByTestId("revision-table").locator("tbody tr");
    expect(await rows.count()).toBe(3);
    expect(await rows.nth(0).innerText()).toContain(ADMIN.name);
    expect(await rows.nth(0).innerText()).toContain("name");
    expect(await rows.nth(2).innerText()).toContain("created");

    await p.getByRole("link", { name: "Revision 1" }).click();
    await p.getByRole("heading", { name: "Test arm TA-2 · revision 1" }).waitFor();
    expect(await p.getByLabel("Name", { exact: true }).getAttribute("readonly")).not.toBeNull();
    expect(await p.getByLabel("joint 2 a (mm)", { exact: true }).inputValue()).toBe("250");
    expect(await p.getByRole("button", { name: /Save/ }).count()).toBe(0);
    expect(ta.errors()).toEqual([]);
  });

  it("answers a stale save with the conflict panel naming who changed what", async () => {
    b = await h.browser();
    tb = await b.open("/signup");
    await signUp(tb, EDITOR);
    await ta.page.goto("/admin/users");
    await ta.page.getByLabel(`Role of ${EDITOR.name}`).selectOption("editor");
    await ta.page.getByText(`${EDITOR.name} is now editor.`).waitFor();

    // Both open revision 3.
    await ta.page.goto(armPath);
    await tb.page.goto(armPath);
    await tb.page.getByText("revision 3", { exact: true }).waitFor();

    // The editor saves first: joint 1 max 170° → 160°.
    await tb.page.getByLabel("joint 1 max (°)", { exact: true }).fill("160");
    await tb.page.getByRole("button", { name: "Save new revision" }).click();
    await tb.page.getByTestId("save-status").getByText("Saved as revision 4.").waitFor();

    // The admin, still on revision 3, changes the payload and saves.
    await ta.page.getByLabel("Rated payload", { exact: true }).fill("4");
    ta.expect(/status of 409/);
    await ta.page.getByRole("button", { name: "Save new revision" }).click();
    const panel = ta.page.getByTestId("conflict-panel");
    await panel.getByText(`This arm was changed by ${EDITOR.name} (revision 4) since you opened it`).waitFor();
    const row = panel.locator("tbody tr", { hasText: "joint 1 max" });
    expect(await row.innerText()).toContain("170°");
    expect(await row.innerText()).toContain("160°");

    await panel.getByRole("button", { name: "Keep editing on top of the latest" }).click();
    expect(await ta.page.getByLabel("joint 1 max (°)", { exact: true }).inputValue()).toBe("160");
    const kept = ta.page.getByTestId("kept-edits");
    await kept.getByText("rated payload: 4 kg").waitFor();
    await ta.page.getByLabel("Rated payload", { exact: true }).fill("4");
    await ta.page.getByRole("button", { name: "Save new revision" }).click();
    await ta.page.getByTestId("save-status").getByText("Saved as revision 5.").waitFor();
    expect(ta.errors()).toEqual([]);
    expect(tb.errors()).toEqual([]);
  });

  it("deletes an arm after confirmation and restores it from the catalog", async () => {
    const p = ta.page;
    await p.goto(armPath);
    await p.getByRole("button", { name: "Delete…" }).click();
    await p.getByRole("button", { name: "Yes, delete" }).click();
    await p.waitForURL("**/arms");
    expect(await p.getByRole("link", { name: "Test arm TA-2b" }).count()).toBe(0);
    await p.getByLabel(/Show deleted/).check();
    await p.getByRole("button", { name: "Restore Test arm TA-2b" }).click();
    await p.getByText("Restored Test arm TA-2b.").waitFor();
    await p.getByLabel(/Show deleted/).uncheck();
    await p.getByRole("link", { name: "Test arm TA-2b" }).waitFor();
    expect(ta.errors()).toEqual([]);
  });

  it("imports an exported arm JSON file from the catalog as a new arm", async () => {
    const p = ta.page;
    const id = armPath.split("/")[2];
    const exported = await p.evaluate(async (armId) => (await fetch(`/api/arms/${armId}/export`)).text(), id);
    const doc = JSON.parse(exported);
    doc.name = "Imported copy of TA-2b";
    await p.goto("/arms");
    await p.getByLabel("Arm JSON file to import").setInputFiles({ name: "arm.json", mimeType: "application/json", buffer: Buffer.from(JSON.stringify(doc)) });
    await p.waitForURL((u) => /\/arms\/[0-9a-f-]{36}$/.test(u.pathname) && u.pathname !== armPath);
    await p.getByRole("heading", { name: "Imported copy of TA-2b" }).waitFor();
    expect(await p.getByLabel("joint 1 max (°)", { exact: true }).inputValue()).toBe("160");

    // A file that is not an arm is refused with the field named.
    await p.goto("/arms");
    ta.expect(/status of 400/);
    await p.getByLabel("Arm JSON file to import").setInputFiles({ name: "bad.json", mimeType: "application/json", buffer: Buffer.from(JSON.stringify({ name: "x", convention: "dh", joints: [] })) });
    await p.getByText("bad.json was not imported", { exact: false }).waitFor();
    await p.getByText(/joints/).first().waitFor();
    expect(ta.errors()).toEqual([]);
  });
});
