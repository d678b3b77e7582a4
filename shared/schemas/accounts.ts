import { z } from "zod";
import { nameText } from "./common";
import { ROLES, SIGN_UP_MODES } from "./roles";

/** Longest password accepted (the password policy of lib/auth checks the rest). */
export const MAX_PASSWORD_LENGTH = 1024;
const newPassword = z.string({ error: "must be text" }).max(MAX_PASSWORD_LENGTH, `must be at most ${MAX_PASSWORD_LENGTH} characters`);

/**
 * Sign-up: email, display name, password (its length, content and context are checked by the
 * password policy), and the token of an invitation link when there is one.
 */
export const signUpInput = z.object({
  email: z.email({ error: "must be an email address" }).max(254, "must be at most 254 characters"),
  name: nameText(80),
  password: newPassword,
  invitation: z.string({ error: "must be the invitation's token" }).max(200).nullable().optional(),
});

/** One's own password change: the current password and the new one (policy-checked). */
export const passwordChangeInput = z.object({
  currentPassword: z.string({ error: "must be text" }).min(1, "give your current password").max(MAX_PASSWORD_LENGTH),
  newPassword,
});

/** An administrator's decision on an account that waits for approval. */
export const approvalInput = z.object({ decision: z.enum(["approve", "refuse"], { error: "must be approve or refuse" }) });

/** The sign-up mode an administrator sets. */
export const signUpModeInput = z.object({ mode: z.enum(SIGN_UP_MODES, { error: "must be open, approval or invitation" }) });

/** Days an invitation works unless the administrator says otherwise, and at most. */
export const DEFAULT_INVITATION_DAYS = 7;
const MAX_INVITATION_DAYS = 90;

/** An invitation: optionally bound to one email, the role of the account it creates, days it works. */
export const createInvitationInput = z.object({
  email: z.email({ error: "must be an email address" }).max(254, "must be at most 254 characters").nullable().optional(),
  role: z.enum(ROLES, { error: "must be admin, editor or viewer" }).default("viewer"),
  expiresInDays: z.number({ error: "must be a number of days" }).int("must be a whole number of days").min(1, "must be at least 1 day").max(MAX_INVITATION_DAYS, `must be at most ${MAX_INVITATION_DAYS} days`).optional(),
});

/** Sign-in: email and password (checked against the stored hash, never described). */
export const signInInput = z.object({
  email: z.string({ error: "must be text" }).min(1, "must not be empty").max(254),
  password: z.string({ error: "must be text" }).min(1, "must not be empty").max(1024),
});

/** An administrator's change of a member's role. */
export const roleInput = z.object({ role: z.enum(ROLES, { error: "must be admin, editor or viewer" }) });
