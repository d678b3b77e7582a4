// Stored cross-site scripting, end to end in headless Chromium against the built server: every
// payload of the corpus goes into comment bodies (members and guests), guest display names, arm
// names, target names and a shortlist name through the real API; then the pages that show them
// (arm catalog and editor, requirement editor, shortlist page with its discussion, share view,
// audit trail) are loaded. The test fails if any payload ran (the marker function or a dialog)
// or if an event-handler attribute, a javascript:/vbscript:/data:text/html URL or a script,
// iframe, object, embed, base or meta element from content survived in the DOM.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { request as pwRequest, type APIRequestContext, type Page } from "playwright-core";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "../browser/harness";
import { sampleArm, sampleRequirementSet } from "../db/helpers";
import { PAYLOADS } from "./xss-payloads";

const ADMIN = { email: "ada@example.test", name: "Ada Admin", password: "a long admin passphrase" };
const clip = (s: string, n: number) => (s.trim().slice(0, n).trim() || "x");

/** Runs in the page: what in the DOM could execute script. */
function domFindings(): string[] {
  const bad: string[] = [];
  const URL_ATTRS = new Set(["href", "src", "action", "formaction", "xlink:href", "data", "poster", "background", "srcdoc", "content"]);
  // Browsers ignore control characters, blanks and invisible format characters inside a URL scheme.
  // eslint-disable-next-line no-control-regex -- matching control characters is the point here
  const invisible = /[\u0000-\u0020\u007f-\u00a0\u200b-\u200f\u2028-\u202e\u2060-\u2064\ufeff]/g;
  const strip = (v: string) => v.replace(invisible, "").toLowerCase();
  for (const el of Array.from(document.querySelectorAll("*"))) {
    for (const a of Array.from(el.attributes)) {
      const n = a.name.toLowerCase();
      if (n.startsWith("on")) bad.push(`<${el.tagName.toLowerCase()} ${n}=${a.value.slice(0, 60)}>`);
      if (URL_ATTRS.has(n) && /^(javascript|vbscript|data:text\/html)|url=javascript/.test(strip(a.value))) bad.push(`<${el.tagName.toLowerCase()} ${n}=${a.value.slice(0, 60)}>`);
    }
  }
  for (const el of Array.from(document.querySelectorAll("main script, main iframe, main object, main embed, main base, main meta, main frame, main style"))) {
    bad.push(`content element ${el.outerHTML.slice(0, 80)}`);
  }
  return bad;
}

