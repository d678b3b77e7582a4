/** Liveness check: the server answers. */
export function health(): Response {
  return Response.json({ ok: true }, { headers: { "cache-control": "no-store" } });
}
