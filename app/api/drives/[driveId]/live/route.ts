import { z } from "zod"
import { livePoll, liveStream } from "@/app/_server/live"
import { parseQuery, route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"
import { driveForRoute } from "@/app/_server/services/drives"

export const dynamic = "force-dynamic"

const eventId = z
  .string()
  .regex(/^\d{1,15}$/, { error: "must be an event id (a whole number, 0 for all)" })
  .transform(Number)
const query = z.object({ after: eventId.optional() })

/**
 * The drive's live channel (DEVELOPERS.md "Live channel"): Server-Sent Events, resumed with the
 * `Last-Event-ID` header (or `?lastEventId=` where a client cannot set it). With `?after=<eventId>`
 * it answers once in JSON instead: the polling fallback.
 */
export const GET = route<{ driveId: string }>(async (req, ctx) => {
  const { db, drive } = await driveForRoute(ctx.params, "see")
  const url = new URL(req.url)
  const resumeRaw = req.headers.get("last-event-id") ?? url.searchParams.get("lastEventId")
  url.searchParams.delete("lastEventId")
  const { after } = parseQuery(new Request(url), query)
  if (after !== undefined)
    return Response.json(await livePoll(db, drive, after), { headers: { "cache-control": "no-store" } })
  let lastEventId: number | null = null
  if (resumeRaw !== null && resumeRaw !== "") {
    const parsed = eventId.safeParse(resumeRaw)
    if (!parsed.success)
      throw new AppError("validation_failed", "Last-Event-ID: must be an event id (a whole number)", {
        "Last-Event-ID": "must be an event id (a whole number)",
      })
    lastEventId = parsed.data
  }
  return liveStream(req, drive, lastEventId)
})
