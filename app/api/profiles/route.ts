import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { createProfile, listProfilesJson } from "@/app/_server/services/profiles"
import { newProfileSchema } from "@/lib/validation/profile"

export const GET = route(async () => {
  const { user } = await requireRole()
  return Response.json({ profiles: await listProfilesJson(user) })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const input = await parseJson(req, newProfileSchema)
  return Response.json(await createProfile(user, input), { status: 201 })
})
