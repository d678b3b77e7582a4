// Calls route handlers directly with real Request objects (the database behind them is real).
import { expect } from "vitest";


export interface CallOptions {
  method?: string;
  /** Object → JSON.stringify; string → sent as is. */
  body?: unknown;
  cookie?: string;
  params?: Record<string, string>;
  headers?: Record<string, string>;
  query?: string;
}

export const BASE = "http://localhost:3000";

// Response bodies are inspected loosely in tests.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Body = any;

type Handler = (req: Request, ctx: { params: Promise<Body> }) => Response | Promise<Response>;

export async function call(handler: Handler, path: string, opts: CallOptions = {}): Promise<{ status: number; body: Body; res: Response }> {
  const headers: Record<string, string> = { host: "localhost:3000", ...opts.headers };
  if (opts.cookie) headers.cookie = opts.cookie;
  let body: string | undefined;
  if (opts.body !== undefined) {
    body = typeof opts.body === "string" ? opts.body : JSON.stringify(opts.body);
    headers["content-type"] ??= "application/json";
  }
  const req = new Request(`${BASE}${path}${opts.query ?? ""}`, { method: opts.method ?? (body === undefined ? "GET" : "POST"), headers, body });
  const res = await handler(req, { params: Promise.resolve(opts.params ?? {}) });
  const text = await res.text();
  let parsed: unknown = text;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    // not JSON: keep the text
  }
  return { status: res.status, body: parsed, res };
}

/** The `armsift_session=…` pair from a Set-Cookie header. */
export function sessionCookieOf(res: Response): string {
  const set = res.headers.get("set-cookie") ?? "";
  const m = /armsift_session=([^;]*)/.exec(set);
  expect(m, `no session cookie in ${set}`).not.toBeNull();
  return `armsift_session=${m![1]}`;
}

/** Asserts a 400 whose field errors include one at `path` (message matching `message` if given). */
export function expectFieldError(r: { status: number; body: Body }, path: string, message?: RegExp): void {
  expect(r.status, JSON.stringify(r.body).slice(0, 400)).toBe(400);
  const errors: { path: string; message: string }[] = r.body?.error?.fieldErrors ?? [];
  const hit = errors.find((e) => e.path === path);
  expect(hit, `no field error at "${path}" in ${JSON.stringify(errors).slice(0, 400)}`).toBeDefined();
  if (message) expect(hit!.message).toMatch(message);
}
