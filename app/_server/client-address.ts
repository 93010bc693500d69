import "server-only"
import { pickClientAddress, trustedProxyHops } from "@/lib/auth/client-address"

/**
 * The client's address for sign-in throttling, or null when it cannot be known.
 * `next start` sets X-Forwarded-For only when a request has none, so a client talking to Next directly can write it:
 * without TRUST_PROXY the header is not read at all (safe default). Behind proxies that append to the header,
 * TRUST_PROXY=N (1 or `true` for one proxy) takes the N-th entry from the right (lib/auth/client-address.ts).
 */
export function clientAddress(req: Request): string | null {
  return pickClientAddress(req.headers.get("x-forwarded-for"), trustedProxyHops(process.env.TRUST_PROXY))
}
