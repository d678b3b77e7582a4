// Authorisation matrix: every route handler (app/api/**/route.ts × exported method) and every
// server action, against every role: admin, editor, viewer, view-link guest, comment-link guest,
// expired link, revoked link, anonymous. Each cell calls the real handler with a real Request on
// a temporary SQLite database and asserts allowed (2xx) or the exact denial (401 anonymous,
// 403 role, 404 unknown/expired/revoked link). A route without a row fails the test, and so does
// a row without a route.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call, type Body } from "../api/client";
import { sampleArm, sampleRequirementSet } from "../db/helpers";
import { createFixture, isMember, MEMBER_PASSWORD, ROLES, type Fixture, type MemberRole, type Role } from "./fixtures";
import { discoverRoutes, discoverServerActions, type Method } from "./routes";
import { deleteComment } from "@/lib/db";
import { commentPosts, shareTokenFailures, shareTokenRequests, signInFailuresByAccount, signInFailuresByIp } from "@/lib/auth/rate-limit";

type Expect = "ok" | 401 | 403 | 404;
type Cells = Record<Role, Expect>;
interface Req {
  params?: Record<string, string>;
  body?: unknown;
  query?: string;
  cookie?: string;
}
interface Row {
  route: string;
  method: Method;
  /** Distinguishes several rows of one route and method (e.g. own vs someone else's comment). */
  variant?: string;
  expect: Cells;
  request?: (f: Fixture, role: Role) => Promise<Req> | Req;
}

const guests = { viewLink: 401, commentLink: 401, expiredLink: 401, revokedLink: 401, anonymous: 401 } as const;
const READ: Cells = { admin: "ok", editor: "ok", viewer: "ok", ...guests };
const WRITE: Cells = { admin: "ok", editor: "ok", viewer: 403, ...guests };
const ADMIN: Cells = { admin: "ok", editor: 403, viewer: 403, ...guests };
const OPEN: Cells = { admin: "ok", editor: "ok", viewer: "ok", viewLink: "ok", commentLink: "ok", expiredLink: "ok", revokedLink: "ok", anonymous: "ok" };
const token = (view: Expect, comment: Expect): Cells => ({ admin: 404, editor: 404, viewer: 404, viewLink: view, commentLink: comment, expiredLink: 404, revokedLink: 404, anonymous: 404 });

/** The member a role stands for when the row acts on "your own" thing (guests: the admin's). */
const selfOf = (f: Fixture, role: Role) => f.userId((["admin", "editor", "viewer"].includes(role) ? role : "admin") as MemberRole);

/** arms and requirements share one shape of endpoints. */
function documentRows(base: "arms" | "requirements"): Row[] {
  const fresh = (f: Fixture, deleted = false) => (base === "arms" ? f.freshArm(deleted) : f.freshRequirementSet(deleted));
  const existing = (f: Fixture) => (base === "arms" ? f.armId : f.setId);
  const doc = (f: Fixture) => (base === "arms" ? sampleArm({ name: `Posted arm ${f.seq()}` }) : sampleRequirementSet({ name: `Posted cell ${f.seq()}` }));
  const key = base === "arms" ? "arm" : "requirementSet";
  return [
    { route: base, method: "GET", expect: READ },
    { route: base, method: "POST", expect: WRITE, request: (f) => ({ body: doc(f) }) },
    { route: `${base}/import`, method: "POST", expect: WRITE, request: (f) => ({ body: doc(f) }) },
    { route: `${base}/[id]`, method: "GET", expect: READ, request: (f) => ({ params: { id: existing(f) } }) },
    { route: `${base}/[id]`, method: "PUT", expect: WRITE, request: async (f) => ({ params: { id: await fresh(f) }, body: { baseRevision: 1, [key]: doc(f) } }) },
    { route: `${base}/[id]`, method: "DELETE", expect: WRITE, request: async (f) => ({ params: { id: await fresh(f) } }) },
    { route: `${base}/[id]/restore`, method: "POST", expect: WRITE, request: async (f) => ({ params: { id: await fresh(f, true) } }) },
    { route: `${base}/[id]/revisions`, method: "GET", expect: READ, request: (f) => ({ params: { id: existing(f) } }) },
    { route: `${base}/[id]/revisions/[rev]`, method: "GET", expect: READ, request: (f) => ({ params: { id: existing(f), rev: "1" } }) },
    { route: `${base}/[id]/export`, method: "GET", expect: READ, request: (f) => ({ params: { id: existing(f) } }) },
  ];
}

