import type { MarkKind } from "@/lib/drive-file/schema"

// The task values of the API contract (shared/specs/api.md) and the words people read for them.
// No zod here: the recorder's client bundle imports this file.

export const SENSORS = [
  "forward_radar",
  "forward_camera",
  "corner_radar",
  "rear_radar",
  "surround_camera",
  "other",
] as const
export const METHODS = ["dynamic", "static", "both"] as const
export const REASONS = [
  "removed_and_reinstalled",
  "replaced",
  "bumper_or_grille_work",
  "windshield_replaced",
  "wheel_alignment",
  "fault_code",
  "service_bulletin",
  "other",
] as const
export const JOB_STATUSES = ["open", "drive", "review", "complete", "redo"] as const

export type Sensor = (typeof SENSORS)[number]
export type Method = (typeof METHODS)[number]
export type Reason = (typeof REASONS)[number]
export type JobStatus = (typeof JOB_STATUSES)[number]
export const REVIEW_DECISIONS = ["approve", "redo"] as const
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number]
/** A drive's review outcome as stored on the drive row. */
export type ReviewStatus = "approved" | "redo"

/** Complete for its keys; a stored value outside them (an older row) reads as undefined, so callers fall back to the raw value. */
export type LabelTable<K extends string> = Readonly<Record<K, string>> & Readonly<Partial<Record<string, string>>>

export const SENSOR_LABEL: LabelTable<Sensor> = {
  forward_radar: "Forward radar",
  forward_camera: "Forward camera",
  corner_radar: "Corner radar",
  rear_radar: "Rear radar",
  surround_camera: "Surround camera",
  other: "Other sensor",
}

export const METHOD_LABEL: LabelTable<Method> = {
  dynamic: "Drive learn (dynamic)",
  static: "Target set-up (static)",
  both: "Static, then a drive",
}

export const REASON_LABEL: LabelTable<Reason> = {
  removed_and_reinstalled: "Sensor removed and put back",
  replaced: "Sensor replaced",
  bumper_or_grille_work: "Bumper or grille work",
  windshield_replaced: "Windshield replaced",
  wheel_alignment: "Wheel alignment",
  fault_code: "Fault code set",
  service_bulletin: "Service bulletin",
  other: "Other reason",
}

export const JOB_STATUS_LABEL: LabelTable<JobStatus> = {
  open: "Open",
  drive: "Driving",
  review: "Needs review",
  complete: "Complete",
  redo: "Drive again",
}

export const MARK_LABEL: LabelTable<MarkKind> = {
  "lead-on": "Lead on",
  gap: "Gap",
  "lead-off": "Lead off",
  // The file value stays `cleared`; on screen it is the vehicle reporting its learn done (DESIGN.md word table).
  cleared: "Learn complete",
  stopped: "Stopped",
  verified: "Verified",
  "verify-failed": "Verify failed",
  note: "Note",
  check: "Road-test check",
}
