import { z } from "zod"
import { REVIEW_DECISIONS } from "@/lib/labels"

const REVIEW_NOTE_MAX_CHARS = 2000

/** A redo needs a note saying what to do differently; an approval may carry one. */
export const reviewSchema = z
  .object({
    decision: z.enum(REVIEW_DECISIONS, { error: "must be approve or redo" }),
    note: z
      .string({ error: "must be text" })
      .trim()
      .max(REVIEW_NOTE_MAX_CHARS, { error: `must be at most ${REVIEW_NOTE_MAX_CHARS} characters` })
      .default(""),
  })
  .superRefine((v, ctx) => {
    if (v.decision === "redo" && v.note === "") {
      ctx.addIssue({
        code: "custom",
        path: ["note"],
        message: "is required to send a drive back: say what to do differently",
      })
    }
  })
export type ReviewInput = z.infer<typeof reviewSchema>

export const recordEmailSchema = z.object({
  to: z
    .string({ error: "must be an e-mail address" })
    .trim()
    .max(254)
    .pipe(z.email({ error: "must be an e-mail address" })),
})

/** How long a share link lasts unless the lead says otherwise, and the longest it may. */
export const SHARE_DEFAULT_DAYS = 14
const SHARE_MAX_DAYS = 90

export const shareSchema = z.object({
  expiresInDays: z
    .number({ error: "must be a number of days" })
    .int({ error: "must be a whole number of days" })
    .min(1, { error: "must be at least 1 day" })
    .max(SHARE_MAX_DAYS, { error: `must be at most ${SHARE_MAX_DAYS} days` })
    .optional(),
})

export const markReadSchema = z.union(
  [
    z.object({ all: z.literal(true) }),
    z.object({
      ids: z
        .array(z.uuid({ error: "must be a notice id" }))
        .min(1)
        .max(100),
    }),
  ],
  { error: 'must be {"all": true} or {"ids": [...]} with 1 to 100 notice ids' },
)
