import "server-only"
// The job workflows: listing, opening (with the co-driver's narrower view), intake and changes, where a change may
// swap the vehicle and replace the list of calibrations in one transaction.
import type { z } from "zod"
import { getDb, getReadDb, type Db } from "@/db/client"
import {
  decodeCursor,
  deleteTasks,
  findJobByRoNumber,
  findJobInShop,
  insertJob,
  insertTasks,
  isCoDriverOnJob,
  isDuplicateRoNumber,
  listJobs,
  listTasksForJob,
  loadJobDetail,
  resolveTaskRows,
  taskIdsWithDrives,
  updateJobFields,
  updateTask,
} from "@/db/queries/jobs"
import { upsertVehicleByVin } from "@/db/queries/vehicles"
import type { JobListPage } from "@/lib/api/types"
import type { SessionUser } from "@/lib/auth/lucia"
import { AppError, notFound, validationFailed } from "@/lib/errors"
import { planTaskReplacement } from "@/lib/jobs/tasks"
import {
  duplicateRoError,
  type jobChangeSchema,
  type jobListQuerySchema,
  type newJobSchema,
} from "@/lib/validation/job"
import { decodeModelYear } from "@/lib/vin"

type JobListQuery = z.output<typeof jobListQuerySchema>
type NewJob = z.output<typeof newJobSchema>
type JobChange = z.output<typeof jobChangeSchema>
type VehicleInput = NewJob["vehicle"]

/** One page of the shop's jobs as the API lists them. */
export async function listJobsPage(user: SessionUser, query: JobListQuery): Promise<JobListPage> {
  const cursor = query.cursor ? decodeCursor(query.cursor, query.sort) : undefined
  if (cursor === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const { rows, nextCursor, total } = await listJobs(getReadDb(), user.shopId, {
    ...query,
    q: query.q || undefined,
    cursor,
  })
  const jobs = rows.map((r) => ({
    id: r.id,
    roNumber: r.ro_number,
    status: r.status,
    customer: { name: r.customer_name },
    vehicle: { vin: r.vin, year: r.year, make: r.make, model: r.model, plate: r.plate },
    sensors: r.sensors ?? [],
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  }))
  return { jobs, nextCursor, total }
}

/** The job as `user` may see it: a co-driver only through a drive that names them, and only those drives. */
export async function jobForUser(user: SessionUser, jobId: string) {
  const db = getDb()
  const coDriver = user.role === "co_driver"
  if (coDriver && !(await isCoDriverOnJob(db, jobId, user.shopId, user.id))) notFound("That job")
  const job = await loadJobDetail(db, jobId, user.shopId, { onlyCoDriverId: coDriver ? user.id : undefined })
  if (!job) notFound("That job")
  return job
}

/** Intake: the vehicle (one row per VIN), the job and its calibrations in one transaction. */
export async function createJob(user: SessionUser, input: NewJob) {
  const db = getDb()
  if (await findJobByRoNumber(db, input.roNumber, user.shopId)) throw duplicateRoError(input.roNumber)
  const jobId = await withRoNumberConflict(input.roNumber, () =>
    db.transaction().execute(async (trx) => {
      const tasks = await resolveTaskRows(trx, user.shopId, input.tasks)
      const vehicle = await upsertVehicle(trx, user.shopId, input.vehicle)
      const fields = { roNumber: input.roNumber, customer: input.customer, vehicleId: vehicle.id, tasks }
      return insertJob(trx, user.shopId, user.id, fields)
    }),
  )
  return loadJobDetail(db, jobId, user.shopId)
}

/** A change to the job's RO, customer, vehicle or calibrations, all or nothing. */
export async function changeJob(user: SessionUser, jobId: string, changes: JobChange) {
  const db = getDb()
  if (!(await findJobInShop(db, jobId, user.shopId))) notFound("That job")
  if (changes.roNumber) {
    const other = await findJobByRoNumber(db, changes.roNumber, user.shopId)
    if (other && other.id !== jobId) throw duplicateRoError(changes.roNumber)
  }
  await withRoNumberConflict(changes.roNumber, () =>
    db.transaction().execute(async (trx) => {
      const vehicle = changes.vehicle ? await upsertVehicle(trx, user.shopId, changes.vehicle) : undefined
      const fields = { roNumber: changes.roNumber, customer: changes.customer, vehicleId: vehicle?.id }
      await updateJobFields(trx, jobId, user.shopId, fields)
      if (changes.tasks) await replaceTasks(trx, jobId, user.shopId, changes.tasks)
    }),
  )
  return loadJobDetail(db, jobId, user.shopId)
}

function upsertVehicle(db: Db, shopId: string, vehicle: VehicleInput) {
  return upsertVehicleByVin(db, shopId, { ...vehicle, year: vehicle.year ?? decodeModelYear(vehicle.vin) })
}

/** Runs `work`, answering a unique violation on the RO number (a concurrent intake won) as the 409 it is. */
async function withRoNumberConflict<T>(roNumber: string | undefined, work: () => Promise<T>): Promise<T> {
  try {
    return await work()
  } catch (error) {
    if (roNumber && isDuplicateRoNumber(error)) throw duplicateRoError(roNumber)
    throw error
  }
}

async function replaceTasks(db: Db, jobId: string, shopId: string, incoming: NonNullable<JobChange["tasks"]>) {
  const plan = planTaskReplacement(await listTasksForJob(db, jobId, shopId), incoming)
  if (Object.keys(plan.unknownIds).length) validationFailed(plan.unknownIds)
  if ((await taskIdsWithDrives(db, plan.removed, shopId)).length) {
    throw new AppError("conflict", "A calibration that has a drive cannot be removed from the job.")
  }
  const rows = await resolveTaskRows(db, shopId, plan.tasks)
  await deleteTasks(db, plan.removed, jobId, shopId)
  await Promise.all(incoming.map((t, i) => (t.id ? updateTask(db, t.id, jobId, shopId, rows[i]!) : null)))
  await insertTasks(
    db,
    shopId,
    jobId,
    rows.filter((_, i) => !incoming[i]!.id),
  )
}
