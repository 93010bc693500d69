import { loadRecordData, recordFilename } from "@/app/_server/record-data"
import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"
import { buildDriveRecordPdf } from "@/lib/record"
import { driveForRoute } from "../../_service"

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  const loaded = await loadRecordData(db, drive.id, user.shopId)
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
