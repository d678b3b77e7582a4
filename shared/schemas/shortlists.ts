import { z } from "zod";
import { nameText } from "./common";

/** A new shortlist: a name, the requirement set and the arms (their current revisions are pinned). */
export const createShortlistInput = z.object({
  name: nameText(120),
  requirementSetId: z.string({ error: "choose a requirement set" }).min(1, "choose a requirement set"),
  armIds: z
    .array(z.string().min(1), { error: "must be a list of arm ids" })
    .min(1, "choose at least one arm")
    .max(40, "at most 40 arms per shortlist")
    .refine((ids) => new Set(ids).size === ids.length, "an arm is listed twice"),
});
export type CreateShortlistInput = z.input<typeof createShortlistInput>;

/** The query of a shortlist export: format, table (CSV), run (default: latest finished) and weights. */
export const exportQuery = z.object({
  format: z.enum(["csv", "xlsx", "json"], { error: "must be csv, xlsx or json" }),
  table: z.enum(["ranking", "compliance"], { error: "must be ranking or compliance" }).optional(),
  run: z.string().min(1).max(100).optional(),
  weights: z.string().max(300).optional(),
});
