import { z } from "zod"
import { CHECK_RESULTS, DRIVE_KINDS, checkKeySchema, roadTestChecksSchema } from "./road-test"

export const DRIVE_FORMAT = "straightaway.drive/1" as const

export const MARK_KINDS = [
  "lead-on",
  "gap",
  "lead-off",
  "cleared",
  "stopped",
  "verified",
  "verify-failed",
  "note",
] as const
/** Version 2 adds the road-test `check` mark (see lib/drive-file/FORMAT-2.md). */
const MARK_KINDS_2 = [...MARK_KINDS, "check"] as const
export type MarkKind = (typeof MARK_KINDS_2)[number]

const NOTE_MAX_CHARS = 2000

// Every check carries its own plain message; issueMessage() covers zod's generic type errors.
const finite = (what: string) => z.number({ error: (iss) => typeMessage(iss.input, what) })
const nonNegative = (unit: string) => finite("a number").min(0, { error: `must be 0 ${unit} or more` })
const nullableNonNegative = (unit: string) => nonNegative(unit).nullable().optional()
const positive = (unit: string) => finite("a number").gt(0, { error: `must be more than 0 ${unit}` })

const timeMs = finite("a number")
  .int({ error: "must be a whole number of milliseconds" })
  .min(0, { error: "must be 0 or more (milliseconds since 1970-01-01 UTC)" })

export const sampleSchema = z.object({
  t: timeMs,
  lat: finite("a number")
    .min(-90, { error: "must be between -90 and 90" })
    .max(90, { error: "must be between -90 and 90" }),
  lon: finite("a number")
    .min(-180, { error: "must be between -180 and 180" })
    .max(180, { error: "must be between -180 and 180" }),
  speed: nullableNonNegative("m/s"),
  accuracy: nullableNonNegative("m"),
})

const markObject = z.object({
  t: timeMs,
  kind: z.enum(MARK_KINDS, { error: `must be one of ${MARK_KINDS.join(", ")}` }),
  gapFt: nullableNonNegative("ft"),
  text: z
    .string({ error: (iss) => typeMessage(iss.input, "text") })
    .max(NOTE_MAX_CHARS, { error: `must be at most ${NOTE_MAX_CHARS} characters` })
    .optional(),
})

const markObject2 = markObject.extend({
  kind: z.enum(MARK_KINDS_2, { error: `must be one of ${MARK_KINDS_2.join(", ")}` }),
  checkKey: checkKeySchema.optional(),
  result: z.enum(CHECK_RESULTS, { error: `must be one of ${CHECK_RESULTS.join(", ")}` }).optional(),
})

type MarkShape = z.output<typeof markObject2>

function checkMarkFields(mark: MarkShape, ctx: z.core.$RefinementCtx<MarkShape>) {
  if (mark.kind === "check") {
    if (mark.checkKey === undefined)
      ctx.addIssue({ code: "custom", path: ["checkKey"], message: "is required for a check mark" })
    if (mark.result === undefined)
      ctx.addIssue({ code: "custom", path: ["result"], message: "is required for a check mark" })
  }
  if (mark.kind === "gap" && (mark.gapFt === undefined || mark.gapFt === null)) {
    ctx.addIssue({ code: "custom", path: ["gapFt"], message: "is required for a gap mark" })
  }
  if (mark.kind === "note" && (mark.text === undefined || mark.text.trim() === "")) {
    ctx.addIssue({ code: "custom", path: ["text"], message: "is required for a note mark" })
  }
}

export const markSchema = markObject.superRefine(checkMarkFields)
/** A mark of a `straightaway.drive/2` file: version 1's kinds plus `check` with `checkKey` and `result`. */
const markSchema2 = markObject2.superRefine(checkMarkFields)

/** A mark posted to the API: the file's mark plus a client-made id so a replayed batch stores once. */
export const apiMarkSchema = markObject2
  .extend({ id: z.uuid({ error: "must be a UUID" }) })
  .superRefine(checkMarkFields)

