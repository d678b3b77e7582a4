export interface ProxyTrust {
  /** True when `address` is one of the configured proxies. */
  trusts(address: string): boolean;
  /** Entries of the setting that are not addresses or ranges (ignored). */
  invalid: string[];
  /** True when no proxy is configured. */
  empty: boolean;
}
export function normalizeAddress(raw: string): string;
export function parseTrustedProxies(value: string | undefined): ProxyTrust;
