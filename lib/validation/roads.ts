import { z } from "zod"

export const WEEKDAY_KEYS = ["sunday", "monday", "tuesday", "wednesday", "thursday", "friday", "saturday"] as const

/** The Roads page and /api/roads: which hour and kind of day to show ("now" = the shop's current one). */
export const roadsQuery = z.object({
  hour: z
    .union([
      z.enum(["now", "all"]),
      z.coerce.number().int("must be a whole hour").min(0, "must be 0 to 23").max(23, "must be 0 to 23"),
    ])
    .default("now"),
  /** "now": the shop's weekday today, falling back to its kind of day, then any day, when the history is thin */
  day: z.enum(["now", "weekday", "weekend", "all", ...WEEKDAY_KEYS]).default("now"),
  profileId: z.string().uuid("must be a profile id").optional(),
})
export type RoadsQuery = z.output<typeof roadsQuery>
