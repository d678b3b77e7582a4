import "server-only";
import { resolveShareToken, type ShareGrant } from "@/lib/db";
import { shareTokenFailures, shareTokenRequests } from "./rate-limit";

/** The outcome of presenting a share token from a client address. */
type ShareLookup = { kind: "guest"; guest: ShareGrant } | { kind: "limited"; retryAfterMs: number } | { kind: "gone" };

/**
 * Resolves a share token for the share page and the share API alike (one limiter for both):
 * at most 600 token requests per client address per minute, and at most 20 that fail (unknown,
 * malformed, expired or revoked) in 10 minutes. Every failure is the same "gone".
 */
export async function lookUpShareToken(address: string, token: string): Promise<ShareLookup> {
  const wait = Math.max(shareTokenRequests.retryAfterMs(address), shareTokenFailures.retryAfterMs(address));
  if (wait > 0) return { kind: "limited", retryAfterMs: wait };
  shareTokenRequests.record(address);
  const guest = await resolveShareToken(token);
  if (!guest) {
    shareTokenFailures.record(address);
    return { kind: "gone" };
  }
  return { kind: "guest", guest };
}
