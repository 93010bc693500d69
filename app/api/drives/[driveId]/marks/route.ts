import { parseJson, route } from "@/app/_server/route"
import { insertMarks } from "@/db/queries/marks"
import { markBatchSchema } from "@/lib/validation/drive"
import { assertCheckMarksFit } from "../../_road-test"
import { assertRecordingOpen, driveForRoute, rescoreFinishedDrive } from "../../_service"

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "record")
  const { marks } = await parseJson(req, markBatchSchema)
  assertRecordingOpen(drive)
  assertCheckMarksFit(drive, marks)
  const result = await db.transaction().execute(async (trx) => {
    const r = await insertMarks(trx, drive.id, user.shopId, marks, user.id)
    if (r.accepted > 0) await rescoreFinishedDrive(trx, drive)
    return r
  })
  return Response.json(result)
})
