import { z } from "zod"

// The static set-up record of a task: measurements the technician types from the vehicle maker's service
// information (Straightaway holds no maker's values), the scan tool's result, and photos (job uploads).

export const SETUP_MEASUREMENT_KEYS = [
  "target_distance",
  "target_height",
  "lateral_offset",
  "floor_level",
  "thrust_angle",
  "other",
] as const
export type SetupMeasurementKey = (typeof SETUP_MEASUREMENT_KEYS)[number]

export const SETUP_MEASUREMENT_LABEL: Readonly<Record<SetupMeasurementKey, string>> = {
  target_distance: "Target distance",
  target_height: "Target height",
  lateral_offset: "Lateral offset from the centre line",
  floor_level: "Floor level over the area",
  thrust_angle: "Thrust angle (alignment printout)",
  other: "Other measurement",
}

export const SCAN_RESULTS = ["not_run", "pass", "fail"] as const
export type ScanResult = (typeof SCAN_RESULTS)[number]
export const SCAN_RESULT_LABEL: Readonly<Record<ScanResult, string>> = {
  not_run: "Not run yet",
  pass: "Calibration reported complete, no fault codes",
  fail: "Calibration failed or fault codes stored",
}

const finite = (what: string) =>
  z
    .number({ error: (iss) => (iss.input === undefined ? "is required" : `must be ${what}`) })
    .refine(Number.isFinite, { error: "must be a finite number" })

const setupMeasurementSchema = z
  .object({
    key: z.enum(SETUP_MEASUREMENT_KEYS, { error: `must be one of ${SETUP_MEASUREMENT_KEYS.join(", ")}` }),
    label: z.string().trim().max(120, { error: "must be at most 120 characters" }).optional(),
    value: finite("a number"),
    specified: finite("a number"),
    tolerance: finite("a number").refine((x) => x >= 0, { error: "must be 0 or more" }),
    unit: z
      .string({ error: "is required" })
      .trim()
      .min(1, { error: "is required (mm, in, °, ...)" })
      .max(12, { error: "must be at most 12 characters" }),
  })
  .superRefine((m, ctx) => {
    if (m.key === "other" && !m.label)
      ctx.addIssue({ code: "custom", path: ["label"], message: "is required for an other measurement" })
  })
export type SetupMeasurement = z.output<typeof setupMeasurementSchema>

export const setupInputSchema = z.object({
  measurements: z
    .array(setupMeasurementSchema, { error: "must be an array" })
    .max(30, { error: "must hold at most 30 measurements" }),
  scanResult: z.enum(SCAN_RESULTS, { error: `must be one of ${SCAN_RESULTS.join(", ")}` }),
  scanNotes: z.string().trim().max(2000, { error: "must be at most 2000 characters" }).optional(),
})
export type SetupInput = z.output<typeof setupInputSchema>

/** A figure as typed in a box: blank is no number; a decimal comma reads as a point. */
export function typedNumber(text: string): number {
  return text.trim() === "" ? Number.NaN : Number(text.replace(",", "."))
}

/** One measurement row of the set-up form: the text in its boxes. */
const setupFormRowSchema = z.object({
  key: setupMeasurementSchema.shape.key,
  label: z.string(),
  value: z.string(),
  specified: z.string(),
  tolerance: z.string(),
  unit: z.string(),
})
export type SetupFormRow = z.output<typeof setupFormRowSchema>

/** The rows of the form that go to the API, by index: those with a figure typed (blank rows are left out). */
export function sentRows(rows: readonly Pick<SetupFormRow, "value" | "specified" | "tolerance">[]): number[] {
  return rows.flatMap((r, i) => (r.value || r.specified || r.tolerance ? [i] : []))
}

/** A path in the API's body (`measurements.1.value`) as the path in the form, whose rows include blank ones. */
function onFormRows(path: readonly PropertyKey[], sent: readonly number[]): PropertyKey[] {
  const row = path[0] === "measurements" ? sent[Number(path[1])] : undefined
  return row === undefined ? [...path] : ["measurements", row, ...path.slice(2)]
}

/** The API's field problems (`fields` of its error shape, dotted paths) on the form's rows. */
export function setupFieldsOnFormRows(fields: Record<string, string>, sent: readonly number[]): Record<string, string> {
  return Object.fromEntries(
    Object.entries(fields).map(([path, message]) => [onFormRows(path.split("."), sent).join("."), message]),
  )
}

/**
 * The set-up form's values (text boxes) to the API's body, checked by setupInputSchema itself: the same rules and
 * words as the API, each problem on the row it belongs to.
 */
export const setupFormSchema = z
  .object({
    measurements: z.array(setupFormRowSchema),
    scanResult: setupInputSchema.shape.scanResult,
    scanNotes: z.string(),
  })
  .transform((form, ctx) => {
    const sent = sentRows(form.measurements)
    const body = setupInputSchema.safeParse({
      measurements: sent.map((i) => {
        const { key, label, value, specified, tolerance, unit } = form.measurements[i]!
        return {
          key,
          ...(label.trim() ? { label } : {}),
          value: typedNumber(value),
          specified: typedNumber(specified),
          tolerance: typedNumber(tolerance),
          unit,
        }
      }),
      scanResult: form.scanResult,
      scanNotes: form.scanNotes,
    })
    if (body.success) return body.data
    for (const issue of body.error.issues)
      ctx.addIssue({ code: "custom", message: issue.message, path: onFormRows(issue.path, sent) })
    return z.NEVER
  })
export type SetupFormValues = z.input<typeof setupFormSchema>

export const setupOverrideSchema = z.object({
  note: z
    .string({ error: "is required: say why the road test may go ahead" })
    .trim()
    .min(1, { error: "is required: say why the road test may go ahead" })
    .max(2000, { error: "must be at most 2000 characters" }),
})

/** Outside the tolerance the shop typed: |value - specified| > tolerance (a small allowance for decimal input). */
export function isOutOfTolerance(m: Pick<SetupMeasurement, "value" | "specified" | "tolerance">): boolean {
  return Math.abs(m.value - m.specified) > m.tolerance + 1e-9
}

export function measurementLabel(m: Pick<SetupMeasurement, "key" | "label">): string {
  return m.label || SETUP_MEASUREMENT_LABEL[m.key]
}

/** `Target distance 1520 mm (specified 1500 ± 10 mm)` */
export function describeMeasurement(m: SetupMeasurement): string {
  return `${measurementLabel(m)} ${fmt(m.value)} ${m.unit} (specified ${fmt(m.specified)} ± ${fmt(m.tolerance)} ${m.unit})`
}

function fmt(x: number): string {
  return String(Math.round(x * 1000) / 1000)
}
