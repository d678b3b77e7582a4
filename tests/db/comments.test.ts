// Discussion on a temporary database: anchors checked against the pins, threads, edits kept as
// immutable revisions, soft delete, resolve/reopen, mentions, unread counts, idempotent posts,
// guest names cleaned, and the audit trail.
import { spawn } from "node:child_process";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestDb, type TestDb, armDoc, requirementDoc } from "./helpers";
import { createArm } from "@/lib/db/arms";
import { createRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createUser } from "@/lib/db/users";
import { listAuditEvents } from "@/lib/db/audit-read";
import { ConflictError, ValidationError } from "@/lib/db/errors";
import { toFieldErrors } from "@/shared/schemas";
import { createCommentInput, guestCommentInput, type Anchor } from "@/shared/schemas/comments";
import { createShareLink } from "@/lib/db/shares";
import {
  createComment, deleteComment, editComment, listCommentRevisions, listCommentThreads, markDiscussionRead, setCommentResolved, unreadCounts,
} from "@/lib/db/comments";

let t: TestDb;
let shortlistId: string, armId: string, ada: string, bob: string, linkId: string;
const member = (userId: string) => ({ kind: "member" as const, userId });

beforeAll(async () => {
  t = createTestDb();
  ada = (await createUser({ email: "ada@example.test", name: "Ada", passwordHash: "x" })).id;
  bob = (await createUser({ email: "bob.lee@example.test", name: "Bob", passwordHash: "x" })).id;
  armId = (await createArm(null, armDoc())).id;
  const set = (await createRequirementSet(null, requirementDoc({ paths: [{ name: "seam", waypoints: [{ position: [0.4, 0, 0.2], rpy: [Math.PI, 0, 0] }, { position: [0.4, 0.1, 0.2], rpy: [Math.PI, 0, 0] }], mode: "point", step: 0.01, speed: 0.1 }] }))).id;
  shortlistId = (await createShortlist(ada, { name: "Cell 7", requirementSetId: set, armIds: [armId] })).id;
  linkId = (await createShareLink(ada, shortlistId, { access: "comment" })).link.id;
});
afterAll(async () => t.cleanup());

