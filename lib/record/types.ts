import type { Score } from "@/lib/scoring/types"
import type { TimelinePoint } from "./timeline"

export interface RecordPhoto {
  filename: string
  contentType: string
  bytes: Uint8Array
}

export interface RecordMark {
  t: number
  kind: string
  gapFt: number | null
  text: string | null
  byName: string | null
}

export interface ChecklistRow {
  label: string
  value: string
  /** null = shown for information, not a pass/fail check. */
  ok: boolean | null
}

export interface RecordMeasurement {
  label: string
  value: number
  specified: number
  tolerance: number
  unit: string
  outOfTolerance: boolean
}

export interface RecordCheck {
  label: string
  need: string
  minSpeedMph: number | null
  status: string
  speedMph: number | null
}

/** One system of the job on the record: its static set-up, its learn drives and its road-test checks (issue 13). */
export interface CalibrationRecord {
  sensor: string
  method: string
  reason: string
  setup: {
    measurements: RecordMeasurement[]
    scanResult: string
    scanNotes: string
    override: { note: string; by: string | null; at: string | null } | null
    recordedBy: string | null
    recordedAt: string | null
  } | null
  learnDrives: Array<{ driveId: string; verdict: string | null; startedAt: string; thisDrive: boolean }>
  roadTest: {
    driveId: string
    verdict: string | null
    thisDrive: boolean
    checks: RecordCheck[]
  } | null
  cautions: string[]
}

/** Which revision of the record a PDF is, and how to check it (DEVELOPERS.md "Record revisions and verification"). */
export interface RecordSeal {
  revision: number
  revisedAt: string
  /** The short verification code, `XXXX-XXXX-XXXX`. */
  code: string
  /** The public verify page, APP_URL + /verify. */
  verifyUrl: string
}

/** Everything the drive record shows, as plain data: the PDF, the share page and the detail page read this. */
export interface RecordData {
  driveId: string
  shopName: string
  job: { roNumber: string; customerName: string } | null
  vehicle: { vin: string; year: number | null; make: string | null; model: string | null; plate: string | null } | null
  vehicleDescription: string | null
  task: { sensor: string; method: string; reason: string } | null
  profileName: string | null
  checklist: { rows: ChecklistRow[]; notes: string; completedBy: string | null; completedAt: string | null } | null
  photos: RecordPhoto[]
  score: Score
  timeline: TimelinePoint[]
  marks: RecordMark[]
  driverName: string | null
  coDriverName: string | null
  markLoggers: string[]
  review: { decision: "approve" | "redo"; note: string; reviewerName: string | null; at: string } | null
  startedAt: string | null
  finishedAt: string | null
  generatedAt: string
  /** Per system of the job: set-up, learn drive, road test (absent on records made before road tests). */
  calibrations?: CalibrationRecord[]
  /** The shop's choices for every number and time a person reads (lib/format); absent = US customary, US Central. */
  units?: "imperial" | "metric"
  timeZone?: string
  /** Set when the record is issued as a PDF: its revision and verification code. */
  seal?: RecordSeal
}
