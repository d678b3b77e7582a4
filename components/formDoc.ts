/**
 * What the document forms share once a form is turned into a document: the check with the shared
 * schema and the wording of error messages.
 */
import type { z } from "zod";
import { toFieldErrors, type FieldError } from "@/shared/schemas";

/**
 * The form's document checked with the shared schema, once the form's own (not-a-number) errors
 * are gone; the document is returned as built either way.
 */
export function checkFormDoc<D>(schema: z.ZodType, built: { doc: D; errors: FieldError[] }): { doc: D; errors: FieldError[] } {
  const { doc, errors } = built;
  if (errors.length) return { doc, errors };
  const r = schema.safeParse(doc);
  return { doc, errors: r.success ? [] : toFieldErrors(r.error) };
}

/** "label: message" unless the message already names the field. */
export function describeError(e: FieldError, label: (path: string) => string): string {
  const l = label(e.path);
  return e.message.toLowerCase().startsWith(l.toLowerCase()) || /^(joint|row|wrist|target|path|spec|base|tool|sequence) /i.test(e.message) ? e.message : `${l}: ${e.message}`;
}
