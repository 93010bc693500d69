import type { Verdict } from "@/lib/scoring/types"

export const VERDICT_WORD: Record<Verdict, string> = {
  met: "Met",
  short: "Short",
  not_met: "Not met",
  unverified: "Unverified",
}

// One duration style everywhere (lib/format).
export { formatDuration } from "@/lib/format"

// One set of words for task values everywhere: the job pages, the recorder and the record.
export { MARK_LABEL, METHOD_LABEL, REASON_LABEL, SENSOR_LABEL } from "@/lib/labels"

export function describeVehicle(
  v: { year: number | null; make: string | null; model: string | null } | null,
  fallback?: string | null,
) {
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

/** RO numbers are stored as the shop writes them; add "RO" only when the number lacks it. */
export function roLabel(ro: string): string {
  return /^ro\b/i.test(ro) ? ro : `RO ${ro}`
}
