import { z } from "zod"
import { SENSORS } from "@/lib/labels"

// Road-test checks: what the crew confirms on the road after any driver-assist calibration. The defaults
// below are common practice, no published source; the vehicle maker's service information comes first,
// and a shop lead edits them per condition profile (each edit is a new profile version).

/** A check belongs to one of the systems a calibration task names (lib/labels SENSORS). */
export const ROAD_TEST_SYSTEMS = SENSORS
export type RoadTestSystem = (typeof ROAD_TEST_SYSTEMS)[number]

export const CHECK_RESULTS = ["pass", "fail", "not_equipped"] as const
export type CheckResult = (typeof CHECK_RESULTS)[number]

/** `required`: the check must pass; `where_equipped`: it may be marked not equipped instead. */
const CHECK_NEEDS = ["required", "where_equipped"] as const
type CheckNeed = (typeof CHECK_NEEDS)[number]

const CHECK_KEY_PATTERN = /^[a-z0-9]+(-[a-z0-9]+)*$/
const MAX_ROAD_TEST_CHECKS = 40

export const checkKeySchema = z
  .string({ error: (iss) => (iss.input === undefined ? "is required" : "must be text") })
  .min(2, { error: "must be at least 2 characters" })
  .max(60, { error: "must be at most 60 characters" })
  .regex(CHECK_KEY_PATTERN, { error: "must be lower-case letters and digits joined by dashes (e.g. lane-keeping)" })

const roadTestCheckSchema = z.object({
  key: checkKeySchema,
  system: z.enum(ROAD_TEST_SYSTEMS, { error: `must be one of ${ROAD_TEST_SYSTEMS.join(", ")}` }),
  label: z
    .string({ error: (iss) => (iss.input === undefined ? "is required" : "must be text") })
    .trim()
    .min(1, { error: "is required" })
    .max(200, { error: "must be at most 200 characters" }),
  /** Slowest speed at which a pass counts; null = any speed (a parking-lot check). */
  minSpeedMph: z
    .number({
      error: (iss) =>
        iss.input === undefined ? "is required (a number, or null for any speed)" : "must be a number or null",
    })
    .min(0, { error: "must be 0 mph or more" })
    .max(200, { error: "must be at most 200 mph" })
    .nullable(),
  need: z.enum(CHECK_NEEDS, { error: `must be one of ${CHECK_NEEDS.join(", ")}` }),
})
export type RoadTestCheck = z.output<typeof roadTestCheckSchema>

/** A list of checks whose keys are unique (a check mark names its check by key). */
export const roadTestChecksSchema = z
  .array(roadTestCheckSchema, { error: "must be an array" })
  .max(MAX_ROAD_TEST_CHECKS, { error: `must hold at most ${MAX_ROAD_TEST_CHECKS} checks` })
  .superRefine((checks, ctx) => {
    const seen = new Set<string>()
    checks.forEach((c, i) => {
      if (seen.has(c.key)) ctx.addIssue({ code: "custom", path: [i, "key"], message: `repeats the key "${c.key}"` })
      seen.add(c.key)
    })
  })

const check = (
  system: RoadTestSystem,
  key: string,
  label: string,
  minSpeedMph: number | null,
  need: CheckNeed,
): RoadTestCheck => Object.freeze({ key, system, label, minSpeedMph, need })

/** Corner and rear radars watch the same sides and the same cross traffic, so they share their checks. */
const sideRadarChecks = (system: RoadTestSystem): RoadTestCheck[] => [
  check(system, "blind-spot-left", "Blind-spot alert, left side, as a vehicle passes", 20, "required"),
  check(system, "blind-spot-right", "Blind-spot alert, right side, as a vehicle passes", 20, "required"),
  check(system, "rear-cross-traffic", "Rear cross-traffic alert reversing out of a space", null, "where_equipped"),
]

/**
 * Default checks per system: common practice, no published source. Speeds are typical engagement
 * speeds (adaptive cruise and lane keeping commonly from about 20 to 40 mph); the maker's figure wins.
 */
export const DEFAULT_ROAD_TEST_CHECKS: Readonly<Record<RoadTestSystem, readonly RoadTestCheck[]>> = Object.freeze({
  forward_radar: [
    check("forward_radar", "acc-engages", "Adaptive cruise engages at or above its speed", 25, "required"),
    check(
      "forward_radar",
      "acc-follows-lead",
      "Adaptive cruise holds a gap behind a lead vehicle and slows with it",
      25,
      "required",
    ),
  ],
  forward_camera: [
    check("forward_camera", "lane-keeping-engages", "Lane keeping or centring engages on marked lanes", 40, "required"),
    check("forward_camera", "lane-departure-warning", "Lane-departure warning on a lane line", 40, "required"),
    check("forward_camera", "sign-display", "Traffic-sign display shows the posted limit", null, "where_equipped"),
  ],
  corner_radar: sideRadarChecks("corner_radar"),
  rear_radar: sideRadarChecks("rear_radar"),
  surround_camera: [
    check(
      "surround_camera",
      "surround-views-aligned",
      "Each camera view lines up with its neighbours",
      null,
      "required",
    ),
    check(
      "surround_camera",
      "surround-guide-lines",
      "Guide lines are straight and where they belong",
      null,
      "required",
    ),
  ],
  other: [],
})

/** The default checks of one system (a fresh array). */
export function defaultRoadTestChecks(system: string | null | undefined): RoadTestCheck[] {
  const list = system && system in DEFAULT_ROAD_TEST_CHECKS ? DEFAULT_ROAD_TEST_CHECKS[system as RoadTestSystem] : []
  return list.map((c) => ({ ...c }))
}

/** A profile version's checks as stored; a version saved before road tests existed (null) has its sensor's defaults. */
export function storedRoadTestChecks(stored: RoadTestCheck[] | null, sensor: string | null): RoadTestCheck[] {
  return stored ?? defaultRoadTestChecks(sensor)
}

/** The checks of several systems in order; a key met twice (corner and rear radar share some) is kept once. */
export function mergeRoadTestChecks(lists: ReadonlyArray<readonly RoadTestCheck[]>): RoadTestCheck[] {
  const out: RoadTestCheck[] = []
  const seen = new Set<string>()
  for (const list of lists) {
    for (const c of list) {
      if (seen.has(c.key)) continue
      seen.add(c.key)
      out.push({ ...c })
    }
  }
  return out
}

/** What a drive is for: the radar drive learn, the road test after a calibration, or both in one drive. */
export const DRIVE_KINDS = ["learn", "road_test", "learn_and_road_test"] as const
export type DriveKind = (typeof DRIVE_KINDS)[number]

export function hasRoadTest(kind: DriveKind): boolean {
  return kind !== "learn"
}
export function hasLearn(kind: DriveKind): boolean {
  return kind !== "road_test"
}
