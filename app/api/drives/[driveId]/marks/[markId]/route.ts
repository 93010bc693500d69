import { z } from "zod"
import { sendFollowUp } from "@/app/_server/revisions"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { deleteMark } from "@/db/queries/marks"
import { driveRouteIds, lockDriveFor, rescoreFinishedDrive } from "../../../_service"

const params = z.object({ driveId: uuidParam, markId: uuidParam })

/** The recorder's undo of a mark already sent. Idempotent: a mark that is gone already is a 204 too. */
export const DELETE = route<{ driveId: string; markId: string }>(async (_req, ctx) => {
  const { user, db } = await driveRouteIds(ctx.params)
  const { driveId, markId } = await parseParams(ctx.params, params)
  const followUp = await db.transaction().execute(async (trx) => {
    const drive = await lockDriveFor(trx, driveId, user)
    if (await deleteMark(trx, drive.id, user.shopId, markId)) return rescoreFinishedDrive(trx, drive, "mark_removed", user.id)
  })
  sendFollowUp(followUp)
  return new Response(null, { status: 204 })
})
