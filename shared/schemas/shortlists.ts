import { z } from "zod";
import { SUB_SCORES } from "@/shared/sub-scores";
import { nameText } from "./common";
import { weightsSchema, type Weights } from "./requirements";

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
export type CreateShortlistInput = z.output<typeof createShortlistInput>;

/** The query of a shortlist export: format, table (CSV), run (default: latest finished) and weights. */
export const exportQuery = z.object({
  format: z.enum(["csv", "xlsx", "json"], { error: "must be csv, xlsx or json" }),
  table: z.enum(["ranking", "compliance", "cycle", "placement"], { error: "must be ranking, compliance, cycle or placement" }).optional(),
  run: z.string().min(1).max(100).optional(),
  weights: z.string().max(300).optional(),
});

/**
 * The `weights` query parameter, `coverage:4,dexterity:2,…`, over the stored weights `base`
 * (keys not named keep their stored value); an unknown key or a missing value is a field error.
 */
export const weightsParam = (base: Weights) =>
  z
    .string()
    .transform((text, ctx) => {
      const out: Record<string, unknown> = { ...base };
      for (const part of text.split(",").filter(Boolean)) {
        const [k, v] = part.split(":");
        if (!(SUB_SCORES.keys as readonly string[]).includes(k)) {
          ctx.addIssue({ code: "custom", message: `unknown weight ${JSON.stringify(k.slice(0, 40))}; use ${SUB_SCORES.keys.join(", ")}` });
          return z.NEVER;
        }
        out[k] = v !== undefined && v.trim() !== "" ? Number(v) : NaN;
      }
      return out;
    })
    .pipe(weightsSchema);

/** The query of one arm's 3-D view data in a run: the arm's id. */
export const runViewQuery = z.object({ arm: z.string({ error: "must name an arm of the run" }).min(1, "must name an arm of the run").max(100) });
