import { randomUUID } from "node:crypto"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseQuery, route } from "@/app/_server/route"
import { getDb, getReadDb } from "@/db/client"
import { findDriveInShop, insertDrive, listDrives, setJobStatus } from "@/db/queries/drives"
import type { Drive } from "@/db/types"
import { canSeeDrive } from "@/lib/access/drive"
import { internalDriveId } from "@/lib/drive-id"
import { AppError } from "@/lib/errors"
import { createDriveSchema, listDrivesQuery, parseDriveCursor } from "@/lib/validation/drive"
import { accessFacts, driveJson } from "./_service"
import { resolveNewDrive } from "./_new-drive"
import { assertRoadTestMayStart } from "./_road-test"

export const GET = route(async (req) => {
  const { user } = await requireRole()
  const query = parseQuery(req, listDrivesQuery)
  const cursor = parseDriveCursor(query.cursor)
  if (cursor === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const { rows, nextCursor } = await listDrives(getReadDb(), user.shopId, {
    verdict: query.verdict,
    status: query.status,
    coDriverId: user.role === "co_driver" ? user.id : undefined,
    cursor,
  })
  return Response.json({
    drives: rows.map((r) =>
      driveJson(r, {
        roNumber: r.ro_number,
        driverName: r.driver_name,
        coDriverName: r.co_driver_name,
        sensor: r.task_sensor,
        vehicle:
          r.vehicle_make || r.vehicle_model
            ? { year: r.vehicle_year, make: r.vehicle_make, model: r.vehicle_model }
            : null,
      }),
    ),
    nextCursor,
  })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  // every field is optional (api.md): no body at all starts an unplanned drive
  const input = await parseJson(req, createDriveSchema, { emptyAs: {} })
  const db = getDb()
  // The client's id is the drive's public id within this shop; another shop may use the same one for its own
  // drive, which has another internal id (lib/drive-id.ts), so the two never meet.
  const publicId = (input.id ?? randomUUID()).toLowerCase()
  const id = internalDriveId(user.shopId, publicId)
  // The same client id again (a retried start, perhaps still in flight): the drive as it is, not a second one.
  const replay = (drive: Drive) => {
    if (!canSeeDrive(user, accessFacts(drive))) throw taken()
    return Response.json({ drive: driveJson(drive) }, { status: 200 })
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
  return made ? Response.json({ drive: driveJson(drive) }, { status: 201 }) : replay(drive)
})

/** A drive of this shop with this id that the user may not see: start with a new id. */
function taken() {
  return new AppError("conflict", "That drive id is taken; start with a new one.")
}
