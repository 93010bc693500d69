import { requireRole } from "@/app/_server/auth"
import { parseJson, parseQuery, route } from "@/app/_server/route"
import { getDb, getReadDb } from "@/db/client"
import {
  decodeCursor,
  findJobByRoNumber,
  insertJob,
  isDuplicateRoNumber,
  listJobs,
  loadJobDetail,
  resolveTaskRows,
} from "@/db/queries/jobs"
import { upsertVehicleByVin } from "@/db/queries/vehicles"
import { AppError } from "@/lib/errors"
import { decodeModelYear } from "@/lib/vin"
import { duplicateRoError, jobListQuerySchema, newJobSchema } from "@/lib/validation/job"

export const GET = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const query = parseQuery(req, jobListQuerySchema)
  const cursor = query.cursor ? decodeCursor(query.cursor, query.sort) : undefined
  if (cursor === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const { rows, nextCursor, total } = await listJobs(getReadDb(), user.shopId, {
    ...query,
    q: query.q || undefined,
    cursor,
  })
  return Response.json({
    jobs: rows.map((r) => ({
      id: r.id,
      roNumber: r.ro_number,
      status: r.status,
      customer: { name: r.customer_name },
      vehicle: { vin: r.vin, year: r.year, make: r.make, model: r.model, plate: r.plate },
      sensors: r.sensors ?? [],
      createdAt: r.created_at,
      updatedAt: r.updated_at,
    })),
    nextCursor,
    total,
  })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const input = await parseJson(req, newJobSchema)
  const db = getDb()
  if (await findJobByRoNumber(db, input.roNumber, user.shopId)) throw duplicateRoError(input.roNumber)
  try {
    const jobId = await db.transaction().execute(async (trx) => {
      const tasks = await resolveTaskRows(trx, user.shopId, input.tasks)
      const vehicle = await upsertVehicleByVin(trx, user.shopId, {
        ...input.vehicle,
        year: input.vehicle.year ?? decodeModelYear(input.vehicle.vin),
      })
      return insertJob(trx, user.shopId, user.id, {
        roNumber: input.roNumber,
        customer: input.customer,
        vehicleId: vehicle.id,
        tasks,
      })
    })
    return Response.json({ job: await loadJobDetail(db, jobId, user.shopId) }, { status: 201 })
  } catch (error) {
    if (isDuplicateRoNumber(error)) throw duplicateRoError(input.roNumber)
    throw error
  }
})
