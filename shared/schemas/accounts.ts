import { z } from "zod";
import { nameText } from "./common";
import { ROLES } from "./roles";

/** Sign-up: email, display name and password. */
export const signUpInput = z.object({
  email: z.email({ error: "must be an email address" }).max(254, "must be at most 254 characters"),
  name: nameText(80),
  password: z.string({ error: "must be text" }).min(10, "must be at least 10 characters").max(1024, "must be at most 1024 characters"),
});

/** Sign-in: email and password (checked against the stored hash, never described). */
export const signInInput = z.object({
  email: z.string({ error: "must be text" }).min(1, "must not be empty").max(254),
  password: z.string({ error: "must be text" }).min(1, "must not be empty").max(1024),
});

/** An administrator's change of a member's role. */
export const roleInput = z.object({ role: z.enum(ROLES, { error: "must be admin, editor or viewer" }) });
