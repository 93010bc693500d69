import { z } from "zod"

/** What a person sets for themselves. */
export const mySettingsSchema = z.object({ reviewMail: z.boolean() }).strict()
