import type { z } from "zod";
import type { ExportFile } from "@/lib/export/files";
import { toFieldErrors } from "@/shared/schemas";
import { can, type Action, type SessionUser } from "@/lib/auth/permissions";
import { getRequestUser } from "@/lib/auth/session";
import { ApiError, badRequest, errorResponse, forbidden, unauthenticated } from "./errors";
import { checkOrigin } from "./origin";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);
/** Content types a page on another site can send without a preflight (HTML forms, text/plain). */
const SIMPLE_TYPES = new Set(["text/plain", "application/x-www-form-urlencoded", "multipart/form-data"]);

/**
 * Refuses a state-changing request whose body is typed as form data or plain text: the API
 * takes JSON only, and these are the types a cross-site form can send (defence in depth beside
 * the origin check). A request without a body and without a content type passes.
 */
function checkContentType(req: Request): void {
  if (SAFE_METHODS.has(req.method.toUpperCase())) return;
  const type = req.headers.get("content-type")?.split(";")[0].trim().toLowerCase();
  if (type && SIMPLE_TYPES.has(type)) {
    const message = `request body is sent as ${type}; send it as application/json`;
    throw new ApiError(415, "unsupported-media-type", message, { fieldErrors: [{ path: "", message }] });
  }
}

/** Context Next passes to a dynamic route handler. */
export interface RouteContext<P extends Record<string, string> = Record<string, string>> {
  params: Promise<P>;
}

/**
 * Wraps a route handler: refuses cross-origin state changes and form or plain-text bodies, turns thrown errors into JSON error
 * responses (never a 500 for bad input), and marks responses as not cacheable.
 */
export function route<P extends Record<string, string>>(
  handler: (req: Request, ctx: RouteContext<P>) => Promise<Response>,
): (req: Request, ctx: RouteContext<P>) => Promise<Response> {
  return async (req, ctx) => {
    let res: Response;
    try {
      checkOrigin(req);
      checkContentType(req);
      res = await handler(req, ctx);
    } catch (err) {
      res = errorResponse(err);
    }
    if (!res.headers.has("cache-control")) res.headers.set("cache-control", "no-store");
    return res;
  };
}

/** The signed-in user allowed to do `action`: 401 without a session, 403 when the role may not. */
export async function requireUser(req: Request, action: Action): Promise<SessionUser> {
  const user = await getRequestUser(req);
  if (!user) throw unauthenticated();
  if (!can(user, action)) throw forbidden(`your role (${user.role}) does not allow ${action}`);
  return user;
}

/** Validates with a zod schema; errors become a 400 with field paths (optionally prefixed). */
export function parseWith<S extends z.ZodType>(schema: S, value: unknown, prefix?: string): z.output<S> {
  const r = schema.safeParse(value);
  if (!r.success) {
    const errors = toFieldErrors(r.error).map((e) => ({ ...e, path: prefix ? (e.path ? `${prefix}.${e.path}` : prefix) : e.path }));
    throw badRequest(errors);
  }
  return r.data;
}

/** JSON response with a status. */
export const json = (data: unknown, status = 200, headers?: Record<string, string>): Response =>
  Response.json(data, { status, headers });

/** An export as an attachment; `headers` adds to the content type and disposition. */
export const download = (file: ExportFile, headers: Record<string, string> = {}): Response =>
  new Response(file.body, {
    status: 200,
    headers: { "content-type": file.contentType, "content-disposition": `attachment; filename="${file.fileName}"`, ...headers },
  });

export { ApiError };
