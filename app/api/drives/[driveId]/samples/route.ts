import { noteSamplesStored } from "@/app/_server/live"
import { parseJson, route } from "@/app/_server/route"
import { insertSampleBatch } from "@/db/queries/samples"
import { sampleBatchSchema } from "@/lib/validation/drive"
import { assertRecordingOpen, driveForRoute, rescoreFinishedDrive } from "../../_service"

// The whole body is validated before anything is written: one bad sample is a 400 naming it
// (`samples.3.lat`) and the batch is stored not at all. Late batches after Finish are taken and the
// drive scored again until a lead has reviewed it (see lib/access/drive.ts recordingIsOpen).
export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "record")
  const { batchId, samples } = await parseJson(req, sampleBatchSchema)
  assertRecordingOpen(drive)
  const result = await db.transaction().execute(async (trx) => {
    const r = await insertSampleBatch(trx, drive.id, user.shopId, batchId, samples)
    if (!r.replayed && r.accepted > 0) await rescoreFinishedDrive(trx, drive)
    return r
  })
  noteSamplesStored(drive.id, samples, result.storedTs)
  const { storedTs: _storedTs, ...body } = result
  return Response.json(body)
})