describe("discussion", () => {
  it("anchors to the shortlist, an arm, a target, a path or a compliance row of the pins only", async () => {
    const anchors: (Anchor | undefined)[] = [undefined, { type: "arm", id: armId }, { type: "target", id: "pick" }, { type: "path", id: "seam" }, { type: "compliance", id: `${armId}#0` }];
    for (const anchor of anchors) {
      const r = await createComment(member(ada), shortlistId, { body: "ok", anchor });
      expect(r.created).toBe(true);
    }
    const wrong: Anchor[] = [{ type: "arm", id: "nope" }, { type: "target", id: "nowhere" }, { type: "path", id: "pick" }, { type: "compliance", id: `${armId}#9` }, { type: "shortlist", id: "x" }, { type: "target" }];
    for (const anchor of wrong) {
      const e = await createComment(member(ada), shortlistId, { body: "x", anchor }).catch((x) => x);
      expect(e, JSON.stringify(anchor)).toBeInstanceOf(ValidationError);
      expect(e.fieldErrors[0].path).toBe("anchor.id");
    }
    // The body's own rules are the schema's, checked at the edge (shared/schemas/comments.ts).
    expect(toFieldErrors(createCommentInput.safeParse({ body: "   " }).error!)[0].path).toBe("body");
  });

  it("threads replies (a reply to a reply joins the thread, keeping the anchor)", async () => {
    const root = await createComment(member(ada), shortlistId, { body: "Which gripper?", anchor: { type: "target", id: "place" } });
    const r1 = await createComment(member(bob), shortlistId, { body: "vacuum", parentId: root.id });
    await createComment(member(ada), shortlistId, { body: "agreed", parentId: r1.id });
    const thread = (await listCommentThreads(shortlistId)).find((x) => x.id === root.id)!;
    expect(thread.replies.map((r) => r.body)).toEqual(["vacuum", "agreed"]);
    expect(thread.replies.every((r) => r.parentId === root.id && r.anchor.type === "target" && r.anchor.id === "place")).toBe(true);
  });

  it("keeps every edit as an immutable revision and deletes softly", async () => {
    const c = await createComment(member(bob), shortlistId, { body: "first" });
    expect(await editComment(bob, c.id, { body: "second", baseRevision: 1 })).toEqual({ id: c.id, revision: 2 });
    const stale = await editComment(bob, c.id, { body: "third", baseRevision: 1 }).catch((x) => x);
    expect(stale).toBeInstanceOf(ConflictError);
    expect(stale).toMatchObject({ baseRevision: 1, currentRevision: 2, changes: [{ path: "body", base: "first", current: "second" }] });
    await editComment(bob, c.id, { body: "third" });
    expect((await listCommentRevisions(c.id))!.map((r) => [r.revision, r.body])).toEqual([[1, "first"], [2, "second"], [3, "third"]]);
    await expect(t.client.$executeRaw`UPDATE "CommentRevision" SET "body" = 'x' WHERE "commentId" = ${c.id}`).rejects.toThrow(/immutable/);
    await expect(t.client.$executeRaw`DELETE FROM "CommentRevision" WHERE "commentId" = ${c.id}`).rejects.toThrow(/immutable/);
    await deleteComment(bob, c.id);
    expect((await listCommentThreads(shortlistId)).some((x) => x.id === c.id)).toBe(false);
    expect((await listCommentRevisions(c.id))!.length).toBe(3);
    expect((await t.client.comment.findUnique({ where: { id: c.id } }))!.deletedAt).not.toBeNull();
  });

  it("resolves and reopens threads, not replies", async () => {
    const root = await createComment(member(ada), shortlistId, { body: "payload margin?" });
    const reply = await createComment(member(bob), shortlistId, { body: "fine", parentId: root.id });
    expect((await setCommentResolved(bob, root.id, true)).resolvedAt).not.toBeNull();
    expect((await listCommentThreads(shortlistId)).find((x) => x.id === root.id)!.resolvedBy).toEqual({ id: bob, name: "Bob" });
    expect((await setCommentResolved(ada, root.id, false)).resolvedAt).toBeNull();
    await expect(setCommentResolved(ada, reply.id, true)).rejects.toBeInstanceOf(ValidationError);
  });

  it("records mentions of members by handle and counts unread comments per member", async () => {
    await markDiscussionRead(ada, shortlistId, new Date());
    await markDiscussionRead(bob, shortlistId, new Date());
    await new Promise((r) => setTimeout(r, 5));
    const c = await createComment(member(ada), shortlistId, { body: "@bob.lee please check, cc @nobody" });
    const thread = (await listCommentThreads(shortlistId)).find((x) => x.id === c.id)!;
    expect(thread.mentions).toEqual([{ id: bob, name: "Bob" }]);
    expect(thread.html).toContain('<span class="mention">@bob.lee</span>');
    expect(thread.html).not.toContain('<span class="mention">@nobody');
    await createComment({ kind: "guest", linkId, name: "Guest" }, shortlistId, { body: "from outside" });
    const forBob = (await unreadCounts(bob, [shortlistId])).get(shortlistId);
    const forAda = (await unreadCounts(ada, [shortlistId])).get(shortlistId);
    expect(forBob).toEqual({ unread: 2, mentions: 1 });
    expect(forAda).toEqual({ unread: 1, mentions: 0 }); // her own comment does not count
    await markDiscussionRead(bob, shortlistId);
    expect((await unreadCounts(bob, [shortlistId])).get(shortlistId)).toEqual({ unread: 0, mentions: 0 });
  });

  it("counts unread comments for several shortlists at once, each since its own last read", async () => {
    const set = (await createRequirementSet(null, requirementDoc())).id;
    const other = (await createShortlist(ada, { name: "Cell 8", requirementSetId: set, armIds: [armId] })).id;
    const never = (await createShortlist(ada, { name: "Cell 9", requirementSetId: set, armIds: [armId] })).id;
    await createComment(member(ada), other, { body: "before bob read it" });
    await new Promise((r) => setTimeout(r, 5));
    await markDiscussionRead(bob, other, new Date());
    await new Promise((r) => setTimeout(r, 5));
    await createComment(member(ada), other, { body: "after, for @bob.lee" });
    await createComment(member(bob), other, { body: "bob's own" });
    await createComment(member(ada), never, { body: "one" });
    await createComment(member(ada), never, { body: "two" });
    const counts = await unreadCounts(bob, [other, never, "no-such-shortlist"]);
    expect(counts.get(other)).toEqual({ unread: 1, mentions: 1 });
    expect(counts.get(never)).toEqual({ unread: 2, mentions: 0 });
    expect(counts.get("no-such-shortlist")).toEqual({ unread: 0, mentions: 0 });
    // The same numbers one shortlist at a time.
    expect((await unreadCounts(bob, [never])).get(never)).toEqual({ unread: 2, mentions: 0 });
  });

  it("stores a retried post once (client key) and cleans guest display names", async () => {
    const a = await createComment(member(ada), shortlistId, { body: "once", clientKey: "key-00000001" });
    const b = await createComment(member(ada), shortlistId, { body: "once", clientKey: "key-00000001" });
    expect(b).toEqual({ id: a.id, created: false });
    expect(await t.client.comment.count({ where: { clientKey: "key-00000001" } })).toBe(1);
    // A guest's name is cleaned by the post schema at the edge, then stored as given.
    const { name, ...post } = guestCommentInput.parse({ name: "  Eve\u202E\u200B  Moneypenny ", body: "hi" });
    const g = await createComment({ kind: "guest", linkId, name }, shortlistId, post);
    expect((await t.client.comment.findUnique({ where: { id: g.id } }))!.authorLabel).toBe("Eve Moneypenny");
    const e = guestCommentInput.safeParse({ name: "\u200B\u202E", body: "hi" });
    expect(toFieldErrors(e.error!)).toEqual([{ path: "name", message: "give a display name" }]);
  });

  it("writes an audit event for every change", async () => {
    const events = await listAuditEvents({ entityType: "comment", limit: 1000 });
    const actions = new Set(events.map((e) => e.action));
    expect(actions).toEqual(new Set(["comment.create", "comment.edit", "comment.delete", "comment.resolve", "comment.reopen"]));
    const comments = await t.client.comment.count();
    expect(events.filter((e) => e.action === "comment.create").length).toBe(comments);
  });

  it("posts reliably while another process writes to the database (the analysis runner does)", async () => {
    // A second process commits writes back to back (the analysis runner writes progress while it
    // runs). A deferred transaction that read before such a commit could not write after it.
    const script = t.provider === "sqlite"
      ? `const D = require("better-sqlite3"); const d = new D(${JSON.stringify(t.file)}); d.pragma("busy_timeout = 5000");
      const s = new Int32Array(new SharedArrayBuffer(4)); process.stdout.write("ready\\n");
      for (;;) { d.prepare("UPDATE Shortlist SET updatedAt = updatedAt").run(); Atomics.wait(s, 0, 0, 0); }`
      : `const { Client } = require("pg"); const c = new Client({ connectionString: ${JSON.stringify(t.url)} });
      (async () => { await c.connect(); process.stdout.write("ready\\n");
        for (;;) await c.query('UPDATE "Shortlist" SET "updatedAt" = "updatedAt"'); })();`;
    const writer = spawn(process.execPath, ["-e", script], { cwd: process.cwd(), stdio: ["ignore", "pipe", "inherit"] });
    try {
      await new Promise<void>((resolve, reject) => {
        writer.stdout!.once("data", () => resolve());
        writer.once("exit", (code) => reject(new Error(`writer exited with ${code}`)));
      });
      const failures: string[] = [];
      for (let i = 0; i < 150; i++) {
        await createComment(member(ada), shortlistId, { body: `while writing ${i}` }).catch((e: Error) => failures.push(e.message.split("\n").pop()!));
      }
      expect(failures).toEqual([]);
      expect(await t.client.comment.count({ where: { body: { startsWith: "while writing " } } })).toBe(150);
    } finally {
      writer.kill("SIGKILL");
    }
  }, 60_000);
});
