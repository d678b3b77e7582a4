import { z } from "zod";

/** The list query of arms and requirement sets: whether deleted ones are left out, shown too, or shown alone. */
export const documentListQuery = z.object({
  deleted: z.enum(["exclude", "include", "only"], { error: "must be include, only or exclude" }).optional(),
});

/** A save of a revisioned document: the revision it is based on and the document under its key. */
export function documentUpdateInput<K extends string, D>(key: K, schema: z.ZodType<D>) {
  return z.object({
    baseRevision: z.number({ error: "must be the revision number your edit is based on" }).int("must be an integer").min(1, "must be ≥ 1"),
    [key]: schema,
  });
}
