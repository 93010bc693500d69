import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findChecklistForTask, upsertChecklist } from "@/db/queries/checklists"
import { checklistJson, findTaskInJob, isCoDriverOnJob } from "@/db/queries/jobs"
import { findShopSettings } from "@/db/queries/shop-settings"
import { notFound } from "@/lib/errors"
import { checklistSchema } from "@/lib/validation/checklist"

const paramsSchema = z.object({ jobId: uuidParam, taskId: uuidParam })
type Params = { jobId: string; taskId: string }

export const GET = route<Params>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { jobId, taskId } = await parseParams(params, paramsSchema)
  const db = getDb()
  if (user.role === "co_driver" && !(await isCoDriverOnJob(db, jobId, user.shopId, user.id))) notFound("That checklist")
  const task = (await findTaskInJob(db, taskId, jobId, user.shopId)) ?? notFound("That calibration")
  const row = await findChecklistForTask(db, task.id, user.shopId)
  const { tirePressureTolerancePsi } = await findShopSettings(db, user.shopId)
  return Response.json({ checklist: row ? checklistJson(row, task, tirePressureTolerancePsi) : null })
})

export const PUT = route<Params>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { jobId, taskId } = await parseParams(params, paramsSchema)
  const data = await parseJson(req, checklistSchema)
  const db = getDb()
  const task = (await findTaskInJob(db, taskId, jobId, user.shopId)) ?? notFound("That calibration")
  await upsertChecklist(db, task.id, user.shopId, data, user.id)
  const row = (await findChecklistForTask(db, task.id, user.shopId)) ?? notFound("That checklist")
  const { tirePressureTolerancePsi } = await findShopSettings(db, user.shopId)
  return Response.json({ checklist: checklistJson(row, task, tirePressureTolerancePsi) })
})
