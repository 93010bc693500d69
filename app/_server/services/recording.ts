import "server-only"
// Recording: a drive's sample batches and marks as the recorder sends them (idempotent, whole or nothing), the live
// channel told once they are committed, and a finished drive scored again when late data arrives.
import { noteMarksStored, noteSamplesStored } from "@/app/_server/live"
import { sendFollowUp, type FollowUp } from "@/app/_server/revisions"
import { jsonFromText, parseWith } from "@/app/_server/route"
import { assertCheckMarksFit } from "@/app/_server/services/road-test"
import {
  assertDriveAccess,
  assertRecordingOpen,
  lockDriveFor,
  rescoreFinishedDrive,
  shopDriveId,
} from "@/app/_server/services/drives"
import { getDb, getPool } from "@/db/client"
import { insertMarksNotifying } from "@/db/queries/drive-events"
import {
  findDriveAndBatch,
  findSessionDriveAndBatch,
  ingestSampleBatch,
  insertSampleBatch,
  type BatchResult,
  type DriveAndBatch,
} from "@/db/queries/samples"
import { marksOutsideDrive } from "@/lib/access/mark-window"
import { sessionIdFromToken, sessionIsSettled, type SessionUser } from "@/lib/auth/lucia"
import type { ApiMark } from "@/lib/drive-file/schema"
import { AppError, validationFailed } from "@/lib/errors"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"
import { fastParseSampleBatch, sampleBatchSchema } from "@/lib/validation/drive"
import { uuidSchema } from "@/lib/validation/uuid"
import { unstorableTextProblem } from "@/lib/validation/storable"

// POST /api/drives/:id/samples. The recorder sends a batch every 5 s or 50 samples (lib/recorder/batching.ts), so
// this is the hot path.
// Statements for a new batch named in the x-batch-id header, as the recorder sends it: the session with its user and
// the drive with the batch's claim (one, lookUpNamedBatch), then claim + insert + record + the live channel's notice
// in one statement (db/queries/samples.ts ingestSampleBatch), which holds the drive FOR SHARE so that Finish (FOR UPDATE) waits for it or it for
// Finish. A replayed batch is answered from its claim, by the first statement, before its body is read. A batch that arrives
// after Finish goes through one transaction that stores it and scores the drive again (a new revision),
// until a lead has reviewed the drive (see lib/access/drive.ts recordingIsOpen). The whole body is
// validated before anything is written: one bad sample is a 400 naming it (`samples.3.lat`) and the batch
// is stored not at all.
//
// `headerBatchId`: the x-batch-id header; `readText`: reads the body (only when it is needed); `lookedAhead`: the
// drive and claim lookUpNamedBatch found with the session.
export async function addSampleBatch(
  user: SessionUser,
  publicDriveId: string,
  headerBatchId: string | null,
  readText: () => Promise<string>,
  lookedAhead?: DriveAndBatch,
): Promise<Omit<BatchResult, "storedTs">> {
  const db = getDb()
  // The recorder names the batch in a header: a batch already stored is answered before its body is read.
  const named = batchIdFromHeader(headerBatchId)
  const text = named === null ? await readText() : null
  const at = { driveId: shopDriveId(user, publicDriveId), shopId: user.shopId }
  const ahead = named !== null ? lookedAhead : undefined
  const found = ahead?.drive.id === at.driveId ? ahead : await findDriveAndBatch(db, at, named ?? peekBatchId(text!))
  const drive = assertDriveAccess(found?.drive, user, "record")
  assertRecordingOpen(drive)
  if (found!.claim) return withoutStoredTs(found!.claim)

  const body = jsonFromText(text ?? (await readText()))
  const { batchId, samples } = fastParseSampleBatch(body) ?? parseWith(sampleBatchSchema, body)
  if (named !== null && batchId !== named) {
    throw new AppError("validation_failed", `batchId: is not the ${BATCH_ID_HEADER} header's batch id`, {
      batchId: `is not the ${BATCH_ID_HEADER} header's batch id`,
    })
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
  return withoutStoredTs(result)
}

/**
 * For a batch named in the x-batch-id header: the session, its user, and the drive with the batch's claim, in one
 * statement (db/queries/samples.ts findSessionDriveAndBatch). `user` is set only for a session Lucia would take as
 * it is (lib/auth/lucia.ts sessionIsSettled) whose user is not disabled; otherwise the caller checks the session
 * through Lucia, and addSampleBatch uses `found` only when it is the drive of the user that check gives.
 */
export async function lookUpNamedBatch(
  sessionToken: string | null,
  driveId: string,
  headerBatchId: string | null,
): Promise<{ user: SessionUser | null; found: DriveAndBatch | undefined } | undefined> {
  const named = batchIdFromHeader(headerBatchId)
  if (!sessionToken || named === null) return undefined
  if (!uuidSchema.safeParse(driveId).success) return undefined
  const row = await findSessionDriveAndBatch(getPool(), sessionIdFromToken(sessionToken), driveId, named)
  if (!row) return undefined
  const settled = sessionIsSettled(row.sessionExpiresAt) && !row.user.disabled
  return { user: settled ? row.user : null, found: row.found }
}

function withoutStoredTs({ storedTs: _storedTs, ...body }: BatchResult) {
  return body
}

/** POST /api/drives/:id/marks: a sealed drive takes only marks inside it; a finished one is scored again. */
export async function addMarks(user: SessionUser, driveId: string, marks: ApiMark[]) {
  const { result, followUp } = await getDb()
    .transaction()
    .execute(async (trx) => {
      const drive = await lockDriveFor(trx, driveId, user, { sampleSpan: true })
      assertCheckMarksFit(drive, marks)
      // A sealed drive: every mark inside it, or the whole post is refused and nothing stored.
      const outside = marksOutsideDrive(marks, {
        firstSampleT: drive.first_sample_t,
        lastSampleT: drive.last_sample_t,
        finishedAtMs: drive.finished_at?.getTime() ?? null,
      })
      if (Object.keys(outside).length)
        validationFailed(
          outside,
          "A mark's time falls outside the drive: marks must fall between 2 min before its first position and 2 min after its finish.",
        )
      const r = await insertMarksNotifying(trx, drive.id, user.shopId, marks, user.id)
      return {
        result: r,
        followUp: r.accepted > 0 ? await rescoreFinishedDrive(trx, drive, "late_marks", user.id) : undefined,
      }
    })
  noteMarksStored(driveId, result.stored)
  sendFollowUp(followUp)
  return { accepted: result.accepted, duplicates: result.duplicates }
}

// `{"batchId":"...",` at the start, as the recorder sends it: the id without parsing the samples. Only ids
// with no escapes or control characters are read this way (what JSON.parse would give for them is the
// same text); any other body is parsed whole, with the same depth and text checks as every body.
const LEADING_BATCH_ID = /^\s*\{\s*"batchId"\s*:\s*"([^"\\\u0000-\u001f]{1,100})"\s*[,}]/

/** The header's batch id when it is one the database can store (else the body decides, with its full checks). */
function batchIdFromHeader(value: string | null): string | null {
  return value !== null && value.length >= 1 && value.length <= 100 && !unstorableTextProblem(value) ? value : null
}

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
