// A deleted comment's text (every revision of it) is readable to admins only: other members see
// that versions existed, with the bodies withheld; a live comment's history is open to members.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call, type Body } from "../api/client";
import { createFixture, MEMBER_ROLES, type Fixture } from "./fixtures";
import * as revisions from "@/app/api/shortlists/[id]/comments/[commentId]/revisions/route";
import { deleteComment, editComment } from "@/lib/db";

let f: Fixture;
beforeAll(async () => {
  f = await createFixture();
}, 120_000);
afterAll(async () => f?.db.cleanup());

const history = (commentId: string, cookie?: string) =>
  call(revisions.GET, "/x", { cookie, params: { id: f.shortlistId, commentId } });

describe("revisions of a deleted comment", () => {
  it("admins read the deleted text; editors and viewers get the versions without bodies", async () => {
    const id = await f.freshComment(f.editor2);
    await editComment(f.editor2, id, { body: "the secret second version" });
    await deleteComment(f.editor2, id);
    const admin = await history(id, f.cookie("admin"));
    expect(admin.status).toBe(200);
    expect(admin.body.revisions.map((r: Body) => r.body)).toEqual([expect.stringMatching(/^comment \d+$/), "the secret second version"]);
    for (const role of ["editor", "viewer"] as const) {
      const r = await history(id, f.cookie(role));
      expect(r.status, role).toBe(200);
      expect(r.body.bodiesHidden).toBe(true);
      expect(r.body.revisions.map((x: Body) => [x.revision, x.body])).toEqual([[1, null], [2, null]]);
      expect(JSON.stringify(r.body)).not.toContain("secret");
    }
  });

  it("a live comment's revisions stay readable to every member", async () => {
    const id = await f.freshComment(f.editor2);
    await editComment(f.editor2, id, { body: "open second version" });
    for (const role of MEMBER_ROLES) {
      const r = await history(id, f.cookie(role));
      expect(r.body.revisions.at(-1).body, role).toBe("open second version");
      expect(r.body.bodiesHidden).toBeUndefined();
    }
  });
});
