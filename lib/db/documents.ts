import "server-only";
import type { z } from "zod";
import { toFieldErrors } from "@/shared/schemas";

/** Parses and re-validates a stored document on the way out; a failure is a server defect. */
export function readStoredDocument<S extends z.ZodType>(schema: S, json: string, what: string): z.output<S> {
  const r = schema.safeParse(JSON.parse(json));
  if (!r.success) {
    const first = toFieldErrors(r.error)[0];
    throw new Error(`stored ${what} does not validate: ${first?.path ?? ""} ${first?.message ?? ""}`);
  }
  return r.data;
}

/** Author of a revision or last editor, as shown next to it. */
export interface UserRef {
  id: string;
  name: string;
}

export const userRef = (u: { id: string; name: string } | null | undefined): UserRef | null =>
  u ? { id: u.id, name: u.name } : null;

/** Prisma error code for a unique-constraint violation. */
export function isUniqueViolation(err: unknown): boolean {
  return typeof err === "object" && err !== null && (err as { code?: unknown }).code === "P2002";
}

export type DeletedFilter = "exclude" | "include" | "only";

export function deletedWhere(deleted: DeletedFilter = "exclude"): { deletedAt?: null | { not: null } } {
  if (deleted === "include") return {};
  if (deleted === "only") return { deletedAt: { not: null } };
  return { deletedAt: null };
}
