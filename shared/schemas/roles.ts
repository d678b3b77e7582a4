/** Member roles, most to least privileged; what each may do is decided in lib/auth/permissions.ts. */
export const ROLES = ["admin", "editor", "viewer"] as const;
export type Role = (typeof ROLES)[number];

/** What a share link lets its guest do. */
export const LINK_ACCESS = ["view", "comment"] as const;
export type LinkAccess = (typeof LINK_ACCESS)[number];
