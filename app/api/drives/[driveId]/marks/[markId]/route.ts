import { z } from "zod"
import { noteMarkRemoved } from "@/app/_server/live"
import { route, uuidParam } from "@/app/_server/route"
import { deleteMarkNotifying } from "@/db/queries/drive-events"
import { assertRecordingOpen, driveForRoute, rescoreFinishedDrive } from "../../../_service"

const params = z.object({ driveId: uuidParam, markId: uuidParam })

/** The recorder's undo of a mark already sent. Idempotent: a mark that is gone already is a 204 too. */
export const DELETE = route<{ driveId: string; markId: string }>(async (_req, ctx) => {
  const { user, db, drive, params: { markId } } = await driveForRoute(ctx.params, "record", { schema: params })
  assertRecordingOpen(drive)
  await db.transaction().execute(async (trx) => {
    if (await deleteMarkNotifying(trx, drive.id, user.shopId, markId)) await rescoreFinishedDrive(trx, drive)
  })
  noteMarkRemoved(drive.id)
  return new Response(null, { status: 204 })
})
