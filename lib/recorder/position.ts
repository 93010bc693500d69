import type { Sample } from "@/lib/drive-file/schema"
import { formatLength, type UnitSystem } from "@/lib/format"
import { DEGREE_SCALE, encodeDegrees, encodeMillis, MILLI_SCALE } from "@/lib/drive-file/stored"

/** The parts of a GeolocationPosition a sample needs (so this stays testable without a browser). */
export interface PositionLike {
  timestamp: number
  coords: { latitude: number; longitude: number; speed: number | null; accuracy: number | null }
}

const finiteOrNull = (v: number | null | undefined) =>
  typeof v === "number" && Number.isFinite(v) && v >= 0 ? v : null
// Rounded as the server stores them (lib/drive-file/stored.ts), so the phone's meters score the same numbers.
const degrees = (v: number) => encodeDegrees(v) / DEGREE_SCALE
const millis = (v: number | null) => (v === null ? null : encodeMillis(v)! / MILLI_SCALE)

/**
 * A fix as a drive-file sample, at the precision the server keeps (1e-7 degree, mm/s, mm). NOTE: some
 * browsers give NaN or a negative speed when they have none; that is stored as null so the scorer derives
 * speed from positions.
 */
export function positionToSample(p: PositionLike): Sample {
  return {
    t: Math.round(p.timestamp),
    lat: degrees(p.coords.latitude),
    lon: degrees(p.coords.longitude),
    speed: millis(finiteOrNull(p.coords.speed)),
    accuracy: millis(finiteOrNull(p.coords.accuracy)),
  }
}

export type GpsState = "waiting" | "ok" | "poor" | "no-fix" | "denied" | "unavailable"

/** Plain words for the crew. */
export function gpsMessage(
  state: GpsState,
  accuracyM: number | null,
  maxAccuracyM: number,
  units: UnitSystem,
): string | null {
  switch (state) {
    case "waiting":
      return "Finding your position…"
    case "denied":
      return "Location is blocked for Straightaway. Allow location in the browser's site settings, then come back."
    case "unavailable":
      return "This phone cannot give a position. Try another phone or browser."
    case "no-fix":
      return "No position for a while. Keep the phone where it can see the sky (on the dash, not in a pocket)."
    case "poor":
      return `Position is rough (±${formatLength(accuracyM ?? 0, units)}). Samples rougher than ±${formatLength(maxAccuracyM, units)} do not count.`
    default:
      return null
  }
}
