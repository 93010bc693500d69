import type { Profile } from "@/lib/drive-file/schema"
import { resolveProfile, type ResolvedProfile } from "@/lib/drive-file/profile"
import type { Score } from "./types"

export interface MinutesLeft {
  /** Minutes more until qualifying time is met at the rate so far; 0 = met; null = no qualifying time yet. */
  qualifyingMinutesLeft: number | null
  followingMinutesLeft: number | null
  /** The later of the two; null when either cannot be predicted. */
  minutesLeft: number | null
}

/**
 * At the current rate (qualifying seconds per elapsed second, following seconds per elapsed
 * second), how many more minutes until both time conditions are met. Uses the time before the
 * clear, which is all the time so far while the learn has not cleared. `elapsedSeconds` defaults
 * to the score's durationSeconds (pass wall-clock time since the start for a drive in progress).
 */
export function predictMinutesLeft(
  score: Pick<Score, "qualifyingSecondsBeforeClear" | "followingSecondsBeforeClear" | "durationSeconds">,
  profile?: Profile | ResolvedProfile | null,
  elapsed: { elapsedSeconds?: number } = {},
): MinutesLeft {
  const p = resolveProfile(profile)
  const elapsedSeconds = elapsed.elapsedSeconds ?? score.durationSeconds
  const left = (haveS: number, requiredMinutes: number): number | null => {
    const needS = requiredMinutes * 60 - haveS
    if (needS <= 0) return 0
    if (!(elapsedSeconds > 0) || haveS <= 0) return null
    const rate = haveS / elapsedSeconds
    return needS / rate / 60
  }
  const qualifyingMinutesLeft = left(score.qualifyingSecondsBeforeClear, p.minQualifyingMinutes)
  const followingMinutesLeft = left(score.followingSecondsBeforeClear, p.minFollowingMinutes)
  const minutesLeft =
    qualifyingMinutesLeft === null || followingMinutesLeft === null
      ? null
      : Math.max(qualifyingMinutesLeft, followingMinutesLeft)
  return { qualifyingMinutesLeft, followingMinutesLeft, minutesLeft }
}
