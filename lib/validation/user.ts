import { z } from "zod"
import { ROLES } from "@/lib/auth/roles"

export const newUserSchema = z.object({
  email: z.string().trim().toLowerCase().email("must be an e-mail address").max(254),
  name: z.string().trim().min(1, "is required").max(120),
  role: z.enum(ROLES),
  password: z.string().min(12, "must be at least 12 characters").max(200),
})
export type NewUserInput = z.infer<typeof newUserSchema>

export const userChangeSchema = z
  .object({
    role: z.enum(ROLES).optional(),
    disabled: z.boolean().optional(),
    name: z.string().trim().min(1).max(120).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, "Nothing to change.")
