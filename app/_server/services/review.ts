import "server-only"
// The review workflows: the lead's queue of drives that need a look, and the decision on one of them.
import { vehicleJson } from "@/app/_server/services/drive-intake"
import { getReadDb, type Db } from "@/db/client"
import { findJobTaskDrives, setJobStatus } from "@/db/queries/drives"
import { findDriveForUpdate } from "@/db/queries/drive-locks"
import { findScore } from "@/db/queries/scores"
import { insertNotification } from "@/db/queries/notifications"
import { findDriveRecordHead, findShopPerson, insertReviewDecision, listReviewQueue } from "@/db/queries/reviews"
import type { Drive } from "@/db/types"
import { jobStatusFromDrives } from "@/lib/access/drive"
import type { SessionUser } from "@/lib/auth/lucia"
import { AppError } from "@/lib/errors"
import { describeVehicle, roLabel } from "@/lib/record"
import type { Score } from "@/lib/scoring/types"
import { parseDriveCursor } from "@/lib/validation/drive"
import type { ReviewInput } from "@/lib/validation/review"
import { env } from "@/lib/env"
import { sendMailQuietly } from "@/app/_server/mail"
import { sealRevision } from "@/app/_server/revisions"

/** One page of the drives that wait for the lead's decision, oldest finish first. */
export async function reviewQueuePage(user: SessionUser, cursor: string | undefined) {
  const after = parseDriveCursor(cursor)
  if (after === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const { rows, nextCursor } = await listReviewQueue(getReadDb(), user.shopId, after)
  const drives = rows.map((r) => {
    const score: Partial<Score> = r.result
    return {
      id: r.public_id,
      jobId: r.job_id,
      taskId: r.task_id,
      roNumber: r.ro_number,
      vehicleDescription: r.vehicle_description,
      vehicle: vehicleJson(r),
      verdict: r.verdict,
      reasons: score.reasons ?? [],
      harshEvents: score.harshEvents ?? { accel: 0, decel: 0 },
      driverName: r.driver_name,
      finishedAt: r.finished_at,
    }
  })
  return { drives, nextCursor }
}

/**
 * The lead's decision: close the review, move the job (redo reopens it; approve completes it once every
 * task that needs a drive is done), and on a redo tell the driver in the app and by e-mail.
 */
export async function decideReview(
  db: Db,
  drive: Drive,
  reviewer: { id: string; name: string; shopId: string },
  input: ReviewInput,
) {
  if (drive.status !== "finished")
    throw new AppError("conflict", "The drive is still being recorded; review it once it is finished.")
  if (drive.review_status !== null) throw new AppError("conflict", "This drive has been reviewed already.")
  const head = await findDriveRecordHead(db, drive.id, reviewer.shopId)
  const what = `${head?.ro_number ? `${roLabel(head.ro_number)}, ` : ""}${describeVehicle(
    head?.vin ? { year: head.vehicle_year, make: head.vehicle_make, model: head.vehicle_model } : null,
    drive.vehicle_description,
  )}`

  const result = await db.transaction().execute(async (trx) => {
    // Waits for samples and marks being written (they hold the drive FOR KEY SHARE); none are taken after this.
    await findDriveForUpdate(trx, drive.id, reviewer.shopId)
    const decided = await insertReviewDecision(trx, {
      driveId: drive.id,
      shopId: reviewer.shopId,
      decision: input.decision,
      note: input.note,
      reviewerId: reviewer.id,
    })
    if (!decided) throw new AppError("conflict", "This drive has been reviewed already.")
    if (decided.drive.job_id) {
      const status =
        input.decision === "redo"
          ? "redo"
          : jobStatusFromDrives(await findJobTaskDrives(trx, decided.drive.job_id, reviewer.shopId))
      await setJobStatus(trx, decided.drive.job_id, reviewer.shopId, status)
    }
    if (input.decision === "redo" && decided.drive.driver_id !== reviewer.id) {
      await insertNotification(trx, {
        shopId: reviewer.shopId,
        userId: decided.drive.driver_id,
        message: `${reviewer.name} sent back your drive (${what}): ${input.note}`,
        // The job, where "Drive again" is the main action; a drive without a job opens the drive.
        link: decided.drive.job_id ? `/jobs/${decided.drive.job_id}` : `/drives/${drive.public_id}`,
      })
    }
    // The decision is part of the sealed record: a new revision (DEVELOPERS.md "Record revisions and verification").
    const score = await findScore(trx, drive.id, reviewer.shopId)
    if (score) await sealRevision(trx, decided.drive, { cause: "review", score, by: reviewer.id })
    return decided
  })

  if (input.decision === "redo") {
    const driver = await findShopPerson(db, drive.driver_id, reviewer.shopId)
    if (driver && !driver.disabled && driver.id !== reviewer.id) {
      await sendMailQuietly({
        to: driver.email,
        subject: `Drive sent back: ${what}`,
        text: [
          `Hello ${driver.name},`,
          "",
          `${reviewer.name} sent back your calibration drive for ${what}.`,
          "",
          `Note: ${input.note}`,
          "",
          drive.job_id ? "The job is open again for another drive. Drive again from the job:" : "See the drive here:",
          `${env().APP_URL.replace(/\/$/, "")}${drive.job_id ? `/jobs/${drive.job_id}` : `/drives/${drive.public_id}`}`,
        ].join("\n"),
      })
    }
  }
  return result
}
