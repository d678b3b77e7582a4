import type { FieldError } from "@/shared/schemas/common";

/** Error body of the JSON API (docs/design.md#application). */
interface ApiErrorBody {
  code: string;
  message: string;
  fieldErrors?: FieldError[];
  conflict?: {
    baseRevision: number;
    currentRevision: number;
    current: unknown;
    changes: { path: string; base: unknown; current: unknown }[];
  };
}

type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiErrorBody };

/** Sends JSON to the API and returns the parsed body or the API's error object; never throws. */
export async function api<T>(url: string, method: string, body?: unknown): Promise<ApiResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers: body === undefined ? undefined : { "content-type": "application/json" },
      body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body),
      cache: "no-store",
    });
  } catch {
    return { ok: false, status: 0, error: { code: "network", message: "The server could not be reached. Nothing was saved; try again." } };
  }
  const text = await res.text();
  let parsed: unknown = undefined;
  if (text) {
    try {
      parsed = JSON.parse(text);
    } catch {
      parsed = undefined;
    }
  }
  if (res.ok) return { ok: true, status: res.status, data: parsed as T };
  const err = (parsed as { error?: ApiErrorBody } | undefined)?.error;
  return {
    ok: false,
    status: res.status,
    error: err && typeof err.message === "string" ? err : { code: String(res.status), message: `The server answered ${res.status} ${res.statusText}.` },
  };
}

/** Groups field errors by dotted path. */
export function byPath(errors: FieldError[] | undefined): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const e of errors ?? []) (out[e.path] ??= []).push(e.message);
  return out;
}
