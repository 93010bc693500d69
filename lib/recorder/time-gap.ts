// The time-gap counter: the co-driver taps when the lead vehicle passes a roadside object and again
// when we pass it. At a steady speed the distance between the vehicles is that time times our speed.
import { mToFt } from "@/lib/units"

export interface TimeGap {
  seconds: number
  /** null when our speed is unknown. */
  gapFt: number | null
}

/** Gap from the two taps (ms) and our speed (m/s) at the second tap. */
export function timeGap(leadPassedMs: number, wePassedMs: number, speedMps: number | null): TimeGap | null {
  const seconds = (wePassedMs - leadPassedMs) / 1000
  if (!(seconds > 0) || !Number.isFinite(seconds)) return null
  if (speedMps === null || !Number.isFinite(speedMps) || speedMps < 0) return { seconds, gapFt: null }
  return { seconds, gapFt: mToFt(seconds * speedMps) }
}

/** Whole feet for a mark; the counter's own precision is far coarser than a foot. */
export function roundGapFt(gapFt: number): number {
  return Math.round(gapFt)
}

/** A gap the co-driver typed in the shop's unit, as the mark's whole feet (drive-file format; 1 ft = 0.3048 m). */
export function typedGapFt(typed: number, units: "imperial" | "metric"): number {
  return roundGapFt(units === "metric" ? mToFt(typed) : typed)
}
