// Sign-in throttling: a few wrong passwords per e-mail, more per client address (a shop shares one IP).
export const SIGN_IN_WINDOW_SECONDS = 15 * 60
export const MAX_FAILURES_PER_EMAIL = 5
export const MAX_FAILURES_PER_ADDRESS = 30

export type FailureCounts = {
  byEmail: number
  byAddress: number
  oldestByEmail: Date | null
  oldestByAddress: Date | null
}

/** Seconds until another attempt is allowed, or 0 when it is allowed now. */
export function computeRetryAfterSeconds(counts: FailureCounts, now = new Date()): number {
  const waits: number[] = []
  const until = (oldest: Date | null) =>
    oldest
      ? Math.max(1, Math.ceil((oldest.getTime() + SIGN_IN_WINDOW_SECONDS * 1000 - now.getTime()) / 1000))
      : SIGN_IN_WINDOW_SECONDS
  if (counts.byEmail >= MAX_FAILURES_PER_EMAIL) waits.push(until(counts.oldestByEmail))
  if (counts.byAddress >= MAX_FAILURES_PER_ADDRESS) waits.push(until(counts.oldestByAddress))
  return waits.length ? Math.max(...waits) : 0
}
