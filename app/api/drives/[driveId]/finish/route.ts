import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { driveJson, finishAndScore, loadDriveFor } from "../../_service"

const params = z.object({ driveId: uuidParam })

/** Scores the stored samples and marks against the frozen profile. Finishing again scores again (idempotent). */
export const POST = route<{ driveId: string }>(async (_req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "finish")
  if (drive.review_status !== null) throw new AppError("conflict", "This drive has been reviewed already.")
  const result = await db.transaction().execute((trx) => finishAndScore(trx, drive))
  return Response.json({ drive: driveJson(result.drive), score: result.score })
})
