import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { deleteMark } from "@/db/queries/marks"
import { recordingIsOpen } from "@/lib/access/drive"
import { AppError } from "@/lib/errors"
import { loadDriveFor, rescoreFinishedDrive } from "../../../_service"

const params = z.object({ driveId: uuidParam, markId: uuidParam })

/** The recorder's undo of a mark already sent. Idempotent: a mark that is gone already is a 204 too. */
export const DELETE = route<{ driveId: string; markId: string }>(async (_req, ctx) => {
  const { user } = await requireRole()
  const { driveId, markId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "record")
  if (!recordingIsOpen({ reviewStatus: drive.review_status })) {
    throw new AppError("conflict", "This drive has been reviewed; its record is closed.")
  }
  await db.transaction().execute(async (trx) => {
    if (await deleteMark(trx, drive.id, user.shopId, markId)) await rescoreFinishedDrive(trx, drive)
  })
  return new Response(null, { status: 204 })
})
