import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { changePerson } from "@/app/_server/services/people"
import { userChangeSchema } from "@/lib/validation/user"

const paramsSchema = z.object({ userId: z.string().min(1).max(64) })

export const PATCH = route<{ userId: string }>(async (req, { params }) => {
  const { user } = await requireRole("admin")
  const { userId } = await parseParams(params, paramsSchema)
  const changes = await parseJson(req, userChangeSchema)
  return Response.json({ user: await changePerson(user, userId, changes) })
})
