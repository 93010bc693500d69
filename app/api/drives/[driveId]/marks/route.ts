import { noteMarksStored } from "@/app/_server/live"
import { sendFollowUp } from "@/app/_server/revisions"
import { parseJson, route } from "@/app/_server/route"
import { insertMarksNotifying } from "@/db/queries/drive-events"
import { marksOutsideDrive } from "@/lib/access/mark-window"
import { validationFailed } from "@/lib/errors"
import { markBatchSchema } from "@/lib/validation/drive"
import { assertCheckMarksFit } from "../../_road-test"
import { driveRouteIds, lockDriveFor, rescoreFinishedDrive } from "../../_service"

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, db, driveId } = await driveRouteIds(ctx.params)
  const { marks } = await parseJson(req, markBatchSchema)
  const { result, followUp } = await db.transaction().execute(async (trx) => {
    const drive = await lockDriveFor(trx, driveId, user, { sampleSpan: true })
    assertCheckMarksFit(drive, marks)
    // A sealed drive: every mark inside it, or the whole post is refused and nothing stored.
    const outside = marksOutsideDrive(marks, {
      firstSampleT: drive.first_sample_t,
      lastSampleT: drive.last_sample_t,
      finishedAtMs: drive.finished_at?.getTime() ?? null,
    })
    if (Object.keys(outside).length)
      validationFailed(
        outside,
        "A mark's time falls outside the drive: marks must fall between 2 min before its first position and 2 min after its finish.",
      )
    const r = await insertMarksNotifying(trx, drive.id, user.shopId, marks, user.id)
    return {
      result: r,
      followUp: r.accepted > 0 ? await rescoreFinishedDrive(trx, drive, "late_marks", user.id) : undefined,
    }
  })
  noteMarksStored(driveId, result.stored)
  sendFollowUp(followUp)
  return Response.json({ accepted: result.accepted, duplicates: result.duplicates })
})
