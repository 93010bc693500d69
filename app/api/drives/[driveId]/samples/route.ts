import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { noteSamplesStored } from "@/app/_server/live"
import { sendFollowUp, type FollowUp } from "@/app/_server/revisions"
import { jsonFromText, parseParams, parseWith, readRequestText, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { findDriveAndBatch, ingestSampleBatch, insertSampleBatch, type BatchResult } from "@/db/queries/samples"
import { sampleBatchSchema } from "@/lib/validation/drive"
import { unstorableTextProblem } from "@/lib/validation/storable"
import { assertDriveAccess, assertRecordingOpen, lockDriveFor, rescoreFinishedDrive } from "../../_service"

const params = z.object({ driveId: uuidParam })

// The recorder sends a batch every 5 s or 50 samples (lib/recorder/batching.ts), so this is the hot path.
// Statements for a new batch: the session with its user (one, lib/auth/lucia.ts), the drive with the batch's claim (one),
// then claim + insert + record + the live channel's notice in one statement (db/queries/samples.ts
// ingestSampleBatch), which holds the drive FOR SHARE so that Finish (FOR UPDATE) waits for it or it for
// Finish. A replayed batch is answered from its claim before its body is validated; when the batch id comes in the
// `x-batch-id` header (as the recorder sends it, lib/recorder/recorder.ts) before its body is even read, and a new
// batch's body must then name the same id. A batch that arrives
// after Finish goes through one transaction that stores it and scores the drive again (a new revision),
// until a lead has reviewed the drive (see lib/access/drive.ts recordingIsOpen). The whole body is
// validated before anything is written: one bad sample is a 400 naming it (`samples.3.lat`) and the batch
// is stored not at all.
export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const claimed = batchIdHeader(req)
  const text = claimed === null ? await readRequestText(req) : null
  const db = getDb()
  const found = await findDriveAndBatch(db, driveId, user.shopId, claimed ?? peekBatchId(text!))
  const drive = assertDriveAccess(found?.drive, user, "record")
  assertRecordingOpen(drive)
  if (found!.claim) return Response.json(found!.claim)

  const { batchId, samples } = parseWith(sampleBatchSchema, jsonFromText(text ?? (await readRequestText(req))))
  if (claimed !== null && batchId !== claimed) {
    const problem = `is not the id in the ${BATCH_ID_HEADER} header`
    throw new AppError("validation_failed", `batchId: ${problem}`, { batchId: problem })
  }
  let result: BatchResult | null = null
  let followUp: FollowUp | undefined
  if (drive.status === "recording") result = await ingestSampleBatch(db, drive.id, user.shopId, batchId, samples)
  // Late (the drive was finished, before this request or while it ran): store and score again, together.
  result ??= await db.transaction().execute(async (trx) => {
    const now = await lockDriveFor(trx, drive.id, user)
    const r = await insertSampleBatch(trx, now.id, user.shopId, batchId, samples)
    if (!r.replayed && r.accepted > 0) followUp = await rescoreFinishedDrive(trx, now, "late_samples", user.id)
    return r
  })
  // Committed: the live scorers of this process hear of it now, other processes through the notice.
  noteSamplesStored(drive.id, samples, result.storedTs)
  sendFollowUp(followUp)
  const { storedTs: _storedTs, ...body } = result
  return Response.json(body)
})

const BATCH_ID_HEADER = "x-batch-id"

/** The batch id from the header (null without one): printable ASCII, 1 to 100 characters, as the body's. */
function batchIdHeader(req: Request): string | null {
  const id = req.headers.get(BATCH_ID_HEADER)
  if (id === null) return null
  if (!/^[\x21-\x7e]{1,100}$/.test(id))
    throw new AppError("validation_failed", `${BATCH_ID_HEADER}: must be 1 to 100 printable characters`, {
      [BATCH_ID_HEADER]: "must be 1 to 100 printable characters",
    })
  return id
}

// Without the header: `{"batchId":"...",` at the start, as the recorder sends it: the id without parsing the samples. Only ids
// with no escapes or control characters are read this way (what JSON.parse would give for them is the
// same text); any other body is parsed whole, with the same depth and text checks as every body.
const LEADING_BATCH_ID = /^\s*\{\s*"batchId"\s*:\s*"([^"\\\u0000-\u001f]{1,100})"\s*[,}]/

function peekBatchId(text: string): string | null {
  const m = LEADING_BATCH_ID.exec(text.slice(0, 160))
  if (m) return m[1]!
  try {
    const body = jsonFromText(text) as { batchId?: unknown } | null
    const id = body?.batchId
    // An id the database cannot store (a NUL) is left to the full check, which names it.
    return typeof id === "string" && id.length >= 1 && id.length <= 100 && !unstorableTextProblem(id) ? id : null
  } catch {
    return null
  }
}
