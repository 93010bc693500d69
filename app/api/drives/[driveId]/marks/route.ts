import { parseJson, route } from "@/app/_server/route"
import { driveRouteIds } from "@/app/_server/services/drives"
import { addMarks } from "@/app/_server/services/recording"
import { markBatchSchema } from "@/lib/validation/drive"

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user, driveId } = await driveRouteIds(ctx.params)
  const { marks } = await parseJson(req, markBatchSchema)
  return Response.json(await addMarks(user, driveId, marks))
})
