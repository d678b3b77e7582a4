import "server-only";
import type { FieldError } from "@/shared/schemas";

/** One difference between two JSON documents, by dotted path ("joints.2.max"). Absent = null. */
export interface Change {
  path: string;
  base: unknown;
  current: unknown;
}

/** Input failed validation; each error names the field by dotted path. */
export class ValidationError extends Error {
  readonly fieldErrors: FieldError[];
  constructor(fieldErrors: FieldError[], message = "the input is not valid") {
    super(message);
    this.name = "ValidationError";
    this.fieldErrors = fieldErrors;
  }
}

export class NotFoundError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "NotFoundError";
  }
}

/**
 * An update was based on a revision that is no longer the current one. Carries the current
 * document and what others changed between the base revision and the current one.
 */
export class ConflictError<D = unknown> extends Error {
  readonly baseRevision: number;
  readonly currentRevision: number;
  readonly current: D;
  readonly changes: Change[];
  constructor(args: { message: string; baseRevision: number; currentRevision: number; current: D; changes: Change[] }) {
    super(args.message);
    this.name = "ConflictError";
    this.baseRevision = args.baseRevision;
    this.currentRevision = args.currentRevision;
    this.current = args.current;
    this.changes = args.changes;
  }
}
