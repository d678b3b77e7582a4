import { ApiError } from "./errors";
import { forwardedHost } from "./forwarded";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Refuses a state-changing request whose Origin header is present and names another host than
 * the one addressed (Host, or X-Forwarded-Host from a trusted proxy). Browsers send Origin on
 * cross-site POST/PUT/PATCH/DELETE, so this blocks cross-site request forgery.
 */
export function checkOrigin(req: Request): void {
  if (SAFE_METHODS.has(req.method.toUpperCase())) return;
  const origin = req.headers.get("origin");
  if (origin === null) return;
  let originHost: string;
  try {
    originHost = new URL(origin).host.toLowerCase();
  } catch {
    throw new ApiError(403, "forbidden", `request origin ${JSON.stringify(origin.slice(0, 100))} is not this site`);
  }
  const hosts = [req.headers.get("host") ?? new URL(req.url).host, forwardedHost(req)]
    .filter((h): h is string => Boolean(h))
    .map((h) => h.trim().toLowerCase());
  if (!originHost || !hosts.includes(originHost)) {
    throw new ApiError(403, "forbidden", `request origin ${origin.slice(0, 100)} is not this site`);
  }
}
