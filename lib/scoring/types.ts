import type { ResolvedProfile } from "@/lib/drive-file/profile"
import type { DriveKind } from "@/lib/drive-file/road-test"
import type { RoadTestScore } from "./road-test"

export const VERDICTS = ["met", "short", "not_met", "unverified"] as const
export type Verdict = (typeof VERDICTS)[number]

type ConditionKey =
  | "cleared"
  | "time-limit"
  | "qualifying-time"
  | "following-time"
  | "verified"
  | "harsh-events"
  | "data-gaps"
  | "road-test"

export interface Condition {
  key: ConditionKey
  /** Short plain label for a meter or report row. */
  label: string
  met: boolean
  value: number | null
  required: number | null
  unit: "s" | "mph" | "events" | "checks"
  /** Advisory conditions are reported but never change the verdict. */
  advisory: boolean
  /** One plain sentence when not met. */
  reason?: string
}

/** The sums over a drive's intervals, as the engine adds them up and as a score reports them. */
export interface DriveSums {
  durationSeconds: number
  distanceMeters: number
  gapSeconds: number
  qualifyingSeconds: number
  followingSeconds: number
  qualifyingSecondsBeforeClear: number
  followingSecondsBeforeClear: number
  samplesUsed: number
  samplesDroppedForAccuracy: number
  duplicateSamples: number
  startedAtMs: number | null
  endedAtMs: number | null
}

export interface Score extends DriveSums {
  verdict: Verdict
  /** One sentence per unmet condition that decides the verdict. */
  reasons: string[]
  /** Sentences about advisory conditions (harsh events, data gaps); they never change the verdict. */
  notes: string[]
  clearedAtSeconds: number | null
  harshEvents: { accel: number; decel: number }
  /** Samples not used: over the accuracy limit plus repeated timestamps. */
  samplesDropped: number
  conditions: Condition[]
  profile: ResolvedProfile
  /** Version 2 files only: what the drive was for. */
  kind?: DriveKind
  /** Version 2 road tests only: every check with its result, speed and status. */
  roadTest?: RoadTestScore
}
