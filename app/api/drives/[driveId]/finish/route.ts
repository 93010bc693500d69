import { publishDriveEvent, statusBody } from "@/app/_server/live"
import { noticeDriveWaiting, sendReviewMails } from "@/app/_server/review-notices"
import { sendFollowUp } from "@/app/_server/revisions"
import { route } from "@/app/_server/route"
import { findDriveForUpdate } from "@/db/queries/drive-locks"
import { AppError, notFound } from "@/lib/errors"
import { driveForRoute, driveJson, finishAndScore } from "@/app/_server/services/drives"

/**
 * Scores the stored samples and marks against the frozen profile. Finishing again scores again (idempotent).
 * The drive is locked FOR UPDATE first, so the score includes every batch and mark accepted before it.
 */
export const POST = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive: seen } = await driveForRoute(ctx.params, "finish")
  const result = await db.transaction().execute(async (trx) => {
    const drive = (await findDriveForUpdate(trx, seen.id, user.shopId)) ?? notFound("That drive")
    if (drive.review_status !== null) throw new AppError("conflict", "This drive has been reviewed already.")
    const finished = await finishAndScore(trx, drive, user.id)
    await publishDriveEvent(trx, finished.drive, "status", statusBody(finished.drive)) // every screen on the drive hears of it
    // The first finish may put the drive in the review queue: tell the leads (finishing again only scores again).
    return {
      ...finished,
      mails: drive.status === "recording" ? await noticeDriveWaiting(trx, finished.drive, finished.score) : [],
    }
  })
  sendFollowUp(result.followUp)
  await sendReviewMails(result.mails)
  return Response.json({ drive: driveJson(result.drive), score: result.score })
})
