import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import {
  deleteTasks,
  findJobByRoNumber,
  findJobInShop,
  insertTasks,
  isCoDriverOnJob,
  isDuplicateRoNumber,
  listTasksForJob,
  loadJobDetail,
  resolveTaskRows,
  taskIdsWithDrives,
  updateJobFields,
  updateTask,
} from "@/db/queries/jobs"
import { upsertVehicleByVin } from "@/db/queries/vehicles"
import { AppError, notFound, validationFailed } from "@/lib/errors"
import { decodeModelYear } from "@/lib/vin"
import { duplicateRoError, jobChangeSchema } from "@/lib/validation/job"

const paramsSchema = z.object({ jobId: uuidParam })

export const GET = route<{ jobId: string }>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { jobId } = await parseParams(params, paramsSchema)
  const db = getDb()
  // A co-driver sees a job only through a drive that names them, and only those drives.
  const coDriver = user.role === "co_driver"
  if (coDriver && !(await isCoDriverOnJob(db, jobId, user.shopId, user.id))) notFound("That job")
  const job = await loadJobDetail(db, jobId, user.shopId, { onlyCoDriverId: coDriver ? user.id : undefined })
  if (!job) notFound("That job")
  return Response.json({ job })
})

export const PATCH = route<{ jobId: string }>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { jobId } = await parseParams(params, paramsSchema)
  const changes = await parseJson(req, jobChangeSchema)
  const db = getDb()
  if (!(await findJobInShop(db, jobId, user.shopId))) notFound("That job")
  if (changes.roNumber) {
    const other = await findJobByRoNumber(db, changes.roNumber, user.shopId)
    if (other && other.id !== jobId) throw duplicateRoError(changes.roNumber)
  }
  try {
    await db.transaction().execute(async (trx) => {
      const vehicle = changes.vehicle
        ? await upsertVehicleByVin(trx, user.shopId, {
            ...changes.vehicle,
            year: changes.vehicle.year ?? decodeModelYear(changes.vehicle.vin),
          })
        : undefined
      await updateJobFields(trx, jobId, user.shopId, {
        roNumber: changes.roNumber,
        customer: changes.customer,
        vehicleId: vehicle?.id,
      })
      if (changes.tasks) await replaceTasks(trx, jobId, user.shopId, changes.tasks)
    })
  } catch (error) {
    if (isDuplicateRoNumber(error) && changes.roNumber) throw duplicateRoError(changes.roNumber)
    throw error
  }
  return Response.json({ job: await loadJobDetail(db, jobId, user.shopId) })
})

type TaskInput = NonNullable<z.output<typeof jobChangeSchema>["tasks"]>

/** Tasks keep their id; a missing one is removed unless a drive was made for it; a task without an id is new. */
async function replaceTasks(
  trx: Parameters<typeof listTasksForJob>[0],
  jobId: string,
  shopId: string,
  tasks: TaskInput,
) {
  const existing = await listTasksForJob(trx, jobId, shopId)
  const fields: Record<string, string> = {}
  tasks.forEach((t, i) => {
    if (t.id && !existing.some((e) => e.id === t.id)) fields[`tasks.${i}.id`] = "is not a task of this job"
  })
  if (Object.keys(fields).length) validationFailed(fields)
  const removed = existing.filter((e) => !tasks.some((t) => t.id === e.id)).map((e) => e.id)
  if ((await taskIdsWithDrives(trx, removed, shopId)).length) {
    throw new AppError("conflict", "A calibration that has a drive cannot be removed from the job.")
  }
  // An existing task keeps its profile unless one is named; a new task gets the default like at intake.
  const keep = tasks.map((t) =>
    t.id && t.profileId === undefined ? { ...t, profileId: existing.find((e) => e.id === t.id)!.profile_id } : t,
  )
  const rows = await resolveTaskRows(trx, shopId, keep)
  await deleteTasks(trx, removed, jobId, shopId)
  await Promise.all(tasks.map((t, i) => (t.id ? updateTask(trx, t.id, jobId, shopId, rows[i]!) : null)))
  await insertTasks(
    trx,
    shopId,
    jobId,
    rows.filter((_, i) => !tasks[i]!.id),
  )
}
