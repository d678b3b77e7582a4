/**
 * Where to go after signing in: `next` resolved against the app's own origin with the URL
 * parser (as the browser will resolve it), followed only when the result is on that origin.
 * Returns an absolute URL, so a path the browser would read as another host (`/\evil.test`,
 * `/.//evil.test`, a tab inside `//`) can never slip through as a relative one.
 */
export function safeNextUrl(next: string | null | undefined, origin: string, fallback = "/arms"): string {
  const home = new URL(origin).origin;
  const fallbackUrl = new URL(fallback, home).href;
  if (!next) return fallbackUrl;
  let url: URL;
  try {
    url = new URL(next, home);
  } catch {
    return fallbackUrl;
  }
  return url.origin === home && (url.protocol === "http:" || url.protocol === "https:") ? url.href : fallbackUrl;
}
