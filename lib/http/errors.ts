import type { FieldError } from "@/shared/schemas";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/db";

type ErrorCode = "validation" | "bad-json" | "unauthenticated" | "forbidden" | "not-found" | "conflict" | "rate-limited" | "unsupported-media-type";

/** An error that becomes a JSON error response: `{ error: { code, message, fieldErrors?, conflict? } }`. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly extra: { fieldErrors?: FieldError[]; conflict?: unknown; headers?: Record<string, string> } = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

export const badRequest = (fieldErrors: FieldError[], message = "the request is not valid") =>
  new ApiError(400, "validation", message, { fieldErrors });
export const unauthenticated = () => new ApiError(401, "unauthenticated", "sign in first");
export const forbidden = (message = "your role does not allow this") => new ApiError(403, "forbidden", message);
export const notFound = (message: string) => new ApiError(404, "not-found", message);

function errorBody(code: ErrorCode, message: string, extra: { fieldErrors?: FieldError[]; conflict?: unknown } = {}) {
  return { error: { code, message, ...(extra.fieldErrors ? { fieldErrors: extra.fieldErrors } : {}), ...(extra.conflict ? { conflict: extra.conflict } : {}) } };
}

/** Maps a thrown error to a response; anything unexpected is logged and answered with a plain 500. */
export function errorResponse(err: unknown): Response {
  if (err instanceof ApiError) {
    return Response.json(errorBody(err.code, err.message, err.extra), { status: err.status, headers: err.extra.headers });
  }
  if (err instanceof ValidationError) {
    return Response.json(errorBody("validation", err.message, { fieldErrors: err.fieldErrors }), { status: 400 });
  }
  if (err instanceof NotFoundError) {
    return Response.json(errorBody("not-found", err.message), { status: 404 });
  }
  if (err instanceof ConflictError) {
    const conflict = { baseRevision: err.baseRevision, currentRevision: err.currentRevision, current: err.current, changes: err.changes };
    return Response.json(errorBody("conflict", err.message, { conflict }), { status: 409 });
  }
  console.error("[api] unexpected error:", err);
  return Response.json({ error: { code: "internal", message: "internal error; the server log has the details" } }, { status: 500 });
}
