// Retry schedule for the outbox: exponential with "full jitter" (a random wait between 0 and the
// exponential cap), so phones that lose the network together do not all come back in the same second.

export interface BackoffOptions {
  baseMs?: number
  maxMs?: number
}

const BACKOFF_BASE_MS = 1000
export const BACKOFF_MAX_MS = 60_000

/** The exponential ceiling for the n-th retry (attempt 1 = first retry). */
export function backoffCeilingMs(
  attempt: number,
  { baseMs = BACKOFF_BASE_MS, maxMs = BACKOFF_MAX_MS }: BackoffOptions = {},
): number {
  const n = Math.max(1, Math.floor(attempt))
  return Math.min(maxMs, baseMs * 2 ** Math.min(n - 1, 30))
}

/** Wait before retry `attempt`; `random` in [0, 1). Never less than a quarter of the base. */
export function backoffDelayMs(
  attempt: number,
  random: () => number = Math.random,
  options: BackoffOptions = {},
): number {
  const ceiling = backoffCeilingMs(attempt, options)
  const floor = Math.min(ceiling, (options.baseMs ?? BACKOFF_BASE_MS) / 4)
  return Math.round(floor + (ceiling - floor) * random())
}
