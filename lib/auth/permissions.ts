import type { LinkAccess, Role } from "@/shared/schemas/roles";

/** The signed-in user as the server sees it. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

/**
 * A visitor holding a valid (known, unexpired, unrevoked) share link. A guest has no account;
 * everything it may do is bounded by the link: one shortlist, view or comment access.
 */
export interface LinkGuest {
  kind: "link";
  linkId: string;
  shortlistId: string;
  access: LinkAccess;
  hidePrices: boolean;
}

/** Whoever asks: a member, a link guest, or nobody (null = anonymous). */
type Principal = SessionUser | LinkGuest;

export type Action =
  | "arm:read"
  | "arm:write"
  | "req:read"
  | "req:write"
  | "user:admin"
  | "shortlist:read"
  | "shortlist:write"
  | "comment:read"
  | "comment:write"
  | "comment:edit"
  | "comment:delete"
  | "comment:resolve"
  | "share:manage"
  | "share:revoke"
  | "price:read"
  | "audit:read"
  | "comment:read-deleted"
  | "account:manage";

/** What an action is about, for the decisions that depend on it (owner, shortlist). */
interface Resource {
  /** The shortlist the action touches; a link guest is confined to its own. */
  shortlistId?: string;
  /** The account that made the thing (comment author, link creator); null for a guest's comment. */
  ownerId?: string | null;
}

/** Which member roles may do what. */
const GRANTS: Record<Action, readonly Role[]> = {
  "arm:read": ["admin", "editor", "viewer"],
  "arm:write": ["admin", "editor"],
  "req:read": ["admin", "editor", "viewer"],
  "req:write": ["admin", "editor"],
  "user:admin": ["admin"],
  "shortlist:read": ["admin", "editor", "viewer"],
  "shortlist:write": ["admin", "editor"],
  "comment:read": ["admin", "editor", "viewer"],
  "comment:write": ["admin", "editor", "viewer"],
  // Own comments only (see OWN_ONLY); an admin may also delete anyone's (moderation).
  "comment:edit": ["admin", "editor", "viewer"],
  "comment:delete": ["admin", "editor", "viewer"],
  "comment:resolve": ["admin", "editor", "viewer"],
  "share:manage": ["admin", "editor"],
  // An editor revokes the links they made; an admin any link.
  "share:revoke": ["admin", "editor"],
  "price:read": ["admin", "editor", "viewer"],
  "audit:read": ["admin"],
  // The text of a deleted comment (its revisions), like the audit trail: admins only.
  "comment:read-deleted": ["admin"],
  // One's own account: password change, signing out one's other sessions.
  "account:manage": ["admin", "editor", "viewer"],
};

/** Actions on a thing that a member may do only to their own, unless the role is listed. */
const OWN_ONLY: Partial<Record<Action, readonly Role[]>> = {
  "comment:edit": [],
  "comment:delete": ["admin"],
  "share:revoke": ["admin"],
};

/** What a link guest may do, by the link's access; always confined to the link's shortlist. */
const GUEST_GRANTS: Record<LinkGuest["access"], readonly Action[]> = {
  view: ["shortlist:read", "comment:read", "price:read"],
  comment: ["shortlist:read", "comment:read", "comment:write", "price:read"],
};

const isLinkGuest = (p: Principal | null | undefined): p is LinkGuest =>
  typeof p === "object" && p !== null && (p as LinkGuest).kind === "link";

/**
 * The one place that decides who may do what: every route handler and page asks `can()`.
 * - anonymous (null): nothing (signing in and up is open and needs no decision);
 * - a member: by role (GRANTS), and for OWN_ONLY actions only on their own thing unless the role
 *   is exempt;
 * - a link guest: what its link grants (GUEST_GRANTS), only on the link's shortlist, never prices
 *   when the link hides them, never edits, deletes, resolves or link management.
 */
export function can(principal: Principal | null | undefined, action: Action, resource: Resource = {}): boolean {
  if (!principal) return false;
  if (isLinkGuest(principal)) {
    if (resource.shortlistId !== undefined && resource.shortlistId !== principal.shortlistId) return false;
    if (action === "price:read" && principal.hidePrices) return false;
    return GUEST_GRANTS[principal.access].includes(action);
  }
  if (!GRANTS[action].includes(principal.role)) return false;
  const exempt = OWN_ONLY[action];
  if (exempt && resource.ownerId !== undefined && !exempt.includes(principal.role)) {
    return resource.ownerId !== null && resource.ownerId === principal.id;
  }
  return true;
}
