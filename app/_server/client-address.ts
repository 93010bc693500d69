import "server-only"
import { env } from "@/lib/env"

/**
 * The client's address for throttling. `next start` records the socket's address as the last entry of
 * x-forwarded-for; behind a trusted proxy (TRUST_PROXY=1) the first entry is the client's.
 */
export function clientAddress(req: Request): string {
  const forwarded = (req.headers.get("x-forwarded-for") ?? "").split(",").map((s) => s.trim()).filter(Boolean)
  if (!forwarded.length) return "unknown"
  return (env().TRUST_PROXY ? forwarded[0] : forwarded.at(-1)) ?? "unknown"
}
