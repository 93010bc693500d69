import { z } from "zod"
import { DRIVE_KINDS, roadTestChecksSchema } from "@/lib/drive-file/road-test"
import { fastCheckSamples, isPlainObject } from "@/lib/drive-file/fast-check"
import { apiMarkSchema, profileSchema, sampleSchema } from "@/lib/drive-file/schema"
import { isTimestampText } from "@/lib/validation/storable"
import { isUuid } from "@/lib/validation/uuid"
import { VERDICTS } from "@/lib/scoring/types"

/** Samples in one POST; the recorder sends far fewer (a few seconds' worth, or 1,000 when catching up). */
const MAX_SAMPLES_PER_BATCH = 10_000
const MAX_MARKS_PER_POST = 500
/** Drive files sent to import or score: a long drive at 10 Hz is a few MB; room to spare. */
export const MAX_DRIVE_FILE_BYTES = 20 * 1024 * 1024

const uuid = z.uuid({ error: "must be a UUID" })

export const createDriveSchema = z.object({
  id: uuid.optional(),
  jobId: uuid.optional(),
  taskId: uuid.optional(),
  vehicleDescription: z.string().trim().max(200, { error: "must be at most 200 characters" }).optional(),
  profileKey: z.string().trim().min(1).max(100).optional(),
  profile: profileSchema.optional(),
  coDriverId: z.string().min(1).max(100).nullable().optional(),
  /** learn, road_test or learn_and_road_test; absent: from the task's method (static: road test, both: both). */
  kind: z.enum(DRIVE_KINDS, { error: `must be one of ${DRIVE_KINDS.join(", ")}` }).optional(),
  /** A road test's checks; absent: those of every system of the job. */
  roadTestChecks: roadTestChecksSchema.optional(),
})
export type CreateDriveInput = z.output<typeof createDriveSchema>

export const sampleBatchSchema = z.object({
  batchId: z
    .string({ error: "is required" })
    .min(1, { error: "is required" })
    .max(100, { error: "must be at most 100 characters" }),
  samples: z
    .array(sampleSchema, { error: "must be an array" })
    .max(MAX_SAMPLES_PER_BATCH, { error: `must hold at most ${MAX_SAMPLES_PER_BATCH} samples` }),
})

export type SampleBatch = z.output<typeof sampleBatchSchema>

/**
 * A sample batch as sampleBatchSchema outputs it, checked in one plain loop (lib/drive-file/fast-check.ts), or null
 * for anything it does not say yes to: then the schema decides, and names the problem in its usual words. The recorder
 * sends one every few seconds a phone; zod's object parse of each of its samples was most of its validation's cost.
 */
export function fastParseSampleBatch(input: unknown): SampleBatch | null {
  if (!isPlainObject(input)) return null
  const { batchId, samples } = input
  if (typeof batchId !== "string" || batchId.length < 1 || batchId.length > 100) return null
  if (!Array.isArray(samples) || samples.length > MAX_SAMPLES_PER_BATCH) return null
  const checked = fastCheckSamples(samples)
  return checked && { batchId, samples: checked }
}

export const markBatchSchema = z.object({
  marks: z
    .array(apiMarkSchema, { error: "must be an array" })
    .max(MAX_MARKS_PER_POST, { error: `must hold at most ${MAX_MARKS_PER_POST} marks` }),
})

const VERDICT_FILTERS = VERDICTS
const STATUS_FILTERS = ["recording", "finished"] as const

export const listDrivesQuery = z.object({
  verdict: z.enum(VERDICT_FILTERS, { error: `must be one of ${VERDICT_FILTERS.join(", ")}` }).optional(),
  status: z.enum(STATUS_FILTERS, { error: `must be one of ${STATUS_FILTERS.join(", ")}` }).optional(),
  cursor: z.string().max(200).optional(),
})

export const driveFileFormatQuery = z.object({
  format: z.enum(["drive", "gpx", "csv"], { error: "must be drive, gpx or csv" }).default("drive"),
})

export const importQuery = z.object({
  jobId: uuid.optional(),
  taskId: uuid.optional(),
})

/** A drive list's keyset position: a drive timestamp (ISO, with PostgreSQL's microseconds) and the drive id. */
export interface TimeCursor {
  time: string
  id: string
}

/** `time|id` of the last row of a page (the drive list's and the review queue's); null = not a cursor this server gives out. */
export function parseDriveCursor(cursor: string | undefined): TimeCursor | undefined | null {
  if (!cursor) return undefined
  const [time, id] = cursor.split("|")
  // The time keeps PostgreSQL's microseconds so that no row is skipped or repeated between pages.
  // A real date and a real UUID: the database would refuse anything else with an error, not a 400.
  if (!time || !id || !time.endsWith("Z") || !isTimestampText(time)) return null
  if (!isUuid(id)) return null
  return { time, id }
}
