// Share links through the API: a guest sees only the allow-listed view (no prices when the link
// hides them), the same 404 for unknown, expired and revoked tokens, revocation takes effect on
// the next request, and the rate limits on token access and comment posting.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call } from "../api/client";
import { createFixture, type Fixture } from "./fixtures";
import * as share from "@/app/api/share/[token]/route";
import * as shareComments from "@/app/api/share/[token]/comments/route";
import * as links from "@/app/api/shortlists/[id]/links/route";
import * as linkById from "@/app/api/shortlists/[id]/links/[linkId]/route";
import * as comments from "@/app/api/shortlists/[id]/comments/route";
import { commentPosts, shareTokenFailures, shareTokenRequests } from "@/lib/auth/rate-limit";
import { PEER_HEADER } from "@/lib/http/forwarded";

let f: Fixture;
beforeAll(async () => {
  f = await createFixture();
}, 120_000);
afterAll(async () => f?.db.cleanup());

const view = (token: string, ip = "192.0.2.1") => call(share.GET, `/api/share/${token}`, { params: { token }, headers: { [PEER_HEADER]: ip } });

describe("share links through the API", () => {
  it("shows prices only when the link allows, and never arm documents or emails", async () => {
    const open = await call(links.POST, "/api/shortlists/x/links", { cookie: f.acc.editor, params: { id: f.shortlistId }, body: { access: "view" } });
    const hidden = await call(links.POST, "/api/shortlists/x/links", { cookie: f.acc.editor, params: { id: f.shortlistId }, body: { access: "view", hidePrices: true } });
    expect(open.status).toBe(201);
    expect(open.body.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const a = await view(open.body.token);
    const b = await view(hidden.body.token);
    expect(a.status).toBe(200);
    expect(b.status).toBe(200);
    // The fixture arm's price is 21000 EUR.
    expect(JSON.stringify(a.body)).toMatch(/21[\s,.]?000/);
    expect(a.body.analysis.subScores.map((s: { key: string }) => s.key)).toContain("price");
    const hiddenText = JSON.stringify(b.body);
    expect(hiddenText).not.toMatch(/21[\s,.]?000|25[\s,.]?000/);
    expect(b.body.shortlist.arms.every((x: { price: unknown }) => x.price === null)).toBe(true);
    expect(b.body.analysis.compliance.map((c: { label: string }) => c.label).join()).not.toMatch(/price/i);
    expect(a.body.analysis.compliance.map((c: { label: string }) => c.label).join()).toMatch(/price/i);
    expect(JSON.stringify(a.body)).toMatch(/25[\s,.]?000/);
    expect(b.body.analysis.subScores.map((s: { key: string }) => s.key)).not.toContain("price");
    expect(b.body.visibility).toMatchObject({ access: "view", hidePrices: true });
    expect(b.body.visibility.statements.join(" ")).toMatch(/Prices are hidden/);
    for (const body of [a.body, b.body]) {
      const text = JSON.stringify(body);
      expect(text).not.toMatch(/@example\.test|joints|tokenHash|passwordHash/);
    }
  });

  it("answers the same 404 for unknown, malformed, expired and revoked tokens; revocation is immediate", async () => {
    const made = await call(links.POST, "/api/shortlists/x/links", { cookie: f.acc.editor, params: { id: f.shortlistId }, body: { access: "comment" } });
    expect((await view(made.body.token)).status).toBe(200);
    const revoke = await call(linkById.DELETE, "/api/shortlists/x/links/y", { method: "DELETE", cookie: f.acc.editor, params: { id: f.shortlistId, linkId: made.body.link.id } });
    expect(revoke.status).toBe(200);
    const bodies = [];
    for (const t of [made.body.token, f.tokens.expired, f.tokens.revoked, f.tokens.unknown, "short", "%00", "A".repeat(500)]) {
      const r = await view(t, "192.0.2.2");
      expect(r.status).toBe(404);
      bodies.push(JSON.stringify(r.body));
    }
    expect(new Set(bodies).size).toBe(1);
  });

  it("limits failed token lookups per address, without locking out other addresses", async () => {
    shareTokenFailures.clear();
    shareTokenRequests.clear();
    for (let i = 0; i < 20; i++) expect((await view(f.tokens.unknown, "192.0.2.3")).status).toBe(404);
    const limited = await view(f.tokens.view, "192.0.2.3");
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe("rate-limited");
    expect(limited.res.headers.get("retry-after")).toMatch(/^\d+$/);
    expect((await view(f.tokens.view, "192.0.2.4")).status).toBe(200);
  });

  it("limits comment posting per member and per guest link and address", async () => {
    commentPosts.clear();
    for (let i = 0; i < 30; i++) {
      const r = await call(comments.POST, "/api/x", { cookie: f.acc.viewer, params: { id: f.shortlistId }, body: { body: `burst ${i}` } });
      expect(r.status).toBe(201);
    }
    const over = await call(comments.POST, "/api/x", { cookie: f.acc.viewer, params: { id: f.shortlistId }, body: { body: "one too many" } });
    expect(over.status).toBe(429);
    // Another member is not affected.
    expect((await call(comments.POST, "/api/x", { cookie: f.acc.editor, params: { id: f.shortlistId }, body: { body: "mine" } })).status).toBe(201);
    const post = (i: number) =>
      call(shareComments.POST, "/api/x", { params: { token: f.tokens.comment }, headers: { [PEER_HEADER]: "192.0.2.9" }, body: { name: "Guest", body: `guest ${i}` } });
    for (let i = 0; i < 30; i++) expect((await post(i)).status).toBe(201);
    expect((await post(31)).status).toBe(429);
    expect(await f.db.client.comment.count({ where: { body: { in: ["one too many", "guest 31"] } } })).toBe(0);
  });

  it("lets a view link read the discussion but not post, and requires a display name on a comment link", async () => {
    commentPosts.clear();
    const r = await call(shareComments.POST, "/api/x", { params: { token: f.tokens.view }, body: { name: "Guest", body: "hello" } });
    expect(r.status).toBe(403);
    const noName = await call(shareComments.POST, "/api/x", { params: { token: f.tokens.comment }, body: { name: " \u200B ", body: "hello" } });
    expect(noName.status).toBe(400);
    expect(noName.body.error.fieldErrors[0].path).toBe("name");
    const list = await call(shareComments.GET, "/api/x", { params: { token: f.tokens.view } });
    expect(list.status).toBe(200);
    expect(list.body.threads.length).toBeGreaterThan(0);
    // Guests get names, never account ids.
    const text = JSON.stringify(list.body);
    for (const id of Object.values(f.acc.ids)) expect(text).not.toContain(id);
  });
});
