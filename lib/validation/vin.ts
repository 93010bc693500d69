import { z } from "zod"

import { checkVin } from "@/lib/vin"

/** A VIN for forms and handlers: trimmed and uppercased, then held to 49 CFR 565 by checkVin. */
export const vinSchema = z
  .string()
  .trim()
  .toUpperCase()
  .superRefine((vin, ctx) => {
    const result = checkVin(vin)
    if (!result.valid) ctx.addIssue({ code: "custom", message: result.problems[0] })
  })