describe("stored XSS payloads are rendered inert", () => {
  let h: Harness;
  let member: Browser;
  let guest: Browser;
  let tm: TrackedPage;
  const hits: string[] = [];
  const findings: string[] = [];
  const api: APIRequestContext[] = [];
  let shortlistId = "";
  let bigSetId = "";
  const armIds: string[] = [];
  const tokens: string[] = [];
  let inserted = 0;

  async function watch(b: Browser) {
    await b.context.exposeBinding("__xssHit", (_src, id: unknown) => void hits.push(`marker ${String(id)}`));
    await b.context.addInitScript(() => {
      (window as unknown as { __xss: (n: unknown) => void }).__xss = (n) => (window as unknown as { __xssHit: (n: string) => void }).__xssHit(String(n));
    });
    b.context.on("page", (p) => p.on("dialog", (d) => void (hits.push(`dialog ${d.type()} ${d.message()}`), d.dismiss())));
    for (const p of b.context.pages()) p.on("dialog", (d) => void (hits.push(`dialog ${d.type()} ${d.message()}`), d.dismiss()));
  }

  async function visit(page: Page, path: string, ready?: (p: Page) => Promise<void>) {
    await page.goto(path);
    await page.waitForLoadState("networkidle");
    if (ready) await ready(page);
    await page.waitForTimeout(300);
    for (const f of await page.evaluate(domFindings)) findings.push(`${path}: ${f}`);
  }

  beforeAll(async () => {
    h = await startHarness();
    member = await h.browser();
    guest = await h.browser();
    await watch(member);
    await watch(guest);
    tm = await member.open("/signup");
    await signUp(tm, ADMIN);
    const admin = member.context.request;

    // Three more members so the per-member comment rate limit is not what the test measures.
    for (let i = 0; i < 3; i++) {
      const c = await pwRequest.newContext({ baseURL: h.baseUrl });
      const r = await c.post("/api/auth/signup", { data: { email: `member${i}@example.test`, name: clip(PAYLOADS[i * 7], 80), password: "a long member passphrase" } });
      expect(r.status()).toBe(202);
      const s = await c.post("/api/auth/signin", { data: { email: `member${i}@example.test`, password: "a long member passphrase" } });
      expect(s.status()).toBe(200);
      api.push(c);
    }

    for (const [i, p] of PAYLOADS.entries()) {
      const r = await admin.post("/api/arms", { data: sampleArm({ name: clip(p, 120), modelCode: `X-${i}`, maker: clip(p, 120) }) });
      expect(r.status(), await r.text()).toBe(201);
      armIds.push((await r.json()).id);
      inserted += 2;
    }
    const big = await admin.post("/api/requirements", {
      data: sampleRequirementSet({
        name: clip(PAYLOADS[0], 120),
        targets: PAYLOADS.map((p, i) => ({ name: `${clip(p, 74)} ${i}`, position: [0.4, 0.1, 0.2], rpy: [Math.PI, 0, 0], mode: "point" })),
      }),
    });
    expect(big.status(), await big.text()).toBe(201);
    bigSetId = (await big.json()).id;
    inserted += PAYLOADS.length;
    const small = await admin.post("/api/requirements", {
      data: sampleRequirementSet({
        name: clip(PAYLOADS[8], 120),
        targets: [8, 39, 57].map((i) => ({ name: clip(PAYLOADS[i], 80), position: [0.3, -0.3, 0.25], rpy: [Math.PI, 0, 0], mode: "point" })),
      }),
    });
    expect(small.status(), await small.text()).toBe(201);
    const sl = await admin.post("/api/shortlists", { data: { name: clip(PAYLOADS[40], 120), requirementSetId: (await small.json()).id, armIds: [armIds[0], armIds[8], armIds[43]] } });
    expect(sl.status(), await sl.text()).toBe(201);
    shortlistId = (await sl.json()).id;

    for (let k = 0; k < 3; k++) {
      const link = await admin.post(`/api/shortlists/${shortlistId}/links`, { data: { access: "comment", hidePrices: k === 0 } });
      expect(link.status()).toBe(201);
      tokens.push((await link.json()).token);
    }
    const guestApi = guest.context.request;
    let parent: string | undefined;
    for (const [i, p] of PAYLOADS.entries()) {
      const anchor = [undefined, { type: "arm", id: armIds[8] }, { type: "target", id: clip(PAYLOADS[39], 80) }][i % 3];
      const r = await api[i % 3].post(`/api/shortlists/${shortlistId}/comments`, { data: { body: p, ...(anchor ? { anchor } : {}), ...(i % 5 === 4 && parent ? { parentId: parent } : {}) } });
      expect(r.status(), await r.text()).toBe(201);
      if (i % 5 === 0) parent = (await r.json()).id;
      const g = await guestApi.post(`/api/share/${tokens[i % 3]}/comments`, { data: { name: clip(p, 60), body: `${p}\n\n@ada ${p}` } });
      expect(g.status(), await g.text()).toBe(201);
      inserted += 3;
    }
    // The analysis runs out of band; wait for it so the shortlist page and the share view show results.
    const deadline = Date.now() + 120_000;
    for (;;) {
      const r = await admin.get(`/api/shortlists/${shortlistId}`);
      const status = (await r.json()).runs?.[0]?.status;
      if (status === "done" || status === "failed") break;
      if (Date.now() > deadline) throw new Error("analysis did not finish in 120 s");
      await new Promise((res) => setTimeout(res, 500));
    }
  }, 300_000);

  afterAll(async () => {
    for (const c of api) await c.dispose();
    await h?.close();
  });

  it(`stores ${PAYLOADS.length} payloads in every field`, () => {
    expect(PAYLOADS.length).toBeGreaterThanOrEqual(50);
    expect(inserted).toBe(PAYLOADS.length * 6);
    console.log(`[xss] payloads: ${PAYLOADS.length}; stored values: ${inserted} (arm names and makers, target names, member and guest comment bodies, guest display names)`);
  });

  it("runs none of them on the member pages", async () => {
    const p = tm.page;
    await visit(p, "/arms");
    expect(await p.getByTestId("arm-table").locator("tbody tr").count()).toBeGreaterThanOrEqual(PAYLOADS.length);
    await visit(p, `/arms/${armIds[9]}`);
    await visit(p, `/arms/${armIds[40]}`);
    await visit(p, `/requirements/${bigSetId}`);
    await visit(p, `/shortlists/${shortlistId}`, async (pg) => {
      await pg.getByTestId("thread").first().waitFor();
      expect(await pg.getByTestId("comment-body").count()).toBeGreaterThanOrEqual(PAYLOADS.length * 2);
    });
    // The payload text is shown as text.
    expect(await p.getByTestId("discussion").innerText()).toContain("<script>__xss(1)</script>");
    await visit(p, "/admin/audit");
    expect(hits).toEqual([]);
    expect(findings).toEqual([]);
  });

  it("runs none of them on the share view of a guest", async () => {
    for (const token of tokens.slice(0, 2)) {
      const t = await guest.open(`/share/${token}`);
      await visit(t.page, `/share/${token}`, async (pg) => {
        await pg.getByTestId("thread").first().waitFor();
        await pg.getByTestId("visibility").waitFor();
      });
      expect(await t.page.getByTestId("comment-author").allInnerTexts()).toContain(`${clip(PAYLOADS[0], 60)} (guest)`);
    }
    expect(hits).toEqual([]);
    expect(findings).toEqual([]);
  });

  it("detects a payload that does run (control: the detector itself works)", async () => {
    const t = await guest.open(`/share/${tokens[2]}`);
    await t.page.waitForLoadState("networkidle");
    await t.page.evaluate(() => {
      document.querySelector("main")!.insertAdjacentHTML("beforeend", '<img id="probe" src="x" onerror="__xss(0)"><a id="probe-link" href="javascript:void 0">x</a>');
    });
    await t.page.waitForFunction(() => document.getElementById("probe") !== null);
    await t.page.evaluate(() => setTimeout(() => window.alert("probe"), 0));
    await t.page.waitForTimeout(500);
    const seen = await t.page.evaluate(domFindings);
    expect([...hits].sort()).toEqual(["dialog alert probe", "marker 0"]);
    expect(seen.some((f) => f.includes("onerror"))).toBe(true);
    expect(seen.some((f) => f.includes("javascript:"))).toBe(true);
  });
});
