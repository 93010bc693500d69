import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findSetupRecord, setSetupOverride, setupJson } from "@/db/queries/setup"
import { AppError, notFound } from "@/lib/errors"
import { setupOverrideSchema } from "@/lib/setup"
import { findStaticTask } from "../_task"

const paramsSchema = z.object({ jobId: uuidParam, taskId: uuidParam })

/** A shop lead lets the road test go ahead with out-of-tolerance figures; the note says why and goes on the record. */
export const POST = route<{ jobId: string; taskId: string }>(async (req, { params }) => {
  const { user } = await requireRole("shop_lead")
  const { jobId, taskId } = await parseParams(params, paramsSchema)
  const { note } = await parseJson(req, setupOverrideSchema)
  const db = getDb()
  const task = await findStaticTask(db, taskId, jobId, user.shopId)
  const row = (await findSetupRecord(db, task.id, user.shopId)) ?? notFound("That set-up")
  if (setupJson(row).outOfTolerance === 0)
    throw new AppError("conflict", "Every set-up measurement is in tolerance; there is nothing to override.")
  await setSetupOverride(db, task.id, user.shopId, note, user.id)
  return Response.json({ setup: setupJson((await findSetupRecord(db, task.id, user.shopId))!) })
})
