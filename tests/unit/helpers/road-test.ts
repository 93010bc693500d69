import type { DriveFile2, Mark2, RoadTestCheck } from "@/lib/drive-file"
import { T0, samplesWithSpeeds } from "./drive"

// Road-test drive files built in code for the scoring tests; tests/unit/drive-file-schema.test.ts
// validates them against lib/drive-file/schema/drive-2.schema.json too.

/** 8 m/s (17.9 mph) for the first 20 s, then 20 m/s (44.7 mph) until 120 s. */
export const ROAD_SPEEDS = [...Array.from({ length: 21 }, () => 8), ...Array.from({ length: 100 }, () => 20)]

export const CHECKS: RoadTestCheck[] = [
  { key: "acc-engages", system: "forward_radar", label: "Adaptive cruise engages", minSpeedMph: 25, need: "required" },
  {
    key: "lane-keeping-engages",
    system: "forward_camera",
    label: "Lane keeping engages",
    minSpeedMph: 40,
    need: "required",
  },
  { key: "sign-display", system: "forward_camera", label: "Sign display", minSpeedMph: null, need: "where_equipped" },
]

export function check(s: number, checkKey: string, result: "pass" | "fail" | "not_equipped"): Mark2 {
  return { t: T0 + Math.round(s * 1000), kind: "check", checkKey, result }
}

export function roadTest(marks: Mark2[], checks: RoadTestCheck[] = CHECKS): DriveFile2 {
  return {
    format: "straightaway.drive/2",
    kind: "road_test",
    roadTest: { checks },
    samples: samplesWithSpeeds(ROAD_SPEEDS),
    marks,
  }
}

/** Every required check passed at speed and the where-equipped one marked not equipped. */
export function metRoadTest(): DriveFile2 {
  return roadTest([
    check(30, "acc-engages", "pass"),
    check(50, "lane-keeping-engages", "pass"),
    check(60, "sign-display", "not_equipped"),
  ])
}
