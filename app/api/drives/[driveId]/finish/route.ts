import { publishDriveEvent, statusBody } from "@/app/_server/live"
import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"
import { driveForRoute, driveJson, finishAndScore } from "../../_service"

/** Scores the stored samples and marks against the frozen profile. Finishing again scores again (idempotent). */
export const POST = route<{ driveId: string }>(async (_req, ctx) => {
  const { db, drive } = await driveForRoute(ctx.params, "finish")
  if (drive.review_status !== null) throw new AppError("conflict", "This drive has been reviewed already.")
  const result = await db.transaction().execute(async (trx) => {
    const r = await finishAndScore(trx, drive)
    await publishDriveEvent(trx, r.drive, "status", statusBody(r.drive)) // every screen on the drive hears of it
    return r
  })
  return Response.json({ drive: driveJson(result.drive), score: result.score })
})
