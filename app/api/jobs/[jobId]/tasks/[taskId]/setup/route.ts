import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { saveTaskSetup, taskParams, taskSetup, type TaskParams } from "@/app/_server/services/tasks"
import { setupInputSchema } from "@/lib/setup"

/** The task's static set-up record; `setup: null` until someone records it. */
export const GET = route<TaskParams>(async (_req, { params }) => {
  const { user } = await requireRole()
  const path = await parseParams(params, taskParams)
  return Response.json({ setup: await taskSetup(user, path) })
})

/** Records (or corrects) the set-up; new figures withdraw a lead's override. */
export const PUT = route<TaskParams>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const path = await parseParams(params, taskParams)
  const input = await parseJson(req, setupInputSchema)
  return Response.json({ setup: await saveTaskSetup(user, path, input) })
})
