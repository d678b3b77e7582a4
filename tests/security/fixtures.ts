// A populated temporary database for the security tests: three members (admin, editor, viewer)
// signed in through the real API, a second editor, an arm, a requirement set, a shortlist with a
// finished analysis, and share links that are live (view, comment), expired and revoked.
import { randomBytes } from "node:crypto";
import { createTestDb, type TestDb, armDoc, requirementDoc } from "../db/helpers";
import { makeAccounts, type Accounts } from "../api/setup";
import { createArm, softDeleteArm } from "@/lib/db/arms";
import { createRequirementSet, softDeleteRequirementSet } from "@/lib/db/requirements";
import { createShortlist } from "@/lib/db/shortlists";
import { createUser, setUserRole } from "@/lib/db/users";
import { createShareLink, revokeShareLink } from "@/lib/db/shares";
import { createComment } from "@/lib/db/comments";
import { executeRun } from "@/lib/jobs/analysis-runner";
import { createSession } from "@/lib/auth/session";
import { hashPassword } from "@/lib/auth/password";
import { createInvitation } from "@/lib/db";

/** The password of every account the fixture makes through sign-up or freshMember. */
export const MEMBER_PASSWORD = "a long enough password";

export const ROLES = ["admin", "editor", "viewer", "viewLink", "commentLink", "expiredLink", "revokedLink", "anonymous"] as const;
export type Role = (typeof ROLES)[number];
export const MEMBER_ROLES = ["admin", "editor", "viewer"] as const;
export type MemberRole = (typeof MEMBER_ROLES)[number];
export const isMember = (r: Role): r is MemberRole => (MEMBER_ROLES as readonly string[]).includes(r);

export interface Fixture {
  db: TestDb;
  acc: Accounts;
  editor2: string;
  armId: string;
  setId: string;
  shortlistId: string;
  runId: string;
  tokens: { view: string; comment: string; expired: string; revoked: string; unknown: string };
  /** Session cookie of a role (members), else undefined. */
  cookie(role: Role): string | undefined;
  /** The share token a role presents on /api/share routes (members and anonymous: an unknown one). */
  token(role: Role): string;
  userId(role: MemberRole): string;
  /** A new session cookie for a member (for sign-out, which ends it). */
  freshCookie(role: MemberRole): Promise<string>;
  freshArm(deleted?: boolean): Promise<string>;
  freshRequirementSet(deleted?: boolean): Promise<string>;
  freshUser(): Promise<string>;
  /** A new account waiting for approval. */
  freshPendingUser(): Promise<string>;
  /** A new active account of a role (password "a long enough password") with a session of its own. */
  freshMember(role: MemberRole): Promise<{ id: string; cookie: string }>;
  freshInvitation(): Promise<string>;
  freshComment(authorId: string): Promise<string>;
  freshLink(creatorId: string): Promise<string>;
  seq(): number;
}

export async function createFixture(): Promise<Fixture> {
  const db = createTestDb();
  const acc = await makeAccounts();
  const editor2 = (await createUser({ email: "second.editor@example.test", name: "Second Editor", passwordHash: "x" })).id;
  await setUserRole(acc.ids.admin, editor2, "editor");
  const armId = (await createArm(acc.ids.admin, armDoc())).id;
  const setId = (
    await createRequirementSet(acc.ids.admin, requirementDoc({
      specs: [
        { field: "ratedPayload", comparator: "atLeast", value: 3, priority: "must" },
        { field: "price", comparator: "atMost", value: 25000, priority: "want" },
      ],
    }))
  ).id;
  const run = await createShortlist(acc.ids.editor, { name: "Fixture shortlist", requirementSetId: setId, armIds: [armId] });
  const shortlistId = run.id;
  if (run.needsStart && (await executeRun(run.run.id)) !== "done") throw new Error("fixture analysis did not finish");
  const past = new Date(Date.now() - 3 * 86_400_000);
  const view = await createShareLink(acc.ids.editor, shortlistId, { access: "view" });
  const comment = await createShareLink(acc.ids.editor, shortlistId, { access: "comment" });
  const expired = await createShareLink(acc.ids.editor, shortlistId, { access: "comment", expiresInDays: 1 }, past);
  const revoked = await createShareLink(acc.ids.editor, shortlistId, { access: "comment" });
  await revokeShareLink(acc.ids.editor, revoked.link.id);
  const tokens = { view: view.token, comment: comment.token, expired: expired.token, revoked: revoked.token, unknown: randomBytes(32).toString("base64url") };
  let n = 0;
  const seq = () => ++n;
  const memberHash = hashPassword(MEMBER_PASSWORD);
  const ids = { admin: acc.ids.admin, editor: acc.ids.editor, viewer: acc.ids.viewer };
  return {
    db, acc, editor2, armId, setId, shortlistId, runId: run.run.id, tokens, seq,
    cookie: (role) => (isMember(role) ? acc[role] : undefined),
    token: (role) =>
      role === "viewLink" ? tokens.view : role === "commentLink" ? tokens.comment : role === "expiredLink" ? tokens.expired : role === "revokedLink" ? tokens.revoked : tokens.unknown,
    userId: (role) => ids[role],
    async freshCookie(role) {
      const { token } = await createSession(ids[role]);
      return `armsift_session=${token}`;
    },
    async freshArm(deleted = false) {
      const id = (await createArm(acc.ids.admin, armDoc({ name: `Matrix arm ${seq()}` }))).id;
      if (deleted) await softDeleteArm(acc.ids.admin, id);
      return id;
    },
    async freshRequirementSet(deleted = false) {
      const id = (await createRequirementSet(acc.ids.admin, requirementDoc({ name: `Matrix cell ${seq()}` }))).id;
      if (deleted) await softDeleteRequirementSet(acc.ids.admin, id);
      return id;
    },
    async freshUser() {
      return (await createUser({ email: `member${seq()}@example.test`, name: `Member ${n}`, passwordHash: "x" })).id;
    },
    async freshPendingUser() {
      const id = (await createUser({ email: `pending${seq()}@example.test`, name: `Pending ${n}`, passwordHash: "x" })).id;
      await db.client.user.update({ where: { id }, data: { status: "pending" } });
      return id;
    },
    async freshMember(role) {
      const id = (await createUser({ email: `own${seq()}@example.test`, name: `Own ${n}`, passwordHash: await memberHash })).id;
      if (role !== "viewer") await setUserRole(acc.ids.admin, id, role);
      const { token } = await createSession(id);
      return { id, cookie: `armsift_session=${token}` };
    },
    async freshInvitation() {
      return (await createInvitation(acc.ids.admin, {})).invitation.id;
    },
    async freshComment(authorId) {
      return (await createComment({ kind: "member", userId: authorId }, shortlistId, { body: `comment ${seq()}` })).id;
    },
    async freshLink(creatorId) {
      return (await createShareLink(creatorId, shortlistId, { access: "view" })).link.id;
    },
  };
}
