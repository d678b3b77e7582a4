// Share links on a temporary database: token strength and storage, the same null for unknown,
// malformed, expired and revoked tokens, revocation at once, and audit events.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb, armDoc, requirementDoc } from "./helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createUser } from "@/lib/db/users";
import { listAuditEvents } from "@/lib/db/audit-read";
import { toFieldErrors } from "@/shared/schemas";
import { createLinkInput } from "@/shared/schemas/share";
import { createShareLink, hashShareToken, listShareLinks, resolveShareToken, revokeShareLink, TOKEN_RE } from "@/lib/db/shares";
import { can } from "@/lib/auth/permissions";

let t: TestDb;
let shortlistId: string, editorId: string;
beforeAll(async () => {
  t = createTestDb();
  editorId = (await createUser({ email: "ed@example.test", name: "Ed", passwordHash: "x" })).id;
  const arm = (await createArm(null, armDoc())).id;
  const set = (await createRequirementSet(null, requirementDoc())).id;
  shortlistId = (await createShortlist(editorId, { name: "Cell 4", requirementSetId: set, armIds: [arm] })).id;
});
afterAll(async () => t.cleanup());

describe("share links", () => {
  it("issues 256-bit base64url tokens and stores only their sha-256", async () => {
    const a = await createShareLink(editorId, shortlistId, { access: "view" });
    const b = await createShareLink(editorId, shortlistId, { access: "view" });
    expect(a.token).toMatch(TOKEN_RE);
    expect(Buffer.from(a.token, "base64url").length).toBe(32);
    expect(a.token).not.toBe(b.token);
    const rows = await t.client.shareLink.findMany();
    const stored = JSON.stringify(rows);
    expect(stored).not.toContain(a.token);
    expect(rows.find((r) => r.id === a.link.id)!.tokenHash).toBe(hashShareToken(a.token).toString("hex"));
  });

  it("resolves a live token to a guest confined to its shortlist and access", async () => {
    const { token, link } = await createShareLink(editorId, shortlistId, { access: "comment", hidePrices: true, label: "supplier" });
    const g = await resolveShareToken(token);
    expect(g).toMatchObject({ kind: "link", linkId: link.id, shortlistId, access: "comment", hidePrices: true, label: "supplier" });
    expect(can(g, "comment:write", { shortlistId })).toBe(true);
    expect(can(g, "comment:write", { shortlistId: "another" })).toBe(false);
    expect(can(g, "price:read", { shortlistId })).toBe(false);
    expect(can(g, "comment:edit", { shortlistId, ownerId: null })).toBe(false);
    expect(can(g, "share:manage", { shortlistId })).toBe(false);
  });

  it("answers null alike for unknown, malformed, expired and revoked tokens", async () => {
    const now = new Date("2020-01-01T00:00:00Z");
    const exp = await createShareLink(editorId, shortlistId, { access: "view", expiresInDays: 1 }, now);
    expect(await resolveShareToken(exp.token, new Date(now.getTime() + 86_399_000))).not.toBeNull();
    expect(await resolveShareToken(exp.token, new Date(now.getTime() + 86_400_000))).toBeNull();
    const rev = await createShareLink(editorId, shortlistId, { access: "comment" });
    expect(await resolveShareToken(rev.token)).not.toBeNull();
    const revoked = await revokeShareLink(editorId, rev.link.id);
    expect(revoked.state).toBe("revoked");
    expect(await resolveShareToken(rev.token)).toBeNull();
    // Revoking twice keeps the first time.
    expect((await revokeShareLink(editorId, rev.link.id)).revokedAt).toEqual(revoked.revokedAt);
    expect(await resolveShareToken("A".repeat(43))).toBeNull();
    expect(await resolveShareToken(rev.token.slice(0, 42))).toBeNull();
    expect(await resolveShareToken("")).toBeNull();
    expect(await resolveShareToken("'; DROP TABLE ShareLink; --")).toBeNull();
  });

  it("validates input naming the field (the schema the API parses with)", () => {
    const e = createLinkInput.safeParse({ access: "edit", expiresInDays: 0 });
    expect(toFieldErrors(e.error!).map((f) => f.path).sort()).toEqual(["access", "expiresInDays"]);
  });

  it("lists links with their state and records create and revoke in the audit trail", async () => {
    const links = await listShareLinks(shortlistId);
    expect(links.length).toBeGreaterThanOrEqual(5);
    expect(new Set(links.map((l) => l.state))).toEqual(new Set(["active", "revoked", "expired"]));
    expect(JSON.stringify(links)).not.toMatch(/tokenHash/);
    const events = await listAuditEvents({ entityType: "shortlist", entityId: shortlistId });
    expect(events.filter((e) => e.action === "link.create").length).toBe(links.length);
    expect(events.filter((e) => e.action === "link.revoke").length).toBe(1);
  });
});
