import "server-only"
import { env } from "@/lib/env"

/**
 * The client's address for sign-in throttling.
 * NOTE: `next start` fills x-forwarded-for with the socket's address only when the request has none, so a client
 * talking to Next directly can choose it. Run behind a proxy that sets the header (TRUST_PROXY=1 then takes its
 * first entry); the per-e-mail limit does not depend on the address at all.
 */
export function clientAddress(req: Request): string {
  const forwarded = (req.headers.get("x-forwarded-for") ?? "").split(",").map((s) => s.trim()).filter(Boolean)
  if (!forwarded.length) return "unknown"
  return (env().TRUST_PROXY ? forwarded[0] : forwarded.at(-1)) ?? "unknown"
}
