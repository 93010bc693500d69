import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findScore } from "@/db/queries/scores"
import { loadDriveFor, scoreStoredDrive } from "../../_service"

const params = z.object({ driveId: uuidParam })

/** The score as shared/specs/drive-file.md defines it: stored once finished, computed while recording. */
export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "see")
  const score = (drive.status === "finished" ? await findScore(db, drive.id, user.shopId) : undefined) ??
    (await scoreStoredDrive(db, drive.id, user.shopId))
  return Response.json(score)
})
