// Cross-site request forgery: every state-changing handler (POST, PUT, PATCH, DELETE under
// app/api) refuses a request whose Origin names another site, even with a valid session cookie or
// share token, and nothing is written; the same request from this site's origin goes through.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call } from "../api/client";
import { createFixture, type Fixture } from "./fixtures";
import { discoverRoutes } from "./routes";

const FOREIGN = ["https://attacker.example", "http://localhost:3001", "null", "http://localhost:3000.attacker.example"];

let f: Fixture;
let routes: Awaited<ReturnType<typeof discoverRoutes>>;
beforeAll(async () => {
  f = await createFixture();
  routes = await discoverRoutes();
}, 120_000);
afterAll(async () => f?.db.cleanup());

async function counts() {
  const c = f.db.client;
  return JSON.stringify(await Promise.all([c.auditEvent.count(), c.comment.count(), c.shareLink.count(), c.user.count(), c.session.count(), c.arm.count(), c.shortlist.count()]));
}

describe("cross-site requests", () => {
  it("refuses every state-changing route from another origin and writes nothing", async () => {
    const mutating = routes.flatMap((r) => r.methods.filter((m) => !["GET", "HEAD", "OPTIONS"].includes(m)).map((m) => ({ ...r, method: m })));
    expect(mutating.length).toBeGreaterThanOrEqual(20);
    const before = await counts();
    const params = { id: f.shortlistId, commentId: "c", linkId: "l", token: f.tokens.comment, runId: f.runId, rev: "1" };
    for (const r of mutating) {
      for (const origin of FOREIGN) {
        const handler = r.module[r.method] as Parameters<typeof call>[0];
        const res = await call(handler, `/api/${r.key}`, {
          method: r.method, cookie: f.acc.admin, params, headers: { origin }, body: { name: "x", body: "forged", email: "forged@example.test", password: "a long enough password", role: "admin", access: "comment" },
        });
        expect(res.status, `${r.method} ${r.key} from ${origin}`).toBe(403);
        expect(res.body.error.code).toBe("forbidden");
      }
    }
    expect(await counts()).toBe(before);
  });

  it("lets the same request through from this site's origin", async () => {
    const mod = routes.find((r) => r.key === "shortlists/[id]/comments")!.module;
    const res = await call(mod.POST as Parameters<typeof call>[0], `/api/shortlists/${f.shortlistId}/comments`, {
      cookie: f.acc.viewer, params: { id: f.shortlistId }, headers: { origin: "http://localhost:3000" }, body: { body: "same site" },
    });
    expect(res.status).toBe(201);
  });
});
