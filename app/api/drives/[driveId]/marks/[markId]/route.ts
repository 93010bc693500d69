import { z } from "zod"
import { route, uuidParam } from "@/app/_server/route"
import { deleteMark } from "@/db/queries/marks"
import { assertRecordingOpen, driveForRoute, rescoreFinishedDrive } from "../../../_service"

const params = z.object({ driveId: uuidParam, markId: uuidParam })

/** The recorder's undo of a mark already sent. Idempotent: a mark that is gone already is a 204 too. */
export const DELETE = route<{ driveId: string; markId: string }>(async (_req, ctx) => {
  const { user, db, drive, params: { markId } } = await driveForRoute(ctx.params, "record", { schema: params })
  assertRecordingOpen(drive)
  await db.transaction().execute(async (trx) => {
    if (await deleteMark(trx, drive.id, user.shopId, markId)) await rescoreFinishedDrive(trx, drive)
  })
  return new Response(null, { status: 204 })
})
