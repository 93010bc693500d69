import type { CheckResult } from "@/lib/drive-file/road-test"
import { formatSpeedMph, type UnitSystem } from "@/lib/format"

// Words for road-test results and statuses; no zod here: the recorder's client bundle imports this file.

export const CHECK_RESULT_LABEL: Readonly<Record<CheckResult, string>> = {
  pass: "Pass",
  fail: "Fail",
  not_equipped: "Not equipped",
}

export const CHECK_STATUS_LABEL: Readonly<Record<string, string>> = {
  passed: "Passed",
  failed: "Failed",
  not_equipped: "Not equipped",
  below_speed: "Passed below its speed (not counted)",
  not_logged: "Not logged",
}

/**
 * A road-test speed (kept in mph, drive-file format) in the shop's units, to a tenth: a check passed at 44.9 mph
 * must not read as the 45 it fell short of ("30 mph", "48.3 km/h", "44.7 mph").
 */
export function checkSpeed(mph: number, units: UnitSystem): string {
  return formatSpeedMph(mph, units, 1)
}

/** The speed a check counts at: "30 mph or faster", "48.3 km/h or faster", "any speed". */
export function checkSpeedWords(minSpeedMph: number | null, units: UnitSystem): string {
  return minSpeedMph === null ? "any speed" : `${checkSpeed(minSpeedMph, units)} or faster`
}

/** Said under a check while the vehicle is slower than the check's speed. */
export function checkTooSlowWords(minSpeedMph: number, units: UnitSystem): string {
  return `Under ${checkSpeed(minSpeedMph, units)} now: a pass here would not count.`
}
