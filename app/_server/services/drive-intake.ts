import "server-only"
// How drives come in and are listed: a start from the recorder (idempotent on the client's id), an imported
// drive file (stored finished and scored), and the shop's list of drives.
import { randomUUID } from "node:crypto"
import type { z } from "zod"
import { noticeDriveWaiting, sendReviewMails } from "@/app/_server/review-notices"
import { accessFacts, driveJson, finishAndScore } from "@/app/_server/services/drives"
import { resolveNewDrive } from "@/app/_server/services/new-drive"
import { assertRoadTestMayStart } from "@/app/_server/services/road-test"
import { getDb, getReadDb } from "@/db/client"
import { findDriveInShop, insertDrive, listDrives, setJobStatus } from "@/db/queries/drives"
import { insertMarks } from "@/db/queries/marks"
import { insertSamples } from "@/db/queries/samples"
import type { Drive } from "@/db/types"
import { canSeeDrive } from "@/lib/access/drive"
import type { SessionUser } from "@/lib/auth/lucia"
import { resolveProfile, type AnyDriveFile } from "@/lib/drive-file"
import { internalDriveId } from "@/lib/drive-id"
import { AppError } from "@/lib/errors"
import { parseDriveCursor, type CreateDriveInput, type importQuery, type listDrivesQuery } from "@/lib/validation/drive"

/** The vehicle as lists show it: null when the drive names none. */
export function vehicleJson(r: {
  vehicle_year: number | null
  vehicle_make: string | null
  vehicle_model: string | null
}) {
  return r.vehicle_make || r.vehicle_model
    ? { year: r.vehicle_year, make: r.vehicle_make, model: r.vehicle_model }
    : null
}

/** One page of the shop's drives (a co-driver's: those that name them). */
export async function listDrivesPage(user: SessionUser, query: z.output<typeof listDrivesQuery>) {
  const cursor = parseDriveCursor(query.cursor)
  if (cursor === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const coDriverId = user.role === "co_driver" ? user.id : undefined
  const { rows, nextCursor } = await listDrives(getReadDb(), user.shopId, { ...query, coDriverId, cursor })
  const drives = rows.map((r) =>
    driveJson(r, {
      roNumber: r.ro_number,
      driverName: r.driver_name,
      coDriverName: r.co_driver_name,
      sensor: r.task_sensor,
      vehicle: vehicleJson(r),
    }),
  )
  return { drives, nextCursor }
}

/** A drive of this shop with this id that the user may not see: start with a new id. */
function taken() {
  return new AppError("conflict", "That drive id is taken; start with a new one.")
}

/**
 * Starts a drive. The client's id is the drive's public id within this shop (another shop may use the same one for
 * its own drive, which has another internal id: lib/drive-id.ts). The same id again (a retried start, perhaps still
 * in flight) answers the drive as it is, not a second one: `created` false.
 */
export async function startDrive(user: SessionUser, input: CreateDriveInput) {
  const db = getDb()
  const publicId = (input.id ?? randomUUID()).toLowerCase()
  const id = internalDriveId(user.shopId, publicId)
  const replay = (drive: Drive) => {
    if (!canSeeDrive(user, accessFacts(drive))) throw taken()
    return { drive: driveJson(drive), created: false }
  }
  const existing = await findDriveInShop(db, id, user.shopId)
  if (existing) return replay(existing)
  const values = await resolveNewDrive(db, user, publicId, input)
  if (values.roadTest && values.jobId) await assertRoadTestMayStart(db, user.shopId, values.jobId)
  const made = await db.transaction().execute(async (trx) => {
    const inserted = await insertDrive(trx, values)
    if (inserted && values.jobId) await setJobStatus(trx, values.jobId, user.shopId, "drive")
    return inserted
  })
  // Not inserted: a concurrent start with this id in this shop won (a replay).
  const drive = await findDriveInShop(db, id, user.shopId)
  if (!drive) throw taken()
  return made ? { drive: driveJson(drive), created: true } : replay(drive)
}

/** A drive file from elsewhere, stored as a finished, scored drive. The score is of what was stored. */
export async function importDrive(user: SessionUser, to: z.output<typeof importQuery>, file: AnyDriveFile) {
  const db = getDb()
  const values = await resolveNewDrive(db, user, randomUUID(), to)
  const id = values.id
  // The file's own profile (defaults for missing keys) is the one it was held to, whatever the task says.
  values.profile = resolveProfile(file.profile) as unknown as Record<string, unknown>
  values.profileVersionId = null
  values.kind = file.format === "straightaway.drive/2" ? file.kind : "learn"
  values.roadTest = file.format === "straightaway.drive/2" ? (file.roadTest?.checks ?? null) : null
  const marks = file.marks.map((m) => ({ ...m, id: randomUUID() }))
  const result = await db.transaction().execute(async (trx) => {
    await insertDrive(trx, { ...values, source: "import" })
    await insertSamples(trx, id, user.shopId, file.samples)
    await insertMarks(trx, id, user.shopId, marks, user.id)
    const drive = (await findDriveInShop(trx, id, user.shopId))!
    const finished = await finishAndScore(trx, drive)
    return { ...finished, mails: await noticeDriveWaiting(trx, finished.drive, finished.score) }
  })
  await sendReviewMails(result.mails)
  return { drive: driveJson(result.drive), score: result.score }
}
