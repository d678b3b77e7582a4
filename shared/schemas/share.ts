import { z } from "zod";
import { labelText } from "./common";
import { LINK_ACCESS } from "./roles";

/** Longest expiry a link may be given. */
const MAX_LINK_DAYS = 366;

/** A new share link of a shortlist. */
export const createLinkInput = z.object({
  access: z.enum(LINK_ACCESS, { error: "must be view or comment" }),
  label: labelText(80).optional(),
  /** Days until the link stops working; omitted or null = no expiry. */
  expiresInDays: z.number({ error: "must be a number of days" }).int("must be a whole number of days").min(1, "must be at least 1 day").max(MAX_LINK_DAYS, `must be at most ${MAX_LINK_DAYS} days`).nullable().optional(),
  hidePrices: z.boolean({ error: "must be true or false" }).optional(),
});
export type CreateLinkInput = z.output<typeof createLinkInput>;