export const profileSchema = z
  .object(
    {
      minSpeedMph: nonNegative("mph").optional(),
      maxSpeedMph: positive("mph").nullable().optional(),
      leadGapFt: z
        .object(
          { min: nonNegative("ft").optional(), max: nonNegative("ft").optional() },
          { error: (iss) => typeMessage(iss.input, "an object") },
        )
        .optional(),
      minQualifyingMinutes: nonNegative("minutes").optional(),
      minFollowingMinutes: nonNegative("minutes").optional(),
      maxDriveMinutes: positive("minutes").optional(),
      maxAccelMps2: positive("m/s²").optional(),
      maxDecelMps2: positive("m/s²").optional(),
      maxGapSeconds: positive("s").optional(),
      maxAccuracyM: nonNegative("m").optional(),
      verifySpeedMph: nonNegative("mph").optional(),
    },
    { error: (iss) => typeMessage(iss.input, "an object") },
  )
  .superRefine((p, ctx) => {
    const min = p.leadGapFt?.min ?? 100
    const max = p.leadGapFt?.max ?? 165
    if (min > max) {
      ctx.addIssue({
        code: "custom",
        path: ["leadGapFt", "max"],
        message: `must be at least leadGapFt.min (${min} ft)`,
      })
    }
    const minSpeed = p.minSpeedMph ?? 35
    if (p.maxSpeedMph !== undefined && p.maxSpeedMph !== null && p.maxSpeedMph < minSpeed) {
      ctx.addIssue({ code: "custom", path: ["maxSpeedMph"], message: `must be at least minSpeedMph (${minSpeed} mph)` })
    }
  })

export const driveFileSchema = z.object(
  {
    format: z.literal(DRIVE_FORMAT, { error: `must be "${DRIVE_FORMAT}"` }),
    profile: profileSchema.optional(),
    samples: z.array(sampleSchema, { error: (iss) => typeMessage(iss.input, "an array") }),
    marks: z.array(markSchema, { error: (iss) => typeMessage(iss.input, "an array") }),
  },
  { error: (iss) => typeMessage(iss.input, "a JSON object") },
)

export const DRIVE_FORMAT_2 = "straightaway.drive/2" as const

/** `straightaway.drive/2`: version 1 plus what the drive is for and the road-test checks it is held to. */
export const driveFileSchema2 = z
  .object(
    {
      format: z.literal(DRIVE_FORMAT_2, { error: `must be "${DRIVE_FORMAT_2}"` }),
      kind: z.enum(DRIVE_KINDS, { error: `must be one of ${DRIVE_KINDS.join(", ")}` }),
      profile: profileSchema.optional(),
      roadTest: z
        .object({ checks: roadTestChecksSchema }, { error: (iss) => typeMessage(iss.input, "an object") })
        .optional(),
      samples: z.array(sampleSchema, { error: (iss) => typeMessage(iss.input, "an array") }),
      marks: z.array(markSchema2, { error: (iss) => typeMessage(iss.input, "an array") }),
    },
    { error: (iss) => typeMessage(iss.input, "a JSON object") },
  )
  .superRefine((file, ctx) => {
    const checks = file.roadTest?.checks ?? []
    if (file.kind !== "learn" && checks.length === 0) {
      ctx.addIssue({
        code: "custom",
        path: ["roadTest", "checks"],
        message: `must hold at least one check for a ${file.kind} drive`,
      })
    }
    const keys = new Set(checks.map((c) => c.key))
    file.marks.forEach((m, i) => {
      if (m.kind === "check" && m.checkKey !== undefined && !keys.has(m.checkKey)) {
        ctx.addIssue({
          code: "custom",
          path: ["marks", i, "checkKey"],
          message: "is not one of the file's roadTest.checks",
        })
      }
    })
  })

export type Sample = z.output<typeof sampleSchema>
export type Mark = z.output<typeof markSchema>
/** A mark of either version (version 1 marks are the subset without `check`). */
export type Mark2 = z.output<typeof markSchema2>
export type ApiMark = z.output<typeof apiMarkSchema>
export type Profile = z.output<typeof profileSchema>
export type DriveFile = z.output<typeof driveFileSchema>
export type DriveFile2 = z.output<typeof driveFileSchema2>
/** A drive file of either version; scoreDrive takes both and scores version 1 exactly as before. */
export type AnyDriveFile = DriveFile | DriveFile2

function typeMessage(input: unknown, what: string): string {
  if (input === undefined) return "is required"
  if (typeof input === "number" && !Number.isFinite(input)) return "must be a finite number"
  return `must be ${what}`
}
