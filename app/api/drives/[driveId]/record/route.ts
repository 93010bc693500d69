import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { loadRecordData, recordFilename } from "@/app/_server/record-data"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { buildDriveRecordPdf } from "@/lib/record"
import { loadDriveFor } from "../../_service"

const params = z.object({ driveId: uuidParam })

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  await loadDriveFor(db, driveId, user, "see")
  const loaded = await loadRecordData(db, driveId, user.shopId)
  if (!loaded?.data) throw new AppError("conflict", "The record is made once the drive is finished and scored.")
  const pdf = await buildDriveRecordPdf(loaded.data)
  return new Response(Buffer.from(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `inline; filename="${recordFilename(loaded.head)}"`,
      "cache-control": "private, no-store",
    },
  })
})
