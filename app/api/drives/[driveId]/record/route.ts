import { recordPdfResponse } from "@/app/_server/record-data"
import { issueRecordPdf } from "@/app/_server/record-seal"
import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"
import { driveForRoute } from "@/app/_server/services/drives"

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  const loaded = await issueRecordPdf(db, drive.id, user.shopId, "download")
  if (!loaded?.pdf) throw new AppError("conflict", "The record is made once the drive is finished and scored.")
  return recordPdfResponse(loaded.pdf, loaded.head)
})
