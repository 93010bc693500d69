import "server-only"
// The workflows of one calibration of a job: its pre-drive checklist and, for a static calibration, its target
// set-up (measurements, scan, a lead's override of figures out of tolerance).
import { z } from "zod"
import { uuidParam } from "@/app/_server/route"
import { getDb, type Db } from "@/db/client"
import { findChecklistForTask, upsertChecklist } from "@/db/queries/checklists"
import { checklistJson, findTaskInJob, isCoDriverOnJob } from "@/db/queries/jobs"
import { findSetupRecord, setSetupOverride, setupJson, upsertSetupRecord } from "@/db/queries/setup"
import { findShopSettings } from "@/db/queries/shop-settings"
import type { SessionUser } from "@/lib/auth/lucia"
import { AppError, notFound } from "@/lib/errors"
import type { SetupInput } from "@/lib/setup"
import type { checklistSchema } from "@/lib/validation/checklist"

/** The path of a task's resources: /api/jobs/:jobId/tasks/:taskId/… */
export const taskParams = z.object({ jobId: uuidParam, taskId: uuidParam })
export type TaskParams = { jobId: string; taskId: string }

type Reader = Pick<SessionUser, "id" | "role" | "shopId">

/** A co-driver reads a job's tasks only through a drive of that job that names them. */
async function mayRead(db: Db, user: Reader, jobId: string, what: string) {
  if (user.role === "co_driver" && !(await isCoDriverOnJob(db, jobId, user.shopId, user.id))) notFound(what)
}

async function findTask(db: Db, { jobId, taskId }: TaskParams, shopId: string) {
  return (await findTaskInJob(db, taskId, jobId, shopId)) ?? notFound("That calibration")
}

/** The task of the path, which must be a static calibration (static, or static then a drive). */
async function findStaticTask(db: Db, path: TaskParams, shopId: string) {
  const task = await findTask(db, path, shopId)
  if (task.method === "dynamic") {
    throw new AppError("conflict", "This calibration is a drive learn (dynamic); it has no target set-up to record.")
  }
  return task
}

async function checklistOfTask(db: Db, task: { id: string; method: string; reason: string }, shopId: string) {
  const row = await findChecklistForTask(db, task.id, shopId)
  if (!row) return null
  const { tirePressureTolerancePsi } = await findShopSettings(db, shopId)
  return checklistJson(row, task, tirePressureTolerancePsi)
}

/** The task's checklist; null until someone fills it in. */
export async function taskChecklist(user: Reader, path: TaskParams) {
  const db = getDb()
  await mayRead(db, user, path.jobId, "That checklist")
  return checklistOfTask(db, await findTask(db, path, user.shopId), user.shopId)
}

export async function saveTaskChecklist(user: Reader, path: TaskParams, data: z.output<typeof checklistSchema>) {
  const db = getDb()
  const task = await findTask(db, path, user.shopId)
  await upsertChecklist(db, task.id, user.shopId, data, user.id)
  return (await checklistOfTask(db, task, user.shopId)) ?? notFound("That checklist")
}

/** The task's static set-up; null until someone records it. */
export async function taskSetup(user: Reader, path: TaskParams) {
  const db = getDb()
  await mayRead(db, user, path.jobId, "That set-up")
  const task = await findStaticTask(db, path, user.shopId)
  const row = await findSetupRecord(db, task.id, user.shopId)
  return row ? setupJson(row) : null
}

/** Records (or corrects) the set-up; new figures withdraw a lead's override. */
export async function saveTaskSetup(user: Reader, path: TaskParams, input: SetupInput) {
  const db = getDb()
  const task = await findStaticTask(db, path, user.shopId)
  await upsertSetupRecord(db, { taskId: task.id, jobId: task.job_id, shopId: user.shopId, userId: user.id, input })
  return setupJson((await findSetupRecord(db, task.id, user.shopId)) ?? notFound("That set-up"))
}

/** A shop lead lets the road test go ahead with out-of-tolerance figures; the note says why and goes on the record. */
export async function overrideTaskSetup(user: Reader, path: TaskParams, note: string) {
  const db = getDb()
  const task = await findStaticTask(db, path, user.shopId)
  const row = (await findSetupRecord(db, task.id, user.shopId)) ?? notFound("That set-up")
  if (setupJson(row).outOfTolerance === 0)
    throw new AppError("conflict", "Every set-up measurement is in tolerance; there is nothing to override.")
  await setSetupOverride(db, task.id, user.shopId, note, user.id)
  return setupJson((await findSetupRecord(db, task.id, user.shopId)) ?? notFound("That set-up"))
}
