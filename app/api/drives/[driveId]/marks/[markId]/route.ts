import { z } from "zod"
import { noteMarkRemoved } from "@/app/_server/live"
import { sendFollowUp } from "@/app/_server/revisions"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { deleteMarkNotifying } from "@/db/queries/drive-events"
import { driveRouteIds, lockDriveFor, rescoreFinishedDrive } from "@/app/_server/services/drives"

const params = z.object({ driveId: uuidParam, markId: uuidParam })

/** The recorder's undo of a mark already sent. Idempotent: a mark that is gone already is a 204 too. */
export const DELETE = route<{ driveId: string; markId: string }>(async (_req, ctx) => {
  const { user, db, driveId } = await driveRouteIds(ctx.params)
  const { markId } = await parseParams(ctx.params, params)
  const followUp = await db.transaction().execute(async (trx) => {
    const drive = await lockDriveFor(trx, driveId, user)
    if (await deleteMarkNotifying(trx, drive.id, user.shopId, markId))
      return rescoreFinishedDrive(trx, drive, "mark_removed", user.id)
  })
  noteMarkRemoved(driveId)
  sendFollowUp(followUp)
  return new Response(null, { status: 204 })
})
