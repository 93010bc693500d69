import { noteMarksStored } from "@/app/_server/live"
import { parseJson, route } from "@/app/_server/route"
import { insertMarksNotifying } from "@/db/queries/drive-events"
import { markBatchSchema } from "@/lib/validation/drive"
import { assertCheckMarksFit } from "../../_road-test"
import { assertRecordingOpen, driveForRoute, rescoreFinishedDrive } from "../../_service"

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "record")
  const { marks } = await parseJson(req, markBatchSchema)
  assertRecordingOpen(drive)
  assertCheckMarksFit(drive, marks)
  const result = await db.transaction().execute(async (trx) => {
    const r = await insertMarksNotifying(trx, drive.id, user.shopId, marks, user.id)
    if (r.accepted > 0) await rescoreFinishedDrive(trx, drive)
    return r
  })
  noteMarksStored(drive.id, result.stored)
  return Response.json({ accepted: result.accepted, duplicates: result.duplicates })
})
