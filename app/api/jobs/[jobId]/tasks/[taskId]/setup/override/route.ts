import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { overrideTaskSetup, taskParams, type TaskParams } from "@/app/_server/services/tasks"
import { setupOverrideSchema } from "@/lib/setup"

/** A shop lead lets the road test go ahead with out-of-tolerance figures; the note says why and goes on the record. */
export const POST = route<TaskParams>(async (req, { params }) => {
  const { user } = await requireRole("shop_lead")
  const path = await parseParams(params, taskParams)
  const { note } = await parseJson(req, setupOverrideSchema)
  return Response.json({ setup: await overrideTaskSetup(user, path, note) })
})
