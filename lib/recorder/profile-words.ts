import type { ResolvedProfile } from "@/lib/drive-file/profile"

/** The condition profile as short plain sentences for the crew before they drive. */
export function profileInWords(p: ResolvedProfile): string[] {
  const band =
    p.maxSpeedMph === null ? `${p.minSpeedMph} mph or faster` : `between ${p.minSpeedMph} and ${p.maxSpeedMph} mph`
  return [
    `Drive ${band} for at least ${p.minQualifyingMinutes} minutes (qualifying time).`,
    `Follow a lead vehicle ${p.leadGapFt.min} to ${p.leadGapFt.max} ft ahead for at least ${p.minFollowingMinutes} minutes of that (following time).`,
    `Most learns take 10 to 30 minutes; after ${p.maxDriveMinutes} minutes without the vehicle reporting the learn done, the drive has timed out.`,
    `Once the vehicle reports the learn done, check the driver-assist function works at ${p.verifySpeedMph} mph or faster and log "Verified".`,
    `Smooth driving: speeding up harder than ${p.maxAccelMps2} m/s² or braking harder than ${p.maxDecelMps2} m/s² is noted for review.`,
  ]
}
