export const dynamic = "force-dynamic";

/** Liveness check: the server answers. */
export function GET(): Response {
  return Response.json({ ok: true }, { headers: { "cache-control": "no-store" } });
}
