import type { ResolvedProfile } from "@/lib/drive-file/profile"
import {
  formatAcceleration,
  formatLengthRangeFt,
  formatMinutesSetting,
  formatSpeedBandMph,
  formatSpeedMph,
  type UnitSystem,
} from "@/lib/format"

// The recorder's words about the profile, in the shop's units. Profiles keep speeds in mph and gaps in feet
// (drive-file format); only the words convert, every decision stays on the stored values.

/** The condition profile as short plain sentences for the crew before they drive. */
export function profileInWords(p: ResolvedProfile, units: UnitSystem): string[] {
  const band =
    p.maxSpeedMph === null
      ? `${formatSpeedMph(p.minSpeedMph, units)} or faster`
      : `between ${formatSpeedBandMph(p.minSpeedMph, p.maxSpeedMph, units).replace("–", " and ")}`
  return [
    `Drive ${band} for at least ${formatMinutesSetting(p.minQualifyingMinutes)} (qualifying time).`,
    `Follow a lead vehicle ${formatLengthRangeFt(p.leadGapFt.min, p.leadGapFt.max, units).replace("–", " to ")} ahead for at least ${formatMinutesSetting(p.minFollowingMinutes)} of that (following time).`,
    `Most learns take 10 to 30 minutes; after ${formatMinutesSetting(p.maxDriveMinutes)} without the vehicle reporting the learn done, the drive has timed out.`,
    `Once the vehicle reports the learn done, check the driver-assist function works at ${formatSpeedMph(p.verifySpeedMph, units)} or faster and log "Verified".`,
    `Smooth driving: speeding up harder than ${formatAcceleration(p.maxAccelMps2)} or braking harder than ${formatAcceleration(p.maxDecelMps2)} is noted for review.`,
  ]
}

/** The speed meter's line under the number. `mph` is the speed now (null: no GPS speed yet), compared in mph. */
export function speedMeterWords(p: ResolvedProfile, mph: number | null, units: UnitSystem): string {
  const band = formatSpeedBandMph(p.minSpeedMph, p.maxSpeedMph, units)
  if (mph === null) return `No speed from GPS yet · band ${band}`
  if (mph < p.minSpeedMph) return `Under ${formatSpeedMph(p.minSpeedMph, units)}: qualifying time paused`
  if (p.maxSpeedMph !== null && mph > p.maxSpeedMph)
    return `Over ${formatSpeedMph(p.maxSpeedMph, units)}: qualifying time paused`
  return `Inside the band ${band}`
}
