// Profile keys as the shop reads them: mph/ft or km/h/m. Stored values are always the drive file's own units
// (mph, ft, minutes, m/s², s, m); conversions are exact (lib/units.ts, NIST SP 811).
import type { ResolvedProfile } from "@/lib/drive-file"
import { ftToM, mphToMps, mpsToKmh, mpsToMph, kmhToMps, mToFt, STANDARD_GRAVITY_MPS2 } from "@/lib/units"

export type Units = "imperial" | "metric"
export type FieldKind = "speed" | "distance" | "minutes" | "accel" | "seconds" | "accuracy"

export type ProfileField = {
  name: string
  label: string
  kind: FieldKind
  nullable?: boolean
  get: (p: ResolvedProfile) => number | null
  hint: string
}

export const PROFILE_FIELDS: ProfileField[] = [
  {
    name: "minSpeedMph",
    label: "Slowest qualifying speed",
    kind: "speed",
    get: (p) => p.minSpeedMph,
    hint: "Slower driving does not count.",
  },
  {
    name: "maxSpeedMph",
    label: "Fastest qualifying speed",
    kind: "speed",
    nullable: true,
    get: (p) => p.maxSpeedMph,
    hint: "Blank: no upper limit.",
  },
  {
    name: "leadGapFt.min",
    label: "Closest following gap",
    kind: "distance",
    get: (p) => p.leadGapFt.min,
    hint: "Behind a lead vehicle.",
  },
  {
    name: "leadGapFt.max",
    label: "Farthest following gap",
    kind: "distance",
    get: (p) => p.leadGapFt.max,
    hint: "Behind a lead vehicle.",
  },
  {
    name: "minQualifyingMinutes",
    label: "Qualifying time needed",
    kind: "minutes",
    get: (p) => p.minQualifyingMinutes,
    hint: "Before the vehicle reports the learn complete.",
  },
  {
    name: "minFollowingMinutes",
    label: "Following time needed",
    kind: "minutes",
    get: (p) => p.minFollowingMinutes,
    hint: "0 when the learn needs no lead vehicle.",
  },
  {
    name: "maxDriveMinutes",
    label: "Drive times out after",
    kind: "minutes",
    get: (p) => p.maxDriveMinutes,
    hint: "Without a learn-complete mark.",
  },
  {
    name: "maxAccelMps2",
    label: "Harsh acceleration above",
    kind: "accel",
    get: (p) => p.maxAccelMps2,
    hint: "Speeding up harder is reported. In g: 0.1 g is 0.98 m/s² (standard gravity 9.80665 m/s²).",
  },
  {
    name: "maxDecelMps2",
    label: "Harsh braking above",
    kind: "accel",
    get: (p) => p.maxDecelMps2,
    hint: "Braking harder is reported.",
  },
  {
    name: "maxGapSeconds",
    label: "Longest pause between samples",
    kind: "seconds",
    get: (p) => p.maxGapSeconds,
    hint: "Longer counts as a data gap.",
  },
  {
    name: "maxAccuracyM",
    label: "Loosest position fix kept",
    kind: "accuracy",
    get: (p) => p.maxAccuracyM,
    hint: "The phone's stated accuracy; looser fixes are dropped.",
  },
  {
    name: "verifySpeedMph",
    label: "Slowest speed for a verified mark",
    kind: "speed",
    get: (p) => p.verifySpeedMph,
    hint: "The function seen working at this speed or faster.",
  },
]

export function unitLabel(kind: FieldKind, units: Units) {
  switch (kind) {
    case "speed":
      return units === "metric" ? "km/h" : "mph"
    case "distance":
    case "accuracy":
      return units === "metric" ? "m" : "ft"
    case "minutes":
      return "min"
    case "accel":
      return "g"
    case "seconds":
      return "s"
  }
}

/** Stored value -> the number shown (in the shop's units). */
export function toDisplay(kind: FieldKind, stored: number, units: Units): number {
  if (kind === "speed" && units === "metric") return mpsToKmh(mphToMps(stored))
  if (kind === "distance" && units === "metric") return ftToM(stored)
  if (kind === "accuracy" && units === "imperial") return mToFt(stored)
  if (kind === "accel") return stored / STANDARD_GRAVITY_MPS2
  return stored
}

/** Shown number -> the stored value. */
export function fromDisplay(kind: FieldKind, shown: number, units: Units): number {
  if (kind === "speed" && units === "metric") return mpsToMph(kmhToMps(shown))
  if (kind === "distance" && units === "metric") return mToFt(shown)
  if (kind === "accuracy" && units === "imperial") return ftToM(shown)
  if (kind === "accel") return shown * STANDARD_GRAVITY_MPS2
  return shown
}

/**
 * The number as people read it: converted speeds and lengths to whole units (30 m reads 98 ft, not 98.43),
 * times as kept, accelerations in g to two decimals. An unchanged field saves the stored value, so rounding here never drifts it.
 */
export function formatShown(n: number, kind?: FieldKind) {
  const digits = kind === "speed" || kind === "distance" || kind === "accuracy" ? 0 : 2
  const f = 10 ** digits
  return String(Math.round(n * f) / f)
}
