import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { saveTaskChecklist, taskChecklist, taskParams, type TaskParams } from "@/app/_server/services/tasks"
import { checklistSchema } from "@/lib/validation/checklist"

export const GET = route<TaskParams>(async (_req, { params }) => {
  const { user } = await requireRole()
  const path = await parseParams(params, taskParams)
  return Response.json({ checklist: await taskChecklist(user, path) })
})

export const PUT = route<TaskParams>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const path = await parseParams(params, taskParams)
  const data = await parseJson(req, checklistSchema)
  return Response.json({ checklist: await saveTaskChecklist(user, path, data) })
})
