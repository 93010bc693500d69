// Steps shared by the drive route handlers: load with access rules, the drive's JSON shape, scoring
// from the stored data, and the job status that follows. Route handlers stay a few lines each.
import "server-only"
import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, uuidParam } from "@/app/_server/route"
import { getDb, type Db } from "@/db/client"
import { loadDriveFile } from "@/db/queries/drive-file"
import { findDriveForKeyShare, lockDriveRecord, type DriveWithSampleSpan } from "@/db/queries/drive-locks"
import {
  findDriveInShop,
  findJobTaskDrives,
  markDriveFinished,
  setDriveVerdict,
  setJobStatus,
} from "@/db/queries/drives"
import { updateRoadModel } from "@/db/queries/roads"
import { upsertScore } from "@/db/queries/scores"
import type { Drive, DriveAccess, RevisionCause } from "@/db/types"
import { noticeVerdictChange, sealRevision, type FollowUp } from "@/app/_server/revisions"
import {
  canFinishDrive,
  canRecordOnDrive,
  canSeeDrive,
  jobStatusFromDrives,
  recordingIsOpen,
  type DriveAccessFacts,
  type DriveActor,
} from "@/lib/access/drive"
import type { Role } from "@/lib/auth/roles"
import { internalDriveId } from "@/lib/drive-id"
import { AppError, notFound } from "@/lib/errors"
import { scoreDrive, type Score } from "@/lib/scoring"

export function accessFacts(drive: DriveAccess): DriveAccessFacts {
  return {
    shopId: drive.shop_id,
    driverId: drive.driver_id,
    coDriverId: drive.co_driver_id,
    status: drive.status,
    reviewStatus: drive.review_status,
  }
}

export type DriveNeed = "see" | "record" | "finish"

/** The drive if the actor may `need` it: 404 when they may not see it, 403 when they see it but may not act. */
export async function loadDriveFor(db: Db, driveId: string, actor: DriveActor, need: DriveNeed): Promise<Drive> {
  return assertDriveAccess(await findDriveInShop(db, driveId, actor.shopId), actor, need)
}

/**
 * Inside a sample or mark transaction: the drive locked FOR KEY SHARE (see db/queries/drive-locks.ts), with
 * the same 404/403 rules as loadDriveFor, and 409 once a lead has reviewed it. This is the transaction's
 * one read of the drive.
 */
export async function lockDriveFor(
  trx: Db,
  driveId: string,
  actor: DriveActor,
  opts: { sampleSpan?: boolean } = {},
): Promise<DriveWithSampleSpan> {
  const drive = assertDriveAccess(await findDriveForKeyShare(trx, driveId, actor.shopId, opts), actor, "record")
  assertRecordingOpen(drive)
  return drive
}

/** loadDriveFor's rules for a drive read some other way (undefined: not in the actor's shop). */
export function assertDriveAccess<D extends DriveAccess>(drive: D | undefined, actor: DriveActor, need: DriveNeed): D {
  if (!drive || !canSeeDrive(actor, accessFacts(drive))) notFound("That drive")
  if (need === "record" && !canRecordOnDrive(actor, accessFacts(drive))) {
    throw new AppError("forbidden", "Only the drive's driver, its co-driver or a shop lead can record on it.")
  }
  if (need === "finish" && !canFinishDrive(actor, accessFacts(drive))) {
    throw new AppError("forbidden", "Only the drive's driver or a shop lead can finish it.")
  }
  return drive
}

const driveIdParams = z.object({ driveId: uuidParam })

/**
 * The internal id (`drive.id`) of the actor's shop's drive with this public id: every drive id that comes in
 * (path, body, query) goes through here, so a shop can only ever name its own drives (lib/drive-id.ts).
 */
export function shopDriveId(actor: Pick<DriveActor, "shopId">, publicId: string): string {
  return internalDriveId(actor.shopId, publicId)
}

/**
 * Signed in (with one of `roles`) and the drive's internal id from the path's public id, for handlers that
 * read the drive in a transaction.
 */
export async function driveRouteIds(params: Promise<unknown>, roles: Role[] = []) {
  const { user } = await requireRole(...roles)
  const { driveId } = await parseParams(params, driveIdParams)
  return { user, db: getDb(), driveId: shopDriveId(user, driveId) }
}

