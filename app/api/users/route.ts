import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { addPerson, listPeople } from "@/app/_server/services/people"
import { newUserSchema } from "@/lib/validation/user"

export const GET = route(async () => {
  const { user } = await requireRole("admin")
  return Response.json({ users: await listPeople(user) })
})

export const POST = route(async (req) => {
  const { user } = await requireRole("admin")
  const input = await parseJson(req, newUserSchema)
  return Response.json({ user: await addPerson(user, input) }, { status: 201 })
})