const sl = (f: Fixture) => ({ id: f.shortlistId });

const ROWS: Row[] = [
  { route: "health", method: "GET", expect: OPEN },
  // Signing up and in is open to everyone (a later sign-up answers 202 and waits for approval by default).
  { route: "auth/signup", method: "POST", expect: OPEN, request: (f) => ({ body: { email: `new${f.seq()}@example.test`, name: "New Member", password: "a long enough password" } }) },
  { route: "auth/signin", method: "POST", expect: OPEN, request: () => ({ body: { email: "viewer@example.test", password: "a long enough password" } }) },
  { route: "auth/signout", method: "POST", expect: OPEN, request: async (f, role) => (["admin", "editor", "viewer"].includes(role) ? { cookie: await f.freshCookie(role as MemberRole) } : {}) },
  { route: "auth/me", method: "GET", expect: READ },
  { route: "users", method: "GET", expect: ADMIN },
  { route: "users/[id]", method: "PATCH", expect: ADMIN, request: async (f) => ({ params: { id: await f.freshUser() }, body: { role: "viewer" } }) },
  { route: "users/[id]/approval", method: "POST", expect: ADMIN, request: async (f) => ({ params: { id: await f.freshPendingUser() }, body: { decision: "approve" } }) },
  { route: "settings/sign-up", method: "GET", expect: ADMIN },
  { route: "settings/sign-up", method: "PUT", expect: ADMIN, request: () => ({ body: { mode: "approval" } }) },
  { route: "invitations", method: "GET", expect: ADMIN },
  { route: "invitations", method: "POST", expect: ADMIN, request: () => ({ body: { role: "viewer", expiresInDays: 2 } }) },
  { route: "invitations/[id]", method: "DELETE", expect: ADMIN, request: async (f) => ({ params: { id: await f.freshInvitation() } }) },
  // One's own account (a fresh account per member role, so the fixture's sessions stay).
  {
    route: "auth/password", method: "POST", expect: READ,
    request: async (f, role) => ({
      ...(isMember(role) ? { cookie: (await f.freshMember(role)).cookie } : {}),
      body: { currentPassword: MEMBER_PASSWORD, newPassword: "another long passphrase" },
    }),
  },
  {
    route: "auth/signout-others", method: "POST", expect: READ,
    request: async (f, role) => (isMember(role) ? { cookie: (await f.freshMember(role)).cookie } : {}),
  },
  ...documentRows("arms"),
  // URDF: reading a file into an arm is part of adding arms; exporting is reading.
  {
    route: "arms/urdf", method: "POST", expect: WRITE,
    request: () => ({ body: { fileName: "two.urdf", text: '<robot name="two"><link name="a"/><link name="b"/><joint name="j" type="revolute"><parent link="a"/><child link="b"/><limit lower="-1" upper="1" effort="1" velocity="1"/></joint></robot>' } }),
  },
  { route: "arms/[id]/urdf", method: "GET", expect: READ, request: (f) => ({ params: { id: f.armId } }) },
  ...documentRows("requirements"),
  { route: "shortlists", method: "GET", expect: READ },
  { route: "shortlists", method: "POST", expect: WRITE, request: (f) => ({ body: { name: `Posted shortlist ${f.seq()}`, requirementSetId: f.setId, armIds: [f.armId] } }) },
  { route: "shortlists/[id]", method: "GET", expect: READ, request: (f) => ({ params: sl(f) }) },
  { route: "shortlists/[id]/repin", method: "POST", expect: WRITE, request: (f) => ({ params: sl(f) }) },
  { route: "shortlists/[id]/runs", method: "POST", expect: WRITE, request: (f) => ({ params: sl(f) }) },
  { route: "shortlists/[id]/runs/[runId]", method: "GET", expect: READ, request: (f) => ({ params: { id: f.shortlistId, runId: f.runId } }) },
  // The fixture's run has finished: cancelling it answers the run unchanged.
  { route: "shortlists/[id]/runs/[runId]/cancel", method: "POST", expect: WRITE, request: (f) => ({ params: { id: f.shortlistId, runId: f.runId } }) },
  { route: "shortlists/[id]/runs/[runId]/view", method: "GET", expect: READ, request: (f) => ({ params: { id: f.shortlistId, runId: f.runId }, query: `?arm=${f.armId}` }) },
  { route: "shortlists/[id]/export", method: "GET", expect: READ, request: (f) => ({ params: sl(f), query: "?format=csv" }) },
  // Discussion.
  { route: "shortlists/[id]/comments", method: "GET", expect: READ, request: (f) => ({ params: sl(f) }) },
  { route: "shortlists/[id]/comments", method: "POST", expect: READ, request: (f) => ({ params: sl(f), body: { body: `matrix ${f.seq()}`, anchor: { type: "arm", id: f.armId } } }) },
  { route: "shortlists/[id]/comments/read", method: "POST", expect: READ, request: (f) => ({ params: sl(f) }) },
  {
    route: "shortlists/[id]/comments/[commentId]", method: "PATCH", variant: "own comment", expect: READ,
    request: async (f, role) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(selfOf(f, role)) }, body: { body: "edited" } }),
  },
  {
    route: "shortlists/[id]/comments/[commentId]", method: "PATCH", variant: "another member's comment", expect: { ...READ, admin: 403, editor: 403, viewer: 403 },
    request: async (f) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(f.editor2) }, body: { body: "edited by someone else" } }),
  },
  {
    route: "shortlists/[id]/comments/[commentId]", method: "DELETE", variant: "own comment", expect: READ,
    request: async (f, role) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(selfOf(f, role)) } }),
  },
  {
    route: "shortlists/[id]/comments/[commentId]", method: "DELETE", variant: "another member's comment (admin moderates)", expect: { ...READ, editor: 403, viewer: 403 },
    request: async (f) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(f.editor2) } }),
  },
  {
    route: "shortlists/[id]/comments/[commentId]/resolve", method: "POST", expect: READ,
    request: async (f) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(f.editor2) }, body: { resolved: true } }),
  },
  {
    route: "shortlists/[id]/comments/[commentId]/revisions", method: "GET", expect: READ,
    request: async (f) => ({ params: { id: f.shortlistId, commentId: await f.freshComment(f.editor2) } }),
  },
  {
    // Members get the versions; only admins get a deleted comment's bodies (deleted-comments.test.ts).
    route: "shortlists/[id]/comments/[commentId]/revisions", method: "GET", variant: "a deleted comment", expect: READ,
    request: async (f) => {
      const commentId = await f.freshComment(f.editor2);
      await deleteComment(f.editor2, commentId);
      return { params: { id: f.shortlistId, commentId } };
    },
  },
  // Share links: editors manage the links they made, admins all.
  { route: "shortlists/[id]/links", method: "GET", expect: WRITE, request: (f) => ({ params: sl(f) }) },
  { route: "shortlists/[id]/links", method: "POST", expect: WRITE, request: (f) => ({ params: sl(f), body: { access: "comment", expiresInDays: 7, hidePrices: true } }) },
  {
    route: "shortlists/[id]/links/[linkId]", method: "DELETE", variant: "own link", expect: WRITE,
    request: async (f, role) => ({ params: { id: f.shortlistId, linkId: await f.freshLink(selfOf(f, role)) } }),
  },
  {
    route: "shortlists/[id]/links/[linkId]", method: "DELETE", variant: "a link another editor made", expect: { ...WRITE, editor: 403 },
    request: async (f) => ({ params: { id: f.shortlistId, linkId: await f.freshLink(f.editor2) } }),
  },
  // Share view: the token alone decides; members without a link are strangers to it.
  { route: "share/[token]", method: "GET", expect: token("ok", "ok"), request: (f, role) => ({ params: { token: f.token(role) } }) },
  { route: "share/[token]/comments", method: "GET", expect: token("ok", "ok"), request: (f, role) => ({ params: { token: f.token(role) } }) },
  {
    route: "share/[token]/comments", method: "POST", expect: token(403, "ok"),
    request: (f, role) => ({ params: { token: f.token(role) }, body: { name: "Outside Reviewer", body: `guest ${f.seq()}` } }),
  },
];

