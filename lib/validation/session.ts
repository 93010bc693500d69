import { z } from "zod"

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().email("must be an e-mail address").max(254),
  password: z.string().min(1, "is required").max(200),
})
export type SignInInput = z.infer<typeof signInSchema>
