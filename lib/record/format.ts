import type { Verdict } from "@/lib/scoring/types"

export const VERDICT_WORD: Record<Verdict, string> = { met: "Met", short: "Short", not_met: "Not met", unverified: "Unverified" }

/** Minutes with one decimal; below the requirement it rounds down, so a shortfall never reads as met (as the scorer words it). */
export function formatMinutes(seconds: number, requiredSeconds = Infinity): string {
  const m = seconds / 60
  return (seconds < requiredSeconds ? Math.floor(m * 10) / 10 : Math.round(m * 10) / 10).toFixed(1)
}

// One duration style everywhere (lib/format).
export { formatDuration } from "@/lib/format"

// One set of words for task values everywhere: the job pages, the recorder and the record.
export { MARK_LABEL, METHOD_LABEL, REASON_LABEL, SENSOR_LABEL } from "@/lib/labels"

export function describeVehicle(v: { year: number | null; make: string | null; model: string | null } | null, fallback?: string | null) {
  if (!v) return fallback ?? "Vehicle not named"
  return [v.year, v.make, v.model].filter(Boolean).join(" ") || fallback || "Vehicle not named"
}

/** The cautions every record carries, in our own words. */
export const RECORD_CAUTIONS = [
  "The vehicle's own confirmation that the learn is complete, and the vehicle maker's calibration procedure, govern. This record does not replace either.",
  "This record documents how the drive went. It does not certify that the sensor is aimed or working.",
  "If a warning light, fault code or odd driver-assist behaviour appears later, stop relying on the system and bring the vehicle back.",
] as const

export const DECISION_WORD = { approve: "Approved", redo: "Sent back for another drive" } as const

type ConditionLike = { key: string; value: number | null; required: number | null; unit: string }

/** A condition's value in the unit people read it in: minutes for times, seconds for data gaps. */
export function formatConditionValue(c: ConditionLike): string {
  if (c.value == null) return "-"
  if (c.unit === "s") return c.key === "data-gaps" ? `${Math.round(c.value)} s` : `${formatMinutes(c.value, c.required ?? Infinity)} min`
  return `${c.value} ${c.unit}`
}

export function formatConditionRequirement(c: ConditionLike): string {
  if (c.required == null) return "-"
  if (c.key === "data-gaps" || (c.unit === "events" && c.required === 0)) return "none"
  if (c.unit === "s") return c.key === "time-limit" ? `at most ${formatMinutes(c.required, 0)} min` : `${formatMinutes(c.required, 0)} min`
  if (c.unit === "mph") return `${c.required} mph or faster`
  return `${c.required} ${c.unit}`
}

/** RO numbers are stored as the shop writes them; add "RO" only when the number lacks it. */
export function roLabel(ro: string): string {
  return /^ro\b/i.test(ro) ? ro : `RO ${ro}`
}