/** Server actions ("use server"), by "file#export": none exist; a new one must get a row here. */
const SERVER_ACTIONS: Record<string, Cells> = {};

const rowKey = (r: { route: string; method: string }) => `${r.route} ${r.method}`;

let f: Fixture;
let routes: Awaited<ReturnType<typeof discoverRoutes>>;
beforeAll(async () => {
  f = await createFixture();
  routes = await discoverRoutes();
}, 120_000);
afterAll(async () => f?.db.cleanup());

function clearLimits() {
  for (const l of [commentPosts, shareTokenFailures, shareTokenRequests, signInFailuresByAccount, signInFailuresByIp]) l.clear();
}

describe("authorisation matrix", () => {
  it("has a row for every route handler and method, and no row without one", () => {
    const discovered = new Set(routes.flatMap((r) => r.methods.map((m) => `${r.key} ${m}`)));
    const covered = new Set(ROWS.map(rowKey));
    const missing = [...discovered].filter((k) => !covered.has(k));
    const stale = [...covered].filter((k) => !discovered.has(k));
    expect(missing, "route handlers without a matrix row").toEqual([]);
    expect(stale, "matrix rows without a route handler").toEqual([]);
    expect(discovered.size).toBeGreaterThanOrEqual(40);
  });

  it("has a row for every server action", () => {
    const found = discoverServerActions().map((a) => `${a.file}#${a.name}`);
    expect(found.filter((k) => !(k in SERVER_ACTIONS)), "server actions without a matrix row").toEqual([]);
  });

  for (const row of ROWS) {
    it(`${rowKey(row)}${row.variant ? ` (${row.variant})` : ""}`, async () => {
      const mod = routes.find((r) => r.key === row.route)?.module;
      const handler = mod?.[row.method] as Parameters<typeof call>[0] | undefined;
      expect(handler, `no ${row.method} handler in app/api/${row.route}/route.ts`).toBeTypeOf("function");
      const failures: string[] = [];
      for (const role of ROLES) {
        clearLimits();
        const req = (await row.request?.(f, role)) ?? {};
        const cookie = req.cookie ?? f.cookie(role);
        const path = `/api/${row.route.replace(/\[(\w+)\]/g, (_, p: string) => encodeURIComponent(req.params?.[p] ?? p))}`;
        const r = await call(handler!, path, { method: row.method, cookie, params: req.params, body: req.body, query: req.query });
        const want = row.expect[role];
        const ok = want === "ok" ? r.status >= 200 && r.status < 300 : r.status === want && checkDenial(r.body, want);
        if (!ok) failures.push(`${role}: expected ${want}, got ${r.status} ${JSON.stringify(r.body as Body).slice(0, 200)}`);
      }
      expect(failures).toEqual([]);
    });
  }
});

/** A denial carries the contract's error code, and a 404 on a share route never names the shortlist. */
function checkDenial(body: Body, status: 401 | 403 | 404): boolean {
  const code = { 401: "unauthenticated", 403: "forbidden", 404: "not-found" }[status];
  if (body?.error?.code !== code) return false;
  return !JSON.stringify(body).includes(f.shortlistId) || status !== 404;
}
