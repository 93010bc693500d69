// Which X-Forwarded-For entry is the client's, given how many proxies in front of the app are trusted.

/** TRUST_PROXY: "1"/"true" = one proxy, a whole number = that many, anything else (unset, "0", "false") = none. */
export function trustedProxyHops(value: string | undefined): number {
  if (value === "true") return 1
  const n = Number(value)
  return Number.isInteger(n) && n > 0 && n < 100 ? n : 0
}

/**
 * Proxies that append (nginx `$proxy_add_x_forwarded_for`, most load balancers) add the address they saw on the
 * right; anything left of it came from the client and proves nothing. With `hops` trusted proxies the client is the
 * `hops`-th entry from the right. With none, the header is not read at all: whoever talks to the app wrote it.
 */
export function pickClientAddress(forwardedFor: string | null, hops: number): string | null {
  if (!hops || !forwardedFor) return null
  const entries = forwardedFor
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean)
  if (!entries.length) return null
  return entries[Math.max(0, entries.length - hops)] ?? null
}
