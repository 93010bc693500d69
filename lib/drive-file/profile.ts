import type { Profile } from "./schema"

export interface ResolvedProfile {
  /** Slowest speed that counts as qualifying. Common practice for drive-type radar learns, no published source. */
  minSpeedMph: number
  /** Fastest speed that counts; null = no upper bound. */
  maxSpeedMph: number | null
  /** Following-distance window, inclusive. Common practice, no published source. */
  leadGapFt: { min: number; max: number }
  /** Common practice: such learns take 10 to 30 minutes of driving. */
  minQualifyingMinutes: number
  /** Product default. */
  minFollowingMinutes: number
  /** Common practice: 10 to 30 minutes. */
  maxDriveMinutes: number
  /** Product default: above routine driving (~0.25 g), below common harsh-event cuts (0.35 g). */
  maxAccelMps2: number
  /** AASHTO Green Book §3.2.2 comfortable deceleration rate, 3.4 m/s² (11.2 ft/s²). */
  maxDecelMps2: number
  /** Product default. */
  maxGapSeconds: number
  /** Product default; the Geolocation API's accuracy is a 95 % radius. */
  maxAccuracyM: number
  /** Common practice, no published source. */
  verifySpeedMph: number
}

export const DEFAULT_PROFILE: Readonly<ResolvedProfile> = Object.freeze({
  minSpeedMph: 35,
  maxSpeedMph: null,
  leadGapFt: Object.freeze({ min: 100, max: 165 }),
  minQualifyingMinutes: 10,
  minFollowingMinutes: 2,
  maxDriveMinutes: 30,
  maxAccelMps2: 3.0,
  maxDecelMps2: 3.4,
  maxGapSeconds: 5,
  maxAccuracyM: 30,
  verifySpeedMph: 25,
})

/** Fills every missing key with its default. Takes an already-validated profile. */
export function resolveProfile(profile?: Profile | null): ResolvedProfile {
  const p = profile ?? {}
  const d = DEFAULT_PROFILE
  return {
    minSpeedMph: p.minSpeedMph ?? d.minSpeedMph,
    maxSpeedMph: p.maxSpeedMph ?? d.maxSpeedMph,
    leadGapFt: { min: p.leadGapFt?.min ?? d.leadGapFt.min, max: p.leadGapFt?.max ?? d.leadGapFt.max },
    minQualifyingMinutes: p.minQualifyingMinutes ?? d.minQualifyingMinutes,
    minFollowingMinutes: p.minFollowingMinutes ?? d.minFollowingMinutes,
    maxDriveMinutes: p.maxDriveMinutes ?? d.maxDriveMinutes,
    maxAccelMps2: p.maxAccelMps2 ?? d.maxAccelMps2,
    maxDecelMps2: p.maxDecelMps2 ?? d.maxDecelMps2,
    maxGapSeconds: p.maxGapSeconds ?? d.maxGapSeconds,
    maxAccuracyM: p.maxAccuracyM ?? d.maxAccuracyM,
    verifySpeedMph: p.verifySpeedMph ?? d.verifySpeedMph,
  }
}
