import type { CheckResult } from "@/lib/drive-file/road-test"

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

export function checkSpeedWords(minSpeedMph: number | null): string {
  return minSpeedMph === null ? "any speed" : `${minSpeedMph} mph or faster`
}
