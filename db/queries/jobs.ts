import { sql, type RawBuilder } from "kysely"
import type { JobSort } from "@/lib/validation/job"
import { assessChecklist } from "@/lib/checklist"
import { validationFailed } from "@/lib/errors"
import { checklistSchema, type ChecklistData } from "@/lib/validation/checklist"
import { isTimestampText, unstorableTextProblem } from "@/lib/validation/storable"
import { isUuid } from "@/lib/validation/uuid"
import { listCompleteAttachmentsForJob } from "./attachments"
import { listChecklistsForTasks } from "./checklists"
import { findCurrentProfileVersionById, findDefaultProfileForSensor } from "./profiles"
import { keysetPage } from "./paging"
import { selectInShop } from "./shop-scope"
import { findShopSettings } from "./shop-settings"
import type { Db } from "../client"
import type { JobStatus } from "../types"

// Sort keys as SQL expressions, with the type their cursor value is cast back to. Text sorts ignore case;
// status sorts in the order a job moves through.
const SORT_EXPR: Record<JobSort, { expr: RawBuilder<unknown>; type: RawBuilder<unknown> }> = {
  createdAt: { expr: sql`job.created_at`, type: sql`timestamptz` },
  updatedAt: { expr: sql`job.updated_at`, type: sql`timestamptz` },
  roNumber: { expr: sql`lower(job.ro_number)`, type: sql`text` },
  customer: { expr: sql`lower(job.customer_name)`, type: sql`text` },
  status: {
    expr: sql`(case job.status when 'open' then 0 when 'redo' then 1 when 'drive' then 2 when 'review' then 3 else 4 end)`,
    type: sql`integer`,
  },
}

export type JobListOptions = {
  status?: JobStatus
  q?: string
  sort: JobSort
  dir: "asc" | "desc"
  limit: number
  cursor?: { value: string; id: string }
}

/** A job with its vehicle, as the list and the detail both read it. */
const JOB_ROW_COLUMNS = [
  "job.id",
  "job.ro_number",
  "job.status",
  "job.customer_name",
  "job.created_at",
  "job.updated_at",
  "vehicle.vin",
  "vehicle.year",
  "vehicle.make",
  "vehicle.model",
  "vehicle.plate",
] as const

