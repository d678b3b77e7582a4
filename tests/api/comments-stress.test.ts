// Hostile comment bodies over the API: a deeply nested body is refused with a field error, and a
// stored one (written before the limit existed) no longer breaks the discussion for members or
// link guests: the lists answer 200 and the comment shows as plain text.
import { beforeAll, describe, expect, it } from "vitest";
import { armDoc, requirementDoc } from "../db/helpers";
import * as comments from "@/app/api/shortlists/[id]/comments/route";
import * as shareComments from "@/app/api/share/[token]/comments/route";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createShareLink } from "@/lib/db/shares";
import { createComment } from "@/lib/db/comments";
import { commentPosts } from "@/lib/auth/rate-limit";
import { call, expectFieldError, type Body } from "./client";
import { withAccounts } from "./setup";
import { STRESS_CORPUS } from "../markdown/corpus";

const { acc, t } = withAccounts();
let shortlistId: string;
let token: string;
beforeAll(async () => {
  const armId = (await createArm(acc.ids.admin, armDoc())).id;
  const setId = (await createRequirementSet(acc.ids.admin, requirementDoc())).id;
  shortlistId = (await createShortlist(acc.ids.editor, { name: "Stress", requirementSetId: setId, armIds: [armId] })).id;
  token = (await createShareLink(acc.ids.editor, shortlistId, { access: "comment" })).token;
});

const memberList = () => call(comments.GET, `/api/shortlists/${shortlistId}/comments`, { cookie: acc.viewer, params: { id: shortlistId } });
const guestList = () => call(shareComments.GET, `/api/share/${token}/comments`, { params: { token } });
const deep = "> ".repeat(2000) + "x";

describe("a deeply nested comment", () => {
  it("is refused at input with a field error on the body, from a member and from a guest", async () => {
    const r = await call(comments.POST, `/api/shortlists/${shortlistId}/comments`, { cookie: acc.viewer, params: { id: shortlistId }, body: { body: deep } });
    expectFieldError(r, "body", /nested more than 16 levels/);
    const g = await call(shareComments.POST, `/api/share/${token}/comments`, { params: { token }, body: { name: "Guest", body: deep } });
    expectFieldError(g, "body", /nested more than 16 levels/);
  });

  it("stored earlier, leaves both lists working and shows as plain text", async () => {
    const ok = await createComment({ kind: "member", userId: acc.ids.editor }, shortlistId, { body: "ordinary" });
    // Written straight to the database, as before the limit existed.
    await t.client.comment.update({ where: { id: ok.id }, data: { body: deep } });
    await createComment({ kind: "member", userId: acc.ids.viewer }, shortlistId, { body: "a later **reply**" });
    for (const r of [await memberList(), await guestList()]) {
      expect(r.status).toBe(200);
      const byBody = new Map(r.body.threads.map((th: Body) => [th.body, th]));
      const bad: Body = byBody.get(deep);
      expect(bad.html.startsWith("<p>&gt; &gt; ")).toBe(true);
      expect(bad.html).not.toContain("<blockquote>");
      expect((byBody.get("a later **reply**") as Body).html).toContain("<strong>reply</strong>");
    }
  });

  it("the parser-stress corpus within the size limit: each body is stored or refused, and the lists still answer", async () => {
    for (const body of Object.values(STRESS_CORPUS)) {
      if (body.length > 5000) continue;
      commentPosts.clear();
      const r = await call(comments.POST, `/api/shortlists/${shortlistId}/comments`, { cookie: acc.editor, params: { id: shortlistId }, body: { body } });
      if (r.status !== 201) expectFieldError(r, "body", /nested/);
    }
    const m = await memberList();
    expect(m.status).toBe(200);
    expect((await guestList()).status).toBe(200);
    expect(m.body.threads.length).toBeGreaterThan(10);
    expect(m.body.threads.every((th: Body) => th.renderError === null)).toBe(true);
  });
});
