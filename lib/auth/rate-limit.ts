/**
 * In-memory sliding-window counter (per process; resets on restart, not shared between
 * processes). Used for sign-in failures: enough against password guessing on a single server.
 */
export class SlidingWindowLimiter {
  private readonly hits = new Map<string, number[]>();
  constructor(
    readonly limit: number,
    readonly windowMs: number,
    private readonly now: () => number = Date.now,
  ) {}

  private live(key: string): number[] {
    const t = this.now();
    const list = (this.hits.get(key) ?? []).filter((at) => at > t - this.windowMs);
    if (list.length === 0) this.hits.delete(key);
    else this.hits.set(key, list);
    return list;
  }

  /** Milliseconds until the key may try again; 0 when it is below the limit. */
  retryAfterMs(key: string): number {
    const list = this.live(key);
    if (list.length < this.limit) return 0;
    return Math.max(1, list[list.length - this.limit] + this.windowMs - this.now());
  }

  record(key: string): void {
    const list = this.live(key);
    list.push(this.now());
    this.hits.set(key, list);
    if (this.hits.size > 10_000) this.sweep();
  }

  reset(key: string): void {
    this.hits.delete(key);
  }

  clear(): void {
    this.hits.clear();
  }

  private sweep(): void {
    for (const key of [...this.hits.keys()]) this.live(key);
  }
}

/** Sign-in: at most 5 failures per email and 20 per client address in any 15 minutes. */
export const SIGNIN_WINDOW_MS = 15 * 60 * 1000;
export const signInFailuresByEmail = new SlidingWindowLimiter(5, SIGNIN_WINDOW_MS);
export const signInFailuresByIp = new SlidingWindowLimiter(20, SIGNIN_WINDOW_MS);

/**
 * Client address for rate limiting: the last x-forwarded-for entry (the hop nearest to this
 * server; Next fills it from the socket when absent), else x-real-ip, else "unknown".
 */
export function clientAddress(req: Request): string {
  const xff = req.headers.get("x-forwarded-for");
  if (xff) {
    const parts = xff.split(",").map((s) => s.trim()).filter(Boolean);
    if (parts.length > 0) return parts[parts.length - 1];
  }
  return req.headers.get("x-real-ip")?.trim() || "unknown";
}

/** Comment posting: at most 30 comments per minute per member, or per guest link and address. */
export const COMMENT_WINDOW_MS = 60 * 1000;
export const commentPosts = new SlidingWindowLimiter(30, COMMENT_WINDOW_MS);

/**
 * Share-link access by token: at most 20 unknown, expired or revoked tokens per client address in
 * 10 minutes (guessing), and at most 600 token requests per address per minute overall.
 */
export const SHARE_FAILURE_WINDOW_MS = 10 * 60 * 1000;
export const shareTokenFailures = new SlidingWindowLimiter(20, SHARE_FAILURE_WINDOW_MS);
export const shareTokenRequests = new SlidingWindowLimiter(600, 60 * 1000);
