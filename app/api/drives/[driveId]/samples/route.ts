import { noteSamplesStored } from "@/app/_server/live"
import { sendFollowUp } from "@/app/_server/revisions"
import { parseJson, route } from "@/app/_server/route"
import { insertSampleBatch } from "@/db/queries/samples"
import { sampleBatchSchema } from "@/lib/validation/drive"
import { driveRouteIds, lockDriveFor, rescoreFinishedDrive } from "../../_service"

// The whole body is validated before anything is written: one bad sample is a 400 naming it
// (`samples.3.lat`) and the batch is stored not at all. Late batches after Finish are taken and the
// drive scored again until a lead has reviewed it (see lib/access/drive.ts recordingIsOpen).
// The drive is read once, inside the transaction, locked so that Finish waits for this batch (drive-locks.ts).
export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, db, driveId } = await driveRouteIds(ctx.params)
  const { batchId, samples } = await parseJson(req, sampleBatchSchema)
  const { result, followUp } = await db.transaction().execute(async (trx) => {
    const drive = await lockDriveFor(trx, driveId, user)
    const r = await insertSampleBatch(trx, drive.id, user.shopId, batchId, samples)
    const followUp = !r.replayed && r.accepted > 0 ? await rescoreFinishedDrive(trx, drive, "late_samples", user.id) : undefined
    return { result: r, followUp }
  })
  noteSamplesStored(driveId, samples, result.storedTs)
  sendFollowUp(followUp)
  const { storedTs: _storedTs, ...body } = result
  return Response.json(body)
})
