import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { insertMarks } from "@/db/queries/marks"
import { recordingIsOpen } from "@/lib/access/drive"
import { AppError } from "@/lib/errors"
import { markBatchSchema } from "@/lib/validation/drive"
import { loadDriveFor, rescoreFinishedDrive } from "../../_service"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "record")
  const { marks } = await parseJson(req, markBatchSchema)
  if (!recordingIsOpen({ reviewStatus: drive.review_status })) {
    throw new AppError("conflict", "This drive has been reviewed; its record is closed.")
  }
  const result = await db.transaction().execute(async (trx) => {
    const r = await insertMarks(trx, drive.id, user.shopId, marks, user.id)
    if (r.accepted > 0) await rescoreFinishedDrive(trx, drive)
    return r
  })
  return Response.json(result)
})
