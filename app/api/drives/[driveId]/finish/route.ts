import { publishDriveEvent, statusBody } from "@/app/_server/live"
import { noticeDriveWaiting, sendReviewMails } from "@/app/_server/review-notices"
import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"
import { driveForRoute, driveJson, finishAndScore } from "../../_service"

/** Scores the stored samples and marks against the frozen profile. Finishing again scores again (idempotent). */
export const POST = route<{ driveId: string }>(async (_req, ctx) => {
  const { db, drive } = await driveForRoute(ctx.params, "finish")
  if (drive.review_status !== null) throw new AppError("conflict", "This drive has been reviewed already.")
  const result = await db.transaction().execute(async (trx) => {
    const finished = await finishAndScore(trx, drive)
    await publishDriveEvent(trx, finished.drive, "status", statusBody(finished.drive)) // every screen on the drive hears of it
    // The first finish may put the drive in the review queue: tell the leads (finishing again only scores again).
    return { ...finished, mails: drive.status === "recording" ? await noticeDriveWaiting(trx, finished.drive, finished.score) : [] }
  })
  await sendReviewMails(result.mails)
  return Response.json({ drive: driveJson(result.drive), score: result.score })
})
