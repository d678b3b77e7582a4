/**
 * Comments of a shortlist's discussion: what a body may hold, what a comment can be anchored to,
 * and the inputs of posting, editing and resolving.
 */
import { z } from "zod";
import { cleanName } from "@/shared/text";

/** Longest comment body accepted (characters of Markdown source). */
export const MAX_COMMENT_LENGTH = 5000;

/**
 * Deepest nesting of quotes and lists written on one line that a comment may use. The parser
 * recurses once per level; a few thousand `> ` markers exhaust the stack, and no discussion needs
 * more than a handful of levels.
 */
export const MAX_NESTING = 16;

const LIST_MARKER = /^(?:[-*+]|\d{1,9}[.)])(?=[ \t]|$)/;

/**
 * The deepest run of block-container markers (`>` quotes and `-`, `*`, `+`, `1.` list items)
 * opening any line of a Markdown source, outside fenced code. Stops counting past `stopAt`.
 */
export function nestingDepth(source: string, stopAt = MAX_NESTING + 1): number {
  let max = 0;
  let fence: string | null = null;
  for (const line of source.split(/\r\n|\r|\n/)) {
    const fenceMark = /^ {0,3}(`{3,}|~{3,})/.exec(line)?.[1];
    if (fence !== null) {
      if (fenceMark && fenceMark[0] === fence[0] && fenceMark.length >= fence.length) fence = null;
      continue;
    }
    if (fenceMark) {
      fence = fenceMark;
      continue;
    }
    let depth = 0;
    let rest = line;
    for (;;) {
      rest = rest.replace(/^[ \t]+/, "");
      if (rest.startsWith(">")) rest = rest.slice(1);
      else {
        const m = LIST_MARKER.exec(rest);
        if (!m) break;
        rest = rest.slice(m[0].length);
      }
      depth++;
      if (depth >= stopAt) return depth;
    }
    if (depth > max) max = depth;
  }
  return max;
}

/** Why a body cannot be stored, or null: nesting deeper than MAX_NESTING. */
export function nestingProblem(source: string): string | null {
  const depth = nestingDepth(source);
  return depth > MAX_NESTING
    ? `quotes and lists are nested more than ${MAX_NESTING} levels deep on one line; use at most ${MAX_NESTING}`
    : null;
}

const ANCHOR_TYPES = ["shortlist", "arm", "target", "path", "compliance"] as const;
export type AnchorType = (typeof ANCHOR_TYPES)[number];
export interface Anchor {
  type: AnchorType;
  /** arm id, target or path name, or `armId#specIndex` for a compliance row; absent for the shortlist. */
  id?: string | null;
}

const MAX_DISPLAY_NAME = 60;

const bodySchema = z
  .string({ error: "must be text" })
  .max(MAX_COMMENT_LENGTH, `must be at most ${MAX_COMMENT_LENGTH} characters`)
  .refine((s) => s.trim().length > 0, "must not be empty")
  .superRefine((s, ctx) => {
    const problem = nestingProblem(s);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });

export const createCommentInput = z.object({
  body: bodySchema,
  anchor: z
    .object({
      type: z.enum(ANCHOR_TYPES, { error: `must be one of ${ANCHOR_TYPES.join(", ")}` }),
      id: z.string({ error: "must be text" }).min(1, "must not be empty").max(200, "must be at most 200 characters").nullable().optional(),
    })
    .optional(),
  parentId: z.string({ error: "must be a comment id" }).min(1).max(100).optional(),
  /** Client-chosen key that makes a retried post idempotent. */
  clientKey: z.string({ error: "must be text" }).regex(/^[A-Za-z0-9_-]{8,64}$/, "must be 8–64 letters, digits, - or _").optional(),
});

export type CreateCommentInput = z.output<typeof createCommentInput>;

export const editCommentInput = z.object({
  body: bodySchema,
  /** The revision the edit is based on; a stale base is a conflict. */
  baseRevision: z.number({ error: "must be the revision your edit is based on" }).int().min(1).optional(),
});

export type EditCommentInput = z.output<typeof editCommentInput>;

const displayNameSchema = z
  .string({ error: "must be text" })
  .transform(cleanName)
  .pipe(z.string().min(1, "give a display name").max(MAX_DISPLAY_NAME, `must be at most ${MAX_DISPLAY_NAME} characters`));


/** Resolving (true) or reopening (false) a thread. */
export const resolveCommentInput = z.object({ resolved: z.boolean({ error: "must be true (resolve) or false (reopen)" }) });

/** A link guest's post: a display name beside the comment fields. */
export const guestCommentInput = createCommentInput.extend({ name: z.string({ error: "give a display name" }).pipe(displayNameSchema) });
