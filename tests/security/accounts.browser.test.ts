// Accounts against the built server, with the product's default sign-up mode (approval): a new
// account waits until the admin approves it on the Users page; invitation-only sign-up with an
// invitation link; password change and "sign out my other sessions" on the account page, by
// keyboard, with field errors beside the fields. Also what the server itself does: security
// headers on pages and API answers, `next` never leading to another origin, and client-set
// forwarding headers that neither lift nor shift the sign-in limits.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { request as pwRequest } from "playwright-core";
import { signIn, startHarness, type Browser, type Harness, type TrackedPage } from "../browser/harness";

const ADMIN = { email: "ada@example.test", name: "Ada Admin", password: "a long admin passphrase" };
const NEWCOMER = { email: "nora@example.test", name: "Nora Newcomer", password: "a long newcomer passphrase" };
const INVITED = { email: "ivo@example.test", name: "Ivo Invited", password: "a long invited passphrase" };

describe("accounts in the browser (approval required by default)", () => {
  let h: Harness;
  let admin: Browser, newcomer: Browser, invited: Browser;
  let ta: TrackedPage, tn: TrackedPage, ti: TrackedPage;

  beforeAll(async () => {
    h = await startHarness({ signUpMode: null });
    admin = await h.browser();
    newcomer = await h.browser();
    invited = await h.browser();
    ta = await admin.open("/signup");
    tn = await newcomer.open("/signup");
  }, 300_000);
  afterAll(async () => {
    await h?.close();
  });

  async function fillSignUp(t: TrackedPage, user: typeof ADMIN, path = "/signup") {
    await t.page.goto(path);
    await t.page.getByLabel("Email").fill(user.email);
    await t.page.getByLabel("Name").fill(user.name);
    await t.page.getByLabel("Password").fill(user.password);
    await t.page.getByLabel("Password").press("Enter");
  }

  it("the first account is the admin and is signed in at once", async () => {
    expect(await ta.page.getByTestId("signup-mode").textContent()).toMatch(/first account becomes the administrator/);
    await fillSignUp(ta, ADMIN);
    await ta.page.waitForURL("**/arms");
  });

  it("a later sign-up waits for approval: the page says so, and signing in is refused with the reason", async () => {
    await tn.page.goto("/signup");
    expect(await tn.page.getByTestId("signup-mode").textContent()).toMatch(/wait for an administrator's approval/);
    await fillSignUp(tn, NEWCOMER);
    await tn.page.getByTestId("signup-done").waitFor();
    expect(await tn.page.getByTestId("signup-done").textContent()).toMatch(/waits for an administrator's approval/);
    tn.expect(/status of 403/);
    await tn.page.goto("/signin");
    await tn.page.getByLabel("Email").fill(NEWCOMER.email);
    await tn.page.getByLabel("Password").fill(NEWCOMER.password);
    await tn.page.getByRole("button", { name: "Sign in" }).click();
    await tn.page.getByText(/waits for an administrator's approval/).first().waitFor();
    expect(new URL(tn.page.url()).pathname).toBe("/signin");
  });

  it("the admin approves it on the Users page with the keyboard; then it signs in as a viewer", async () => {
    await ta.page.goto("/admin/users");
    await ta.page.getByTestId("pending-count").waitFor();
    expect(await ta.page.getByTestId(`status-${NEWCOMER.email}`).textContent()).toMatch(/waits for approval/);
    await ta.page.getByRole("button", { name: `Approve ${NEWCOMER.name}` }).focus();
    await ta.page.keyboard.press("Enter");
    await ta.page.getByText(`${NEWCOMER.name} can sign in now.`).waitFor();
    await signIn(tn, NEWCOMER);
    await expect(tn.page.getByRole("banner").getByText("viewer", { exact: true }).isVisible()).resolves.toBe(true);
  });

  it("invitation only: the sign-up page says so; an invitation link makes an editor at once", async () => {
    await ta.page.goto("/admin/users");
    await ta.page.getByLabel(/Invitation only/).check();
    await ta.page.getByText("Sign-up is now: invitation only.").waitFor();
    const anon = await invited.open("/signup");
    expect(await anon.page.getByTestId("signup-mode").textContent()).toMatch(/need an invitation/);
    expect(await anon.page.getByRole("button", { name: "Create account" }).isDisabled()).toBe(true);

    const inv = ta.page.getByTestId("invitations");
    await inv.getByLabel("Role").selectOption("editor");
    await inv.getByLabel("Works for").fill("0");
    await ta.page.getByRole("button", { name: "Make invitation link" }).click();
    await ta.page.getByText("Works for: must be a whole number of days, at least 1").waitFor();
    await inv.getByLabel("Works for").fill("3");
    await ta.page.getByRole("button", { name: "Make invitation link" }).click();
    const link = await ta.page.getByLabel(/Invitation link/).inputValue();
    expect(link).toMatch(/\/signup\?invitation=[A-Za-z0-9_-]{43}$/);

    ti = anon;
    await fillSignUp(ti, INVITED, new URL(link).pathname + new URL(link).search);
    await ti.page.getByTestId("signup-done").waitFor();
    await signIn(ti, INVITED);
    await expect(ti.page.getByRole("banner").getByText("editor", { exact: true }).isVisible()).resolves.toBe(true);
    await ta.page.reload();
    await ta.page.getByTestId("invitations").getByText("used", { exact: true }).waitFor();
  });

  it("changes the password on the account page (errors beside the fields) and signs out the other sessions", async () => {
    const second = await h.browser();
    const other = await second.open("/signin");
    await signIn(other, NEWCOMER);

    await tn.page.goto("/account");
    const current = tn.page.getByLabel("Current password");
    const newPw = tn.page.getByLabel("New password", { exact: false }).first();
    const repeat = tn.page.getByLabel("Repeat the new password");
    await current.fill("not my password at all");
    await newPw.fill("a perfectly fine new passphrase");
    await repeat.fill("a perfectly fine new passphrase");
    tn.expect(/status of 400/);
    await repeat.press("Enter");
    await tn.page.getByText(/not your current password/).first().waitFor();
    expect(await current.getAttribute("aria-invalid")).toBe("true");

    await current.fill(NEWCOMER.password);
    await newPw.fill("1234567890");
    await repeat.fill("1234567890");
    await tn.page.getByRole("button", { name: "Change password" }).click();
    await tn.page.getByText(/consecutive keys|commonly used/).first().waitFor();
    expect(await newPw.getAttribute("aria-invalid")).toBe("true");

    await repeat.fill("not the same");
    await tn.page.getByRole("button", { name: "Change password" }).click();
    await tn.page.getByText(/does not match the new password/).first().waitFor();

    const fresh = "another quiet morning by the river";
    await newPw.fill(fresh);
    await repeat.fill(fresh);
    await tn.page.getByRole("button", { name: "Change password" }).click();
    await tn.page.getByTestId("account-notice").waitFor();
    expect(await tn.page.getByTestId("account-notice").textContent()).toMatch(/Password changed\. 1 other session was signed out/);

    await other.page.goto("/arms");
    expect(new URL(other.page.url()).pathname).toBe("/signin");
    await signIn(other, { email: NEWCOMER.email, password: fresh });
    await tn.page.getByRole("button", { name: "Sign out my other sessions" }).click();
    await tn.page.getByText(/1 other session was signed out/).waitFor();
    await other.page.goto("/arms");
    expect(new URL(other.page.url()).pathname).toBe("/signin");
  });

  it("after sign-in, next never leads to another origin", async () => {
    const b = await h.browser();
    for (const next of ["/\\evil.test/pwned", "/%09/evil.test/pwned", "/.//evil.test"]) {
      const t = await b.open(`/signin?next=${encodeURIComponent(next)}`);
      await t.page.getByLabel("Email").fill(ADMIN.email);
      await t.page.getByLabel("Password").fill(ADMIN.password);
      await t.page.getByRole("button", { name: "Sign in" }).click();
      await t.page.waitForLoadState("load");
      await t.page.waitForTimeout(300);
      expect(new URL(t.page.url()).origin, next).toBe(h.baseUrl);
      await b.context.clearCookies();
    }
  });

  it("pages and API answers carry the security headers", async () => {
    const api = await pwRequest.newContext({ baseURL: h.baseUrl });
    for (const path of ["/signin", "/api/health", "/share/not-a-token"]) {
      const r = await api.get(path);
      const hd = r.headers();
      expect(hd["content-security-policy"], path).toMatch(/frame-ancestors 'none'/);
      expect(hd["x-frame-options"], path).toBe("DENY");
      expect(hd["x-content-type-options"], path).toBe("nosniff");
      expect(hd["referrer-policy"], path).toBe(path.startsWith("/share/") ? "no-referrer" : "same-origin");
    }
    await api.dispose();
  });

  it("forwarding headers and a forged peer header from a client neither lift nor shift the sign-in limit", async () => {
    const api = await pwRequest.newContext({ baseURL: h.baseUrl });
    const statuses: number[] = [];
    for (let i = 0; i < 24; i++) {
      const r = await api.post("/api/auth/signin", {
        data: { email: `nobody${i}@example.test`, password: "wrong password here" },
        headers: { "x-forwarded-for": `203.0.113.${i}`, "x-armsift-peer": `198.51.100.${i}`, "x-real-ip": `192.0.2.${i}` },
      });
      statuses.push(r.status());
    }
    // At most 20 failures per address in 15 minutes (earlier tests of this file add a few): a
    // new claimed address each time never resets the count.
    const first = statuses.indexOf(429);
    expect(first, statuses.join(" ")).toBeGreaterThan(0);
    expect(first).toBeLessThanOrEqual(20);
    expect(statuses.slice(0, first).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(first).every((s) => s === 429)).toBe(true);
    const limited = await api.post("/api/auth/signin", { data: { email: ADMIN.email, password: ADMIN.password }, headers: { "x-forwarded-for": "203.0.113.250" } });
    expect(limited.status()).toBe(429);
    await api.dispose();
    expect(h.serverLog()).not.toMatch(/unexpected error/);
  });
});
