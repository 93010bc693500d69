import { z } from "zod"
import { AppError } from "@/lib/errors"
import { JOB_STATUSES, METHODS, REASONS, SENSORS } from "@/lib/labels"
import { vinSchema } from "@/lib/validation/vin"
import { uuidSchema } from "@/lib/validation/uuid"

// The job forms and tables import the task values and their words from here as well.
export {
  JOB_STATUS_LABEL,
  JOB_STATUSES,
  METHOD_LABEL,
  METHODS,
  REASON_LABEL,
  REASONS,
  SENSOR_LABEL,
  SENSORS,
} from "@/lib/labels"
export type { JobStatus, Method, Reason, Sensor } from "@/lib/labels"

// Forms send "" for an empty optional box; the API treats "" and a missing key alike.
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `must be at most ${max} characters`)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null))

const optionalEmail = z
  .string()
  .trim()
  .max(254)
  .optional()
  .nullable()
  .refine((v) => !v || z.email().safeParse(v).success, "must be an e-mail address")
  .transform((v) => (v ? v.toLowerCase() : null))

const optionalYear = z
  .union([z.number(), z.string()])
  .optional()
  .nullable()
  .transform((v, ctx) => {
    if (v === undefined || v === null || v === "") return null
    const n = typeof v === "number" ? v : Number(v)
    if (!Number.isInteger(n) || n < 1980 || n > 2100) {
      ctx.addIssue({ code: "custom", message: "must be a model year between 1980 and 2100" })
      return z.NEVER
    }
    return n
  })

const roNumberSchema = z.string().trim().min(1, "is required").max(40, "must be at most 40 characters")

const customerSchema = z.object({
  name: z.string().trim().min(1, "is required").max(120, "must be at most 120 characters"),
  email: optionalEmail,
  phone: optionalText(40),
})

const vehicleSchema = z.object({
  vin: vinSchema,
  year: optionalYear,
  make: optionalText(60),
  model: optionalText(60),
  plate: optionalText(20),
})

const taskSchema = z.object({
  id: uuidSchema.optional(),
  sensor: z.enum(SENSORS, { error: "must be one of " + SENSORS.join(", ") }),
  method: z.enum(METHODS, { error: "must be one of " + METHODS.join(", ") }),
  reason: z.enum(REASONS, { error: "must be one of " + REASONS.join(", ") }),
  // "" (a form's blank choice) = not named: the current or the sensor's default profile.
  profileId: z
    .union([z.uuid(), z.literal("")], { error: "must be a condition profile id" })
    .optional()
    .nullable()
    .transform((v) => (v === "" ? undefined : v)),
})

export const newJobSchema = z.object({
  roNumber: roNumberSchema,
  customer: customerSchema,
  vehicle: vehicleSchema,
  tasks: z.array(taskSchema).min(1, "add at least one calibration").max(12, "at most 12 calibrations per job"),
})
export type NewJobInput = z.input<typeof newJobSchema>
export type NewJob = z.output<typeof newJobSchema>

/** PATCH: every part optional; `tasks` replaces the list (tasks keep their id; a task without one is new). */
export const jobChangeSchema = z
  .object({
    roNumber: roNumberSchema.optional(),
    customer: customerSchema.optional(),
    vehicle: vehicleSchema.optional(),
    tasks: newJobSchema.shape.tasks.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), "Nothing to change.")

const JOB_SORTS = ["createdAt", "updatedAt", "roNumber", "customer", "status"] as const
export type JobSort = (typeof JOB_SORTS)[number]

export const jobListQuerySchema = z.object({
  status: z.enum(JOB_STATUSES, { error: "must be one of " + JOB_STATUSES.join(", ") }).optional(),
  q: z.string().trim().max(100).optional(),
  cursor: z.string().max(400).optional(),
  sort: z.enum(JOB_SORTS).default("createdAt"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  limit: z.coerce.number().int().min(1).max(100).default(25),
})

export function duplicateRoError(roNumber: string) {
  return new AppError("conflict", `RO ${roNumber} is already a job in this shop.`, {
    roNumber: "is already used by another job",
  })
}
