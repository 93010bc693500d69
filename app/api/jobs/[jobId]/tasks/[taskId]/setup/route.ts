import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { isCoDriverOnJob } from "@/db/queries/jobs"
import { findSetupRecord, setupJson, upsertSetupRecord } from "@/db/queries/setup"
import { notFound } from "@/lib/errors"
import { setupInputSchema } from "@/lib/setup"
import { findStaticTask } from "./_task"

const paramsSchema = z.object({ jobId: uuidParam, taskId: uuidParam })
type Params = { jobId: string; taskId: string }

/** The task's static set-up record; `setup: null` until someone records it. */
export const GET = route<Params>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { jobId, taskId } = await parseParams(params, paramsSchema)
  const db = getDb()
  if (user.role === "co_driver" && !(await isCoDriverOnJob(db, jobId, user.shopId, user.id))) notFound("That set-up")
  const task = await findStaticTask(db, taskId, jobId, user.shopId)
  const row = await findSetupRecord(db, task.id, user.shopId)
  return Response.json({ setup: row ? setupJson(row) : null })
})

/** Records (or corrects) the set-up; new figures withdraw a lead's override. */
export const PUT = route<Params>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { jobId, taskId } = await parseParams(params, paramsSchema)
  const input = await parseJson(req, setupInputSchema)
  const db = getDb()
  const task = await findStaticTask(db, taskId, jobId, user.shopId)
  await upsertSetupRecord(db, { taskId: task.id, jobId: task.job_id, shopId: user.shopId, userId: user.id, input })
  const row = (await findSetupRecord(db, task.id, user.shopId)) ?? notFound("That set-up")
  return Response.json({ setup: setupJson(row) })
})
