import { isDatabaseUnavailable } from "@/lib/db-errors"
import { getPool } from "./client"

export type DatabaseState = "up" | "down" | "unknown"

/**
 * One `select 1` on the app's pool, for the proxy to answer a page with a calm 503 instead of letting its render
 * fail with a 500. "down" only when the driver says the server cannot be reached (lib/db-errors.ts); a probe
 * still waiting after `timeoutMs` (a busy pool, not a lost server) is "unknown" and the page renders as usual.
 */
export async function probeDatabase(timeoutMs = 1500): Promise<DatabaseState> {
  let timer: ReturnType<typeof setTimeout> | undefined
  const late = new Promise<DatabaseState>((resolve) => {
    timer = setTimeout(() => resolve("unknown"), timeoutMs)
  })
  const probe = getPool()
    .query("select 1")
    .then((): DatabaseState => "up")
    .catch((error: unknown): DatabaseState => (isDatabaseUnavailable(error) ? "down" : "unknown"))
  try {
    return await Promise.race([probe, late])
  } finally {
    clearTimeout(timer)
  }
}
