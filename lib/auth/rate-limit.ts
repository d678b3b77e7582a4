/**
 * In-memory rate limits (per server process; they reset on restart and are not shared between
 * processes: enough against guessing on a single server).
 *
 * Every limiter lives in one registry on globalThis, so the separately bundled parts of the app
 * (the share page and the share API are different bundles, each with its own copy of this
 * module) count in the same limiter instead of one each.
 */

const REGISTRY = Symbol.for("armsift.rate-limiters");
type Registry = Map<string, unknown>;

/** The process-wide instance named `name`, made by `make` on first use. */
function shared<T>(name: string, make: () => T): T {
  const g = globalThis as { [REGISTRY]?: Registry };
  const registry = (g[REGISTRY] ??= new Map());
  if (!registry.has(name)) registry.set(name, make());
  return registry.get(name) as T;
}

/** Sliding-window counter: at most `limit` events per key in any `windowMs`. */
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

/**
 * Failure counter with growing back-off: the first `free` failures of a key cost nothing; after
 * that the key waits `baseMs`, doubling with each further failure up to `maxMs`. A key with no
 * failure for `forgetMs` starts again; a success resets it.
 */
export class BackoffLimiter {
  private readonly state = new Map<string, { failures: number; lastAt: number }>();
  constructor(
    readonly free: number,
    readonly baseMs: number,
    readonly maxMs: number,
    readonly forgetMs: number,
    private readonly now: () => number = Date.now,
  ) {}

  private live(key: string): { failures: number; lastAt: number } | undefined {
    const s = this.state.get(key);
    if (s && this.now() - s.lastAt >= this.forgetMs) {
      this.state.delete(key);
      return undefined;
    }
    return s;
  }

  /** The wait after `failures` failures (0 while they are free). */
  delayFor(failures: number): number {
    if (failures < this.free) return 0;
    return Math.min(this.maxMs, this.baseMs * 2 ** (failures - this.free));
  }

  retryAfterMs(key: string): number {
    const s = this.live(key);
    if (!s) return 0;
    return Math.max(0, s.lastAt + this.delayFor(s.failures) - this.now());
  }

  record(key: string): void {
    const s = this.live(key);
    this.state.set(key, { failures: (s?.failures ?? 0) + 1, lastAt: this.now() });
    if (this.state.size > 10_000) for (const k of [...this.state.keys()]) this.live(k);
  }

  reset(key: string): void {
    this.state.delete(key);
  }

  clear(): void {
    this.state.clear();
  }
}

/**
 * Sign-in failures, counted per (account, client address) with growing back-off: 5 free, then
 * 1 min, 2, 4, 8 and at most 15 min between tries. Someone guessing from elsewhere therefore
 * never locks the owner out of their own address. Per address (whatever the accounts): at most
 * 20 failures in any 15 minutes.
 */
const SIGNIN_WINDOW_MS = 15 * 60 * 1000;
export const signInFailuresByAccount = shared("signin:account+address", () => new BackoffLimiter(5, 60_000, SIGNIN_WINDOW_MS, 24 * 60 * 60 * 1000));
export const signInFailuresByIp = shared("signin:address", () => new SlidingWindowLimiter(20, SIGNIN_WINDOW_MS));
/** The key of an account tried from an address. */
export const accountAddressKey = (email: string, address: string): string => `${email}\u0000${address}`;

/** Comment posting: at most 30 comments per minute per member, or per guest link and address. */
const COMMENT_WINDOW_MS = 60 * 1000;
export const commentPosts = shared("comments", () => new SlidingWindowLimiter(30, COMMENT_WINDOW_MS));

/**
 * Share-link access by token: at most 20 unknown, expired or revoked tokens per client address in
 * 10 minutes (guessing), and at most 600 token requests per address per minute overall.
 */
const SHARE_FAILURE_WINDOW_MS = 10 * 60 * 1000;
export const shareTokenFailures = shared("share:failures", () => new SlidingWindowLimiter(20, SHARE_FAILURE_WINDOW_MS));
export const shareTokenRequests = shared("share:requests", () => new SlidingWindowLimiter(600, 60 * 1000));
