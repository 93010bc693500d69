import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { changeProfile, profileDetail } from "@/app/_server/services/profiles"
import { profileChangeSchema } from "@/lib/validation/profile"

const paramsSchema = z.object({ profileId: uuidParam })

export const GET = route<{ profileId: string }>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { profileId } = await parseParams(params, paramsSchema)
  return Response.json(await profileDetail(user, profileId))
})

export const PATCH = route<{ profileId: string }>(async (req, { params }) => {
  const { user } = await requireRole("shop_lead")
  const { profileId } = await parseParams(params, paramsSchema)
  const changes = await parseJson(req, profileChangeSchema)
  return Response.json(await changeProfile(user, profileId, changes))
})
