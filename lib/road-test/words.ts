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

/** A check's speed (kept in mph, drive-file format) in the shop's units: "30 mph or faster", "48 km/h or faster". */
export function checkSpeedWords(minSpeedMph: number | null, units: UnitSystem): string {
  return minSpeedMph === null ? "any speed" : `${formatSpeedMph(minSpeedMph, units)} or faster`
}

/** Said under a check while the vehicle is slower than the check's speed. */
export function checkTooSlowWords(minSpeedMph: number, units: UnitSystem): string {
  return `Under ${formatSpeedMph(minSpeedMph, units)} now: a pass here would not count.`
}
