/** Member roles, most to least privileged; what each may do is decided in lib/auth/permissions.ts. */
export const ROLES = ["admin", "editor", "viewer"] as const;
export type Role = (typeof ROLES)[number];

/** What a share link lets its guest do. */
export const LINK_ACCESS = ["view", "comment"] as const;
export type LinkAccess = (typeof LINK_ACCESS)[number];

/**
 * How new accounts come in (an administrator's setting): open (anyone who reaches the server
 * gets a viewer account), approval (the default: new accounts wait until an administrator
 * approves them), invitation (only with an invitation an administrator made).
 */
export const SIGN_UP_MODES = ["open", "approval", "invitation"] as const;
export type SignUpMode = (typeof SIGN_UP_MODES)[number];
export const DEFAULT_SIGN_UP_MODE: SignUpMode = "approval";

/** An account is active, waits for an administrator's approval, or was refused (neither can sign in). */
export const USER_STATUSES = ["active", "pending", "refused"] as const;
export type UserStatus = (typeof USER_STATUSES)[number];