/**
 * The first steps of a /api/drives/:driveId handler, in this order: signed in (with one of `roles`
 * when named), the ids from the path (a malformed one is a 404), and the drive if the user may `need` it.
 * The returned `params.driveId` is the drive's internal id.
 */
export async function driveForRoute<P extends { driveId: string } = { driveId: string }>(
  params: Promise<unknown>,
  need: DriveNeed,
  { roles = [], schema }: { roles?: Role[]; schema?: z.ZodType<P> } = {},
) {
  const { user } = await requireRole(...roles)
  const parsed = (await parseParams(params, schema ?? driveIdParams)) as P
  const ids = { ...parsed, driveId: shopDriveId(user, parsed.driveId) }
  const db = getDb()
  const drive = await loadDriveFor(db, ids.driveId, user, need)
  return { user, db, drive, params: ids }
}

/** Samples and marks are taken until a lead has reviewed the drive (see recordingIsOpen). */
export function assertRecordingOpen(drive: Pick<DriveAccess, "review_status">): void {
  if (!recordingIsOpen({ reviewStatus: drive.review_status })) {
    throw new AppError("conflict", "This drive has been reviewed; its record is closed.")
  }
}

/** The drive as the API shows it: its public id, never the internal one. */
export function driveJson(drive: Drive, extra: Record<string, unknown> = {}) {
  return {
    id: drive.public_id,
    jobId: drive.job_id,
    taskId: drive.task_id,
    vehicleDescription: drive.vehicle_description,
    profile: drive.profile,
    profileVersionId: drive.profile_version_id,
    driverId: drive.driver_id,
    coDriverId: drive.co_driver_id,
    status: drive.status,
    source: drive.source,
    verdict: drive.verdict,
    reviewStatus: drive.review_status,
    createdAt: drive.created_at,
    finishedAt: drive.finished_at,
    kind: drive.kind,
    roadTestChecks: drive.road_test,
    ...extra,
  }
}

/**
 * Finish (or finish again): store the score and verdict, mark the drive finished, move its job on, and seal
 * a revision of the record when it changed. Call inside a transaction holding the drive FOR UPDATE (or on a
 * drive no one else can see yet, as import does).
 */
export async function finishAndScore(
  trx: Db,
  drive: Drive,
  by: string | null = null,
): Promise<{ drive: Drive; score: Score; followUp?: FollowUp }> {
  const file = await loadDriveFile(trx, drive.id, drive.shop_id)
  const score = scoreDrive(file)
  await upsertScore(trx, drive.id, drive.shop_id, score)
  await updateRoadModel(trx, drive, score, file)
  const finished = await markDriveFinished(trx, drive.id, drive.shop_id, score.verdict)
  if (finished.job_id) await updateJobAfterFinish(trx, finished.job_id, finished.shop_id)
  const cause: RevisionCause =
    drive.status === "finished" ? "refinish" : drive.source === "import" ? "import" : "finish"
  const sealed = await sealRevision(trx, finished, { cause, score, driveFile: file, by })
  return { drive: finished, score, followUp: await noticeVerdictChange(trx, finished, sealed) }
}

/**
 * Late samples or marks (or a mark taken back) on a finished drive no one has reviewed yet: score it again
 * under the drive's record lock, so racing late writes score one after the other and the last sees them all.
 * Call inside the write's transaction, which holds the drive FOR KEY SHARE.
 */
export async function rescoreFinishedDrive(
  trx: Db,
  drive: Drive,
  cause: RevisionCause,
  by: string | null = null,
): Promise<FollowUp | undefined> {
  if (drive.status !== "finished") return undefined
  await lockDriveRecord(trx, drive.id)
  const file = await loadDriveFile(trx, drive.id, drive.shop_id)
  const score = scoreDrive(file)
  await upsertScore(trx, drive.id, drive.shop_id, score)
  await updateRoadModel(trx, drive, score, file)
  await setDriveVerdict(trx, drive.id, drive.shop_id, score.verdict)
  if (drive.job_id) await updateJobAfterFinish(trx, drive.job_id, drive.shop_id)
  const sealed = await sealRevision(trx, drive, { cause, score, driveFile: file, by })
  return noticeVerdictChange(trx, drive, sealed)
}

async function updateJobAfterFinish(trx: Db, jobId: string, shopId: string) {
  await setJobStatus(trx, jobId, shopId, jobStatusFromDrives(await findJobTaskDrives(trx, jobId, shopId)))
}
