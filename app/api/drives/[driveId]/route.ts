import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { countDriveData } from "@/db/queries/drives"
import { findScore } from "@/db/queries/scores"
import { driveJson, loadDriveFor, scoreStoredDrive } from "../_service"

const params = z.object({ driveId: uuidParam })

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "see")
  // A drive being recorded has no stored score yet: score what has arrived so far.
  const [counts, stored] = await Promise.all([countDriveData(db, drive.id, user.shopId), findScore(db, drive.id, user.shopId)])
  const score = stored ?? (await scoreStoredDrive(db, drive.id, user.shopId))
  return Response.json({ drive: driveJson(drive, { counts }), score })
})
