// Accounts and roles through the browser: the first account is admin, later ones are viewers,
// sign out and sign in, the users page, and a viewer refused an edit (UI and server).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signIn, signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

const ADMIN = { email: "ada@example.test", name: "Ada Admin", password: "correct horse battery" };
const VIEWER = { email: "vic@example.test", name: "Vic Viewer", password: "another long passphrase" };

describe("accounts and roles", () => {
  let h: Harness;
  let a: Browser;
  let v: Browser;
  let ta: TrackedPage;
  let tv: TrackedPage;

  beforeAll(async () => {
    h = await startHarness();
    a = await h.browser();
    v = await h.browser();
    ta = await a.open("/arms");
    tv = await v.open("/signin");
  });
  afterAll(async () => {
    await h?.close();
  });

  it("redirects an anonymous visitor to the sign-in page", async () => {
    expect(new URL(ta.page.url()).pathname).toBe("/signin");
    await ta.page.goto("/requirements/new");
    expect(new URL(ta.page.url()).pathname).toBe("/signin");
  });

  it("makes the first account an admin, signs out and signs in again", async () => {
    await signUp(ta, ADMIN);
    const bar = ta.page.getByRole("banner");
    await expect(bar.getByText("admin", { exact: true }).isVisible()).resolves.toBe(true);
    await expect(bar.getByRole("link", { name: "Users" }).isVisible()).resolves.toBe(true);
    // The seeded demo arms are listed.
    expect(await ta.page.getByTestId("arm-table").locator("tbody tr").count()).toBeGreaterThan(0);

    await bar.getByRole("button", { name: "Sign out" }).click();
    await ta.page.waitForURL("**/signin");
    await ta.page.goto("/arms");
    expect(new URL(ta.page.url()).pathname).toBe("/signin");

    await signIn(ta, ADMIN);
    await expect(ta.page.getByRole("banner").getByText(ADMIN.name).isVisible()).resolves.toBe(true);
    expect(ta.errors()).toEqual([]);
  });

  it("shows a wrong password as a message, keeping the email typed", async () => {
    await tv.page.goto("/signin");
    await tv.page.getByLabel("Email").fill(ADMIN.email);
    await tv.page.getByLabel("Password").fill("not the password");
    tv.expect(/status of 401/);
    await tv.page.getByRole("button", { name: "Sign in" }).click();
    await tv.page.getByText("The email or password is not right.").waitFor();
    expect(await tv.page.getByLabel("Email").inputValue()).toBe(ADMIN.email);
  });

  it("makes the second account a viewer whose arm editor is read-only and whose PUT is refused", async () => {
    await signUp(tv, VIEWER);
    const bar = tv.page.getByRole("banner");
    await expect(bar.getByText("viewer", { exact: true }).isVisible()).resolves.toBe(true);
    expect(await bar.getByRole("link", { name: "Users" }).count()).toBe(0);
    expect(await tv.page.getByRole("link", { name: "New arm" }).count()).toBe(0);

    // A DH-table arm: chain arms show origin and axis columns instead of a, α, d, θ.
    await tv.page.getByTestId("arm-table").locator("tbody tr a", { hasText: "Foundry Six" }).first().click();
    await tv.page.waitForURL(/\/arms\/[^/]+$/);
    await tv.page.getByTestId("read-only-note").waitFor();
    expect(await tv.page.getByRole("button", { name: /Save new revision/ }).count()).toBe(0);
    expect(await tv.page.getByLabel("Name", { exact: true }).getAttribute("readonly")).not.toBeNull();
    expect(await tv.page.getByLabel("joint 1 a (mm)", { exact: true }).getAttribute("readonly")).not.toBeNull();

    const id = new URL(tv.page.url()).pathname.split("/")[2];
    tv.expect(/status of 403/);
    const status = await tv.page.evaluate(async (armId) => {
      const cur = await (await fetch(`/api/arms/${armId}`)).json();
      const res = await fetch(`/api/arms/${armId}`, {
        method: "PUT",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ baseRevision: cur.revision, arm: { ...cur.arm, name: cur.arm.name + " (viewer edit)" } }),
      });
      return { status: res.status, code: (await res.json()).error?.code };
    }, id);
    expect(status).toEqual({ status: 403, code: "forbidden" });
    // The users page refuses a viewer too.
    await tv.page.goto("/admin/users");
    await tv.page.getByText("Only administrators manage accounts.").waitFor();
    expect(tv.errors()).toEqual([]);
  });

  it("lets the admin promote the viewer to editor on the users page", async () => {
    await ta.page.goto("/admin/users");
    const select = ta.page.getByLabel(`Role of ${VIEWER.name}`);
    await select.waitFor();
    expect(await select.inputValue()).toBe("viewer");
    await select.selectOption("editor");
    await ta.page.getByText(`${VIEWER.name} is now editor.`).waitFor();

    await tv.page.goto("/arms");
    await tv.page.getByRole("link", { name: "New arm" }).waitFor();
    expect(ta.errors()).toEqual([]);
    expect(tv.errors()).toEqual([]);
  });
});
