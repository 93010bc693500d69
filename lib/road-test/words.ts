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

export const DRIVE_KIND_LABEL: Readonly<Record<string, string>> = {
  learn: "Drive learn",
  road_test: "Road test",
  learn_and_road_test: "Drive learn and road test",
}

export function checkSpeedWords(minSpeedMph: number | null): string {
  return minSpeedMph === null ? "any speed" : `${minSpeedMph} mph or faster`
}
