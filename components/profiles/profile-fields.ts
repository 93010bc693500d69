// Profile keys as the shop reads them: mph/ft or km/h/m. Stored values are always the drive file's own units
// (mph, ft, minutes, m/s², s, m); conversions are exact (lib/units.ts, NIST SP 811).
import type { ResolvedProfile } from "@/lib/drive-file"
import { ftToM, mphToMps, mpsToKmh, mpsToMph, kmhToMps, mToFt, STANDARD_GRAVITY_MPS2 } from "@/lib/units"

export type Units = "imperial" | "metric"
export type FieldKind = "speed" | "distance" | "minutes" | "accel" | "seconds" | "accuracy"

export type ProfileField = {
  /** The key's path in the profile, dotted for nested keys. */
  name: string
  label: string
  kind: FieldKind
  nullable?: boolean
  get: (p: ResolvedProfile) => number | null
  hint: string
}

type FieldRow = [name: string, label: string, kind: FieldKind, hint: string, nullable?: true]

const FIELD_ROWS: FieldRow[] = [
  ["minSpeedMph", "Slowest qualifying speed", "speed", "Slower driving does not count."],
  ["maxSpeedMph", "Fastest qualifying speed", "speed", "Blank: no upper limit.", true],
  ["leadGapFt.min", "Closest following gap", "distance", "Behind a lead vehicle."],
  ["leadGapFt.max", "Farthest following gap", "distance", "Behind a lead vehicle."],
  ["minQualifyingMinutes", "Qualifying time needed", "minutes", "Before the vehicle reports the learn complete."],
  ["minFollowingMinutes", "Following time needed", "minutes", "0 when the learn needs no lead vehicle."],
  ["maxDriveMinutes", "Drive times out after", "minutes", "Without a learn-complete mark."],
  [
    "maxAccelMps2",
    "Harsh acceleration above",
    "accel",
    "Speeding up harder is reported. In g: 0.1 g is 0.98 m/s² (standard gravity 9.80665 m/s²).",
  ],
  ["maxDecelMps2", "Harsh braking above", "accel", "Braking harder is reported."],
  ["maxGapSeconds", "Longest pause between samples", "seconds", "Longer counts as a data gap."],
  ["maxAccuracyM", "Loosest position fix kept", "accuracy", "The phone's stated accuracy; looser fixes are dropped."],
  [
    "verifySpeedMph",
    "Slowest speed for a verified mark",
    "speed",
    "The function seen working at this speed or faster.",
  ],
]

/** The value at a dotted path of the profile (`leadGapFt.min`). */
function valueAt(profile: ResolvedProfile, path: string): number | null {
  let value: unknown = profile
  for (const key of path.split(".")) value = (value as Record<string, unknown>)[key]
  return value as number | null
}

export const PROFILE_FIELDS: ProfileField[] = FIELD_ROWS.map(([name, label, kind, hint, nullable]) => ({
  name,
  label,
  kind,
  hint,
  ...(nullable ? { nullable } : {}),
  get: (p) => valueAt(p, name),
}))

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
