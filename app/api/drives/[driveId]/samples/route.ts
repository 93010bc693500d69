import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { insertSampleBatch } from "@/db/queries/samples"
import { recordingIsOpen } from "@/lib/access/drive"
import { AppError } from "@/lib/errors"
import { sampleBatchSchema } from "@/lib/validation/drive"
import { loadDriveFor, rescoreFinishedDrive } from "../../_service"

const params = z.object({ driveId: uuidParam })

// The whole body is validated before anything is written: one bad sample is a 400 naming it
// (`samples.3.lat`) and the batch is stored not at all. Late batches after Finish are taken and the
// drive scored again until a lead has reviewed it (see lib/access/drive.ts recordingIsOpen).
export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "record")
  const { batchId, samples } = await parseJson(req, sampleBatchSchema)
  if (!recordingIsOpen({ reviewStatus: drive.review_status })) {
    throw new AppError("conflict", "This drive has been reviewed; its record is closed.")
  }
  const result = await db.transaction().execute(async (trx) => {
    const r = await insertSampleBatch(trx, drive.id, user.shopId, batchId, samples)
    if (!r.replayed && r.accepted > 0) await rescoreFinishedDrive(trx, drive)
    return r
  })
  return Response.json(result)
})
