// Collaboration through the browser: an editor makes a comment link that hides prices on the
// shortlist page; a guest opens it, reads what guests can see, comments under a display name;
// the editor replies, resolves and sees the guest's comment; a viewer sees no link manager; the
// editor revokes the link and the guest's next visit is a plain not-found page; the admin reads
// the trail of it all on the audit page.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "../browser/harness";

const ADMIN = { email: "ada@example.test", name: "Ada Admin", password: "a long admin passphrase" };
const EDITOR = { email: "eli@example.test", name: "Eli Editor", password: "a long editor passphrase" };
const VIEWER = { email: "vic@example.test", name: "Vic Viewer", password: "a long viewer passphrase" };

describe("share links and discussion in the browser", () => {
  let h: Harness;
  let admin: Browser, editor: Browser, viewer: Browser, guest: Browser;
  let ta: TrackedPage, te: TrackedPage, tv: TrackedPage;
  let shortlistPath = "";
  let linkUrl = "";

  beforeAll(async () => {
    h = await startHarness();
    admin = await h.browser();
    editor = await h.browser();
    viewer = await h.browser();
    guest = await h.browser();
    ta = await admin.open("/signup");
    await signUp(ta, ADMIN);
    te = await editor.open("/signup");
    await signUp(te, EDITOR);
    tv = await viewer.open("/signup");
    await signUp(tv, VIEWER);
    const users = await (await admin.context.request.get("/api/users")).json();
    const eli = users.users.find((u: { email: string }) => u.email === EDITOR.email);
    expect((await admin.context.request.patch(`/api/users/${eli.id}`, { data: { role: "editor" } })).status()).toBe(200);
    const r = editor.context.request;
    const arms = (await (await r.get("/api/arms")).json()).arms.slice(0, 2).map((a: { id: string }) => a.id);
    const reqs = (await (await r.get("/api/requirements")).json()).requirementSets;
    const sl = await r.post("/api/shortlists", { data: { name: "Bench cell review", requirementSetId: reqs[0].id, armIds: arms } });
    expect(sl.status()).toBe(201);
    shortlistPath = `/shortlists/${(await sl.json()).id}`;
  }, 300_000);
  afterAll(async () => {
    await h?.close();
  });

  it("lets an editor make a comment link that hides prices", async () => {
    const p = te.page;
    await p.goto(shortlistPath);
    const panel = p.getByTestId("share-links");
    await panel.getByLabel("Access").selectOption("comment");
    await panel.getByLabel("Label").fill("integrator review");
    await panel.getByRole("button", { name: "Make link" }).click();
    const made = p.getByTestId("new-link");
    await made.waitFor();
    linkUrl = (await made.locator("code").innerText()).trim();
    expect(linkUrl).toMatch(/\/share\/[A-Za-z0-9_-]{43}$/);
    await expect(panel.getByTestId("link-row").first().innerText()).resolves.toMatch(/integrator review\s+comment\s+hidden/);
    expect(te.errors()).toEqual([]);
  });

  it("shows a guest what guests can see and takes a comment under a display name", async () => {
    const g = await guest.open(new URL(linkUrl).pathname);
    const p = g.page;
    await expect(p.getByTestId("visibility").innerText()).resolves.toMatch(/Prices are hidden/);
    expect(await p.getByTestId("guest-arms").innerText()).not.toMatch(/Price/);
    await p.getByLabel("Your name (shown with the comment)").fill("Ines Integrator");
    await p.getByLabel("Comment", { exact: true }).fill("Can the **second arm** reach the far corner?");
    await p.getByRole("button", { name: "Post comment" }).click();
    await p.getByText("Ines Integrator (guest)").waitFor();
    await expect(p.getByTestId("comment-body").first().innerHTML()).resolves.toContain("<strong>second arm</strong>");
    expect(g.errors()).toEqual([]);
  });

  it("lets the editor reply and resolve; a viewer reads and comments but manages no links", async () => {
    const p = te.page;
    await p.goto(shortlistPath);
    const thread = p.getByTestId("thread").filter({ hasText: "Ines Integrator" });
    await thread.getByRole("button", { name: "Reply" }).click();
    await thread.getByLabel("Reply", { exact: true }).fill("Yes, with 40 mm to spare.");
    await thread.getByRole("button", { name: "Post reply" }).click();
    await thread.getByText("Yes, with 40 mm to spare.").waitFor();
    await thread.getByRole("button", { name: "Resolve" }).click();
    await p.getByText("No comments here yet.").or(p.getByLabel(/resolved threads/)).first().waitFor();
    // Resolved threads are hidden until asked for.
    await p.getByLabel(/resolved threads/).check();
    await p.getByText(/resolved by Eli Editor/).waitFor();

    await tv.page.goto(shortlistPath);
    await tv.page.getByTestId("discussion").waitFor();
    expect(await tv.page.getByTestId("share-links").count()).toBe(0);
    await tv.page.getByTestId("unread").waitFor();
    expect(await tv.page.getByTestId("unread").innerText()).toMatch(/^2 new/);
    expect(te.errors()).toEqual([]);
    expect(tv.errors()).toEqual([]);
  });

  it("revokes the link at once: the guest gets the same not-found page as for a made-up link", async () => {
    const p = te.page;
    await p.goto(shortlistPath);
    await p.getByTestId("link-row").first().getByRole("button", { name: "Revoke" }).click();
    await p.getByTestId("link-row").first().getByText("revoked", { exact: true }).waitFor();
    const g = await guest.open("/arms");
    const revoked = await g.page.goto(new URL(linkUrl).pathname);
    expect(revoked?.status()).toBe(404);
    const revokedText = await g.page.locator("main").innerText();
    const unknown = await g.page.goto(`/share/${"Q".repeat(43)}`);
    expect(unknown?.status()).toBe(404);
    expect(await g.page.locator("main").innerText()).toBe(revokedText);
    expect(revokedText).not.toMatch(/Bench cell review/);
  });

  it("shows the admin the audit trail of links and comments; others may not read it", async () => {
    const p = ta.page;
    await p.goto("/admin/audit");
    const table = p.getByTestId("audit-table");
    await table.waitFor();
    const text = await table.innerText();
    for (const action of ["link.create", "link.revoke", "comment.create", "comment.resolve", "shortlist.create", "user.role"]) expect(text).toContain(action);
    expect(text).toContain("Ines Integrator (guest)");
    await tv.page.goto("/admin/audit");
    await tv.page.getByText("Only administrators read the audit trail.").waitFor();
    expect(await tv.page.getByTestId("audit-table").count()).toBe(0);
  });
});
