import { resolveProfile, type ResolvedProfile } from "@/lib/drive-file/profile"
import type { Condition, Score } from "@/lib/scoring/types"
import {
  formatAcceleration,
  formatDuration,
  formatLengthFt,
  formatMinutesSetting,
  formatSpeedMph,
  plural,
  type UnitSystem,
} from "./index"

// The scorer writes its labels and reasons in mph, feet and decimal minutes (its stored output is a contract).
// People read them here again, from the same figures, in the shop's units and the one duration style.

export interface ConditionLine {
  key: string
  label: string
  /** What the drive did: "11 min 48 s", "1 event", "31 mph". */
  value: string
  /** What the profile asks; "advisory" for a condition that never changes the verdict. */
  requirement: string
  state: "met" | "not_met" | "advisory"
  advisory: boolean
  reason?: string
}

function profileOf(score: Pick<Score, "profile">): ResolvedProfile {
  return score.profile ?? resolveProfile(null)
}

function speedBand(p: ResolvedProfile, units: UnitSystem): string {
  return p.maxSpeedMph === null
    ? `${formatSpeedMph(p.minSpeedMph, units)} or faster`
    : `${formatSpeedMph(p.minSpeedMph, units)} to ${formatSpeedMph(p.maxSpeedMph, units)}`
}

function gapWindow(p: ResolvedProfile, units: UnitSystem): string {
  return `${formatLengthFt(p.leadGapFt.min, units).replace(/ (ft|m)$/, "")}-${formatLengthFt(p.leadGapFt.max, units)}`
}

function label(c: Condition, p: ResolvedProfile, units: UnitSystem): string {
  switch (c.key) {
    case "cleared":
      return "Learn reported complete"
    case "time-limit":
      return "Within the drive time limit"
    case "qualifying-time":
      return `Qualifying time (${speedBand(p, units)})`
    case "following-time":
      return `Following time (lead ${gapWindow(p, units)} ahead)`
    case "verified":
      return `Driver-assist seen working after the learn completed (${formatSpeedMph(p.verifySpeedMph, units)} or faster)`
    case "harsh-events":
      return "Harsh acceleration and braking"
    case "data-gaps":
      return `Data gaps (pauses over ${formatDuration(p.maxGapSeconds)})`
    default:
      return c.label
  }
}

function value(c: Condition, units: UnitSystem): string {
  if (c.value == null) return "—"
  if (c.key === "harsh-events") return plural(c.value, "event")
  if (c.key === "cleared") return `${formatDuration(c.value)} into the drive`
  if (c.unit === "s") return formatDuration(c.value)
  if (c.unit === "mph") return formatSpeedMph(c.value, units)
  return `${c.value} ${c.unit}`
}

function requirement(c: Condition, units: UnitSystem): string {
  if (c.advisory) return "advisory"
  if (c.required == null) return ""
  if (c.key === "time-limit") return `at most ${formatDuration(c.required)}`
  if (c.unit === "s") return `${formatDuration(c.required)} needed`
  if (c.unit === "mph") return `${formatSpeedMph(c.required, units)} or faster needed`
  return `${c.required} ${c.unit} needed`
}

function reason(c: Condition, score: Score, p: ResolvedProfile, units: UnitSystem): string | undefined {
  if (c.met || !c.reason) return undefined
  const cleared = score.clearedAtSeconds != null
  const when = cleared ? "before the learn completed was" : "so far is"
  switch (c.key) {
    case "cleared":
      return "The vehicle never reported the learn complete (no learn-complete mark)."
    case "time-limit":
      return `The drive timed out: ${formatDuration(c.value)} without the learn completing; the limit is ${formatMinutesSetting(p.maxDriveMinutes)}.`
    case "qualifying-time":
      return `Qualifying time (${speedBand(p, units)}) ${when} ${formatDuration(c.value)}; ${formatMinutesSetting(p.minQualifyingMinutes)} needed.`
    case "following-time":
      return `Following time (lead ${gapWindow(p, units)} ahead, ${speedBand(p, units)}) ${when} ${formatDuration(c.value)}; ${formatMinutesSetting(p.minFollowingMinutes)} needed.`
    case "harsh-events": {
      const h = score.harshEvents ?? { accel: 0, decel: 0 }
      return `${plural(h.decel, "hard-braking event")} over ${formatAcceleration(p.maxDecelMps2)} and ${plural(h.accel, "hard-acceleration event")} over ${formatAcceleration(p.maxAccelMps2)}. Advisory: the verdict does not rest on it.`
    }
    case "data-gaps":
      return `Position data stopped for ${formatDuration(c.value)} in total (pauses over ${formatDuration(p.maxGapSeconds)}); that time counts toward nothing.`
    case "verified":
      if (!cleared) return "Not checked: the learn never completed."
      return c.reason
        .replace(/(\d+(?:\.\d+)?) mph/g, (_, mph: string) => formatSpeedMph(Number(mph), units))
        .replace(/after the clear/g, "after the learn completed")
    default:
      return speedsInUnits(c.reason, units)
  }
}

/**
 * The scorer's other words (the road test's "passed only at 17.9 mph; it counts at 40 mph or faster") with
 * each "N mph" in the shop's unit, to a tenth as the scorer writes it (NIST SP 811: 1 mi = 1609.344 m).
 */
function speedsInUnits(text: string, units: UnitSystem): string {
  if (units === "imperial") return text
  return text.replace(/(\d+(?:\.\d+)?) mph\b/g, (_, mph: string) => formatSpeedMph(Number(mph), units, 1))
}

export function describeConditions(score: Score, units: UnitSystem): ConditionLine[] {
  const p = profileOf(score)
  return (score.conditions ?? []).map((c) => ({
    key: c.key,
    label: label(c, p, units),
    value: value(c, units),
    requirement: requirement(c, units),
    state: c.met ? "met" : c.advisory ? "advisory" : "not_met",
    advisory: c.advisory,
    reason: reason(c, score, p, units),
  }))
}

/** The verdict's reasons and the advisory notes, in the shop's units; the choice of which comes from the scorer. */
export function describeReasons(score: Score, units: UnitSystem): { reasons: string[]; notes: string[] } {
  const lines = describeConditions(score, units)
  const byReason = new Map<string, string>()
  score.conditions?.forEach((c, i) => {
    if (c.reason) byReason.set(c.reason, lines[i]?.reason ?? c.reason)
  })
  return {
    reasons: (score.reasons ?? []).map((r) => byReason.get(r) ?? speedsInUnits(r, units)),
    notes: (score.notes ?? []).map((r) => byReason.get(r) ?? speedsInUnits(r, units)),
  }
}

/** "11 min 48 s (10 min needed)" for a figure held against the profile. */
export function formatAgainst(seconds: number | null | undefined, requiredSeconds: number | null | undefined): string {
  return `${formatDuration(seconds ?? 0)}${requiredSeconds != null ? ` (${formatDuration(requiredSeconds)} needed)` : ""}`
}
