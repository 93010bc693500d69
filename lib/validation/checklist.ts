import { z } from "zod"

export const FUEL_LEVELS = ["reserve", "1/4", "1/2", "3/4", "full"] as const
export type FuelLevel = (typeof FUEL_LEVELS)[number]
export const FUEL_LABEL: Record<FuelLevel, string> = {
  reserve: "Reserve (light on)",
  "1/4": "1/4 tank",
  "1/2": "1/2 tank",
  "3/4": "3/4 tank",
  full: "Full",
}

const PRESSURE_UNITS = ["psi", "kPa"] as const
export type PressureUnit = (typeof PRESSURE_UNITS)[number]
export const WHEELS = ["fl", "fr", "rl", "rr"] as const
export type Wheel = (typeof WHEELS)[number]
export const WHEEL_LABEL: Record<Wheel, string> = {
  fl: "Front left",
  fr: "Front right",
  rl: "Rear left",
  rr: "Rear right",
}

// A form's number box yields "" or a string; numbers pass through.
const pressure = z.union([z.number(), z.string()]).transform((v, ctx) => {
  const n = typeof v === "number" ? v : v.trim() === "" ? Number.NaN : Number(v)
  if (!Number.isFinite(n) || n <= 0 || n > 1500) {
    ctx.addIssue({ code: "custom", message: "must be a pressure above 0" })
    return z.NEVER
  }
  return n
})

const faultCode = z
  .string()
  .trim()
  .toUpperCase()
  .min(1)
  .max(20, "must be at most 20 characters")
  .regex(/^[A-Z0-9-]+$/, "must be letters, digits or dashes (e.g. U0415 or C1A67-54)")

export const checklistSchema = z
  .object({
    faultCodes: z.object({
      none: z.boolean(),
      expected: z.array(faultCode).max(30, "at most 30 codes"),
    }),
    tires: z.object({
      unit: z.enum(PRESSURE_UNITS),
      placard: pressure,
      fl: pressure,
      fr: pressure,
      rl: pressure,
      rr: pressure,
    }),
    loadNormal: z.boolean(),
    fuelLevel: z.enum(FUEL_LEVELS, { error: "must be one of " + FUEL_LEVELS.join(", ") }),
    sensorClean: z.boolean(),
    mountUndamaged: z.boolean(),
    alignmentChecked: z.boolean().nullable(),
    notes: z.string().max(2000, "must be at most 2000 characters").default(""),
  })
  .superRefine((c, ctx) => {
    if (c.faultCodes.none && c.faultCodes.expected.length > 0) {
      ctx.addIssue({
        code: "custom",
        path: ["faultCodes", "expected"],
        message: "must be empty when no fault codes are stored",
      })
    }
  })

export type ChecklistInput = z.input<typeof checklistSchema>
export type ChecklistData = z.output<typeof checklistSchema>