function escapeLike(text: string) {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`)
}

function filteredJobs(db: Db, shopId: string, opts: Pick<JobListOptions, "status" | "q">) {
  let q = db
    .selectFrom("job")
    .innerJoin("vehicle", (j) => j.onRef("vehicle.id", "=", "job.vehicle_id").on("vehicle.shop_id", "=", shopId))
    .where("job.shop_id", "=", shopId)
  if (opts.status) q = q.where("job.status", "=", opts.status)
  if (opts.q) {
    const like = `%${escapeLike(opts.q)}%`
    q = q.where((eb) =>
      eb.or([
        eb("job.ro_number", "ilike", like),
        eb("job.customer_name", "ilike", like),
        eb("vehicle.vin", "ilike", like),
        eb("vehicle.make", "ilike", like),
        eb("vehicle.model", "ilike", like),
        eb("vehicle.plate", "ilike", like),
      ]),
    )
  }
  return q
}

/** One page of the shop's jobs, keyset-paged on (sort key, id); `nextCursor` is opaque to clients. */
export async function listJobs(db: Db, shopId: string, opts: JobListOptions) {
  const { expr, type } = SORT_EXPR[opts.sort]
  const direction = opts.dir === "asc" ? sql`asc` : sql`desc`
  let q = filteredJobs(db, shopId, opts)
    .select(JOB_ROW_COLUMNS)
    .select([
      sql<string>`(${expr})::text`.as("sort_key"),
      (eb) =>
        eb
          .selectFrom("job_task")
          .select(sql<string[]>`coalesce(array_agg(job_task.sensor order by job_task.created_at), '{}')`.as("s"))
          .whereRef("job_task.job_id", "=", "job.id")
          .where("job_task.shop_id", "=", shopId)
          .as("sensors"),
    ])
    .orderBy(sql`${expr} ${direction}`)
    .orderBy(sql`job.id ${direction}`)
    .limit(opts.limit + 1)
  if (opts.cursor) {
    const op = opts.dir === "asc" ? sql`>` : sql`<`
    q = q.where(
      sql<boolean>`(${expr}, job.id) ${op} (cast(${opts.cursor.value} as ${type}), cast(${opts.cursor.id} as uuid))`,
    )
  }
  const [rows, total] = await Promise.all([
    q.execute(),
    filteredJobs(db, shopId, opts)
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .executeTakeFirst(),
  ])
  return {
    ...keysetPage(rows, opts.limit, (last) => encodeCursor(last.sort_key, last.id)),
    total: Number(total?.n ?? 0),
  }
}

function encodeCursor(value: string, id: string) {
  return Buffer.from(JSON.stringify([value, id])).toString("base64url")
}

/**
 * The cursor as given out by listJobs for this sort, or null if it is not one. The value is cast back
 * to the sort key's type in SQL, so it is checked here: a value the cast refuses would be a 500.
 */
export function decodeCursor(cursor: string, sort: JobSort): { value: string; id: string } | null {
  try {
    const parsed: unknown = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8"))
    if (!Array.isArray(parsed) || parsed.length !== 2) return null
    const [value, id] = parsed
    if (typeof value !== "string" || typeof id !== "string" || !isUuid(id)) return null
    if (unstorableTextProblem(value)) return null
    if ((sort === "createdAt" || sort === "updatedAt") && !isTimestampText(value)) return null
    if (sort === "status" && !/^[0-4]$/.test(value)) return null
    return { value, id }
  } catch {
    return null
  }
}

export function findJobInShop(db: Db, jobId: string, shopId: string) {
  return selectInShop(db, "job", shopId)
    .innerJoin("vehicle", (j) => j.onRef("vehicle.id", "=", "job.vehicle_id").on("vehicle.shop_id", "=", shopId))
    .select([...JOB_ROW_COLUMNS, "job.customer_email", "job.customer_phone", "job.vehicle_id"])
    .where("job.id", "=", jobId)
    .executeTakeFirst()
}

export function findJobByRoNumber(db: Db, roNumber: string, shopId: string) {
  return selectInShop(db, "job", shopId).select(["id"]).where("ro_number", "=", roNumber).executeTakeFirst()
}

/** Whether a co-driver is named on any drive of this job (what lets them see it). */
export async function isCoDriverOnJob(db: Db, jobId: string, shopId: string, userId: string) {
  const row = await selectInShop(db, "drive", shopId)
    .select("id")
    .where("job_id", "=", jobId)
    .where("co_driver_id", "=", userId)
    .executeTakeFirst()
  return Boolean(row)
}

/** The job's tasks, the start of both reads of them. */
function tasksOfJob(db: Db, jobId: string, shopId: string) {
  return selectInShop(db, "job_task", shopId).selectAll().where("job_id", "=", jobId)
}

export function listTasksForJob(db: Db, jobId: string, shopId: string) {
  return tasksOfJob(db, jobId, shopId).orderBy("created_at").orderBy("id").execute()
}

export function findTaskInJob(db: Db, taskId: string, jobId: string, shopId: string) {
  return tasksOfJob(db, jobId, shopId).where("id", "=", taskId).executeTakeFirst()
}

function listDrivesForJob(db: Db, jobId: string, shopId: string, onlyCoDriverId?: string) {
  let q = selectInShop(db, "drive", shopId)
    .select(["public_id as id", "task_id", "status", "verdict", "review_status", "created_at", "finished_at"])
    .where("job_id", "=", jobId)
  if (onlyCoDriverId) q = q.where("co_driver_id", "=", onlyCoDriverId)
  return q.orderBy("created_at", "desc").execute()
}

export type NewTaskRow = { sensor: string; method: string; reason: string; profileId: string | null }

export async function insertJob(
  db: Db,
  shopId: string,
  userId: string,
  job: {
    roNumber: string
    customer: { name: string; email: string | null; phone: string | null }
    vehicleId: string
    tasks: NewTaskRow[]
  },
) {
  const row = await db
    .insertInto("job")
    .values({
      shop_id: shopId,
      ro_number: job.roNumber,
      customer_name: job.customer.name,
      customer_email: job.customer.email,
      customer_phone: job.customer.phone,
      vehicle_id: job.vehicleId,
      created_by: userId,
    })
    .returning(["id"])
    .executeTakeFirstOrThrow()
  await insertTasks(db, shopId, row.id, job.tasks)
  return row.id
}

export async function insertTasks(db: Db, shopId: string, jobId: string, tasks: NewTaskRow[]) {
  if (tasks.length === 0) return
  // One statement; created_at steps by a microsecond so the tasks keep the order they were given in.
  await db
    .insertInto("job_task")
    .values(
      tasks.map((t, i) => ({
        shop_id: shopId,
        job_id: jobId,
        sensor: t.sensor,
        method: t.method,
        reason: t.reason,
        profile_id: t.profileId,
        created_at: sql<Date>`clock_timestamp() + ${i} * interval '1 microsecond'`,
      })),
    )
    .execute()
}

export function updateTask(db: Db, taskId: string, jobId: string, shopId: string, t: NewTaskRow) {
  return db
    .updateTable("job_task")
    .set({ sensor: t.sensor, method: t.method, reason: t.reason, profile_id: t.profileId })
    .where("id", "=", taskId)
    .where("job_id", "=", jobId)
    .where("shop_id", "=", shopId)
    .execute()
}

export function deleteTasks(db: Db, taskIds: string[], jobId: string, shopId: string) {
  if (taskIds.length === 0) return Promise.resolve([])
  return db
    .deleteFrom("job_task")
    .where("id", "in", taskIds)
    .where("job_id", "=", jobId)
    .where("shop_id", "=", shopId)
    .execute()
}

export async function taskIdsWithDrives(db: Db, taskIds: string[], shopId: string) {
  if (taskIds.length === 0) return []
  const rows = await db
    .selectFrom("drive")
    .select("task_id")
    .distinct()
    .where("task_id", "in", taskIds)
    .where("shop_id", "=", shopId)
    .execute()
  return rows.map((r) => r.task_id!)
}

export function updateJobFields(
  db: Db,
  jobId: string,
  shopId: string,
  changes: {
    roNumber?: string
    customer?: { name: string; email: string | null; phone: string | null }
    vehicleId?: string
  },
) {
  return db
    .updateTable("job")
    .set({
      ...(changes.roNumber !== undefined ? { ro_number: changes.roNumber } : {}),
      ...(changes.customer
        ? {
            customer_name: changes.customer.name,
            customer_email: changes.customer.email,
            customer_phone: changes.customer.phone,
          }
        : {}),
      ...(changes.vehicleId ? { vehicle_id: changes.vehicleId } : {}),
      updated_at: sql`now()`,
    })
    .where("id", "=", jobId)
    .where("shop_id", "=", shopId)
    .execute()
}

/** Postgres unique violation on the shop's RO numbers. */
export function isDuplicateRoNumber(error: unknown) {
  const e = error as { code?: string; constraint?: string } | null
  return e?.code === "23505" && e.constraint === "job_shop_ro_uq"
}

// ---- the job as GET /api/jobs/:id returns it ----

type ChecklistRow = {
  data: Record<string, unknown>
  completed_by: string | null
  completed_at: Date
  completed_by_name: string | null
}

export function checklistJson(row: ChecklistRow, task: { method: string; reason: string }, tolerancePsi: number) {
  const parsed = checklistSchema.safeParse(row.data)
  const assessment = parsed.success ? assessChecklist(parsed.data, task, tolerancePsi) : null
  return {
    ...(parsed.success ? (parsed.data as ChecklistData) : row.data),
    completedBy: row.completed_by_name,
    completedById: row.completed_by,
    completedAt: row.completed_at,
    ready: assessment?.ready ?? false,
    blockers: assessment?.blockers ?? [{ key: "checklist", message: "Fill in the checklist again." }],
    tireChecks: assessment?.tires ?? [],
    tolerancePsi,
  }
}

export function attachmentJson(a: {
  id: string
  task_id: string | null
  filename: string
  content_type: string
  size: number
  thumbnail_key: string | null
  created_at: Date
}) {
  const url = `/api/attachments/${a.id}`
  return {
    id: a.id,
    taskId: a.task_id,
    filename: a.filename,
    contentType: a.content_type,
    size: a.size,
    url,
    // made at upload for JPEG, PNG and WebP; HEIC (which the image library cannot decode) and PDFs have none
    thumbnailUrl: a.thumbnail_key ? `${url}?variant=thumbnail` : null,
    createdAt: a.created_at,
  }
}

/** GET /api/jobs/:id's `job`, or undefined when the job is not in the shop. */
export async function loadJobDetail(db: Db, jobId: string, shopId: string, opts: { onlyCoDriverId?: string } = {}) {
  const job = await findJobInShop(db, jobId, shopId)
  if (!job) return undefined
  const [tasks, attachments, drives, settings] = await Promise.all([
    listTasksForJob(db, jobId, shopId),
    listCompleteAttachmentsForJob(db, jobId, shopId),
    listDrivesForJob(db, jobId, shopId, opts.onlyCoDriverId),
    findShopSettings(db, shopId),
  ])
  const checklists = await listChecklistsForTasks(
    db,
    tasks.map((t) => t.id),
    shopId,
  )
  const profiles = await Promise.all(
    tasks.map((t) => (t.profile_id ? findCurrentProfileVersionById(db, t.profile_id, shopId) : undefined)),
  )
  return {
    id: job.id,
    roNumber: job.ro_number,
    status: job.status,
    customer: { name: job.customer_name, email: job.customer_email, phone: job.customer_phone },
    vehicle: { id: job.vehicle_id, vin: job.vin, year: job.year, make: job.make, model: job.model, plate: job.plate },
    createdAt: job.created_at,
    updatedAt: job.updated_at,
    tasks: tasks.map((t, i) => {
      const p = profiles[i]
      const c = checklists.find((x) => x.task_id === t.id)
      return {
        id: t.id,
        sensor: t.sensor,
        method: t.method,
        reason: t.reason,
        profile: p
          ? {
              id: p.profileId,
              key: p.key,
              name: p.name,
              version: p.version,
              versionId: p.versionId,
              settings: p.settings,
            }
          : null,
        checklist: c ? checklistJson(c, t, settings.tirePressureTolerancePsi) : null,
      }
    }),
    attachments: attachments.map(attachmentJson),
    drives: drives.map((d) => ({
      id: d.id,
      taskId: d.task_id,
      status: d.status,
      verdict: d.verdict,
      reviewStatus: d.review_status,
      createdAt: d.created_at,
      finishedAt: d.finished_at,
    })),
    settings: { units: settings.units, tirePressureTolerancePsi: settings.tirePressureTolerancePsi },
  }
}

/**
 * Task rows with their condition profile: the one named (it must be the shop's), else the shop's default
 * for the sensor when the task includes a drive. A static-only task has no drive and gets none.
 */
export async function resolveTaskRows(
  db: Db,
  shopId: string,
  tasks: { sensor: string; method: string; reason: string; profileId?: string | null }[],
): Promise<NewTaskRow[]> {
  const fields: Record<string, string> = {}
  const rows = await Promise.all(
    tasks.map(async (t, i) => {
      let profileId: string | null = null
      if (t.profileId) {
        const p = await findCurrentProfileVersionById(db, t.profileId, shopId)
        if (!p) fields[`tasks.${i}.profileId`] = "is not one of this shop's condition profiles"
        profileId = t.profileId
      } else if (t.profileId === undefined && t.method !== "static") {
        profileId = (await findDefaultProfileForSensor(db, t.sensor, shopId))?.id ?? null
      }
      return { sensor: t.sensor, method: t.method, reason: t.reason, profileId }
    }),
  )
  if (Object.keys(fields).length) validationFailed(fields)
  return rows
}
