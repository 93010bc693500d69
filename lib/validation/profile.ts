import { z } from "zod"
import { profileSchema, roadTestChecksSchema } from "@/lib/drive-file"
import { isTimeZone } from "@/lib/format"
import { SENSORS } from "@/lib/labels"

const profileKeySchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(2, "must be at least 2 characters")
  .max(60, "must be at most 60 characters")
  .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, "must be lower-case letters and digits joined by dashes (e.g. forward-radar)")

/** Profile settings are a drive file's `profile`; stored resolved (every key filled) in each version. */
export const profileSettingsSchema = profileSchema

export const newProfileSchema = z.object({
  key: profileKeySchema.optional(),
  name: z.string().trim().min(1, "is required").max(120, "must be at most 120 characters"),
  sensor: z.enum(SENSORS).nullable().optional(),
  settings: profileSettingsSchema.default({}),
  /** Absent: the defaults of the profile's sensor (lib/drive-file/road-test.ts). */
  roadTestChecks: roadTestChecksSchema.optional(),
})

export const profileChangeSchema = z
  .object({
    name: z.string().trim().min(1, "is required").max(120).optional(),
    sensor: z.enum(SENSORS).nullable().optional(),
    archived: z.boolean().optional(),
    settings: profileSettingsSchema.optional(),
    roadTestChecks: roadTestChecksSchema.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), "Nothing to change.")

export function keyFromName(name: string): string {
  const key = name
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60)
    .replace(/-+$/g, "")
  return key.length >= 2 ? key : `profile-${key || "x"}`
}

const unitsField = z.enum(["imperial", "metric"])
const timeZoneField = z.string().max(64).refine(isTimeZone, "must be a time zone name such as America/Chicago")

/** The settings page's units and time zone form. */
export const shopFormatSchema = z.object({ units: unitsField, timeZone: timeZoneField })

export const shopSettingsSchema = z
  .object({
    units: unitsField.optional(),
    tirePressureTolerancePsi: z
      .number()
      .min(0.5, "must be at least 0.5 psi")
      .max(15, "must be at most 15 psi")
      .optional(),
    timeZone: timeZoneField.optional(),
    location: z
      .object({ lat: z.number().min(-90).max(90), lon: z.number().min(-180).max(180) })
      .nullable()
      .optional(),
    /** false turns road knowledge off and removes the shop's road model. */
    roadKnowledge: z.boolean().optional(),
    /** Whole months of samples to keep before the current month; null keeps everything (the default). */
    sampleRetentionMonths: z
      .number({ error: "must be a whole number of months, or null to keep everything" })
      .int("must be a whole number of months")
      .min(1, "must be at least 1 month")
      .max(120, "must be at most 120 months")
      .nullable()
      .optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), "Nothing to change.")
