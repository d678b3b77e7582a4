import type { Role } from "@/lib/db/users";

/** The signed-in user as the server sees it. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

export type Action =
  | "arm:read"
  | "arm:write"
  | "req:read"
  | "req:write"
  | "user:admin"
  | "shortlist:read"
  | "shortlist:write"
  | "comment:write"
  | "share:manage"
  | "audit:read";

/** Which roles may do what. The one place that decides; every route handler asks `can()`. */
const GRANTS: Record<Action, readonly Role[]> = {
  "arm:read": ["admin", "editor", "viewer"],
  "arm:write": ["admin", "editor"],
  "req:read": ["admin", "editor", "viewer"],
  "req:write": ["admin", "editor"],
  "user:admin": ["admin"],
  "shortlist:read": ["admin", "editor", "viewer"],
  "shortlist:write": ["admin", "editor"],
  "comment:write": ["admin", "editor", "viewer"],
  "share:manage": ["admin", "editor"],
  "audit:read": ["admin"],
};

export function can(user: SessionUser | null | undefined, action: Action): boolean {
  if (!user) return false;
  return GRANTS[action].includes(user.role);
}
