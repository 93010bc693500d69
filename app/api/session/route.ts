import { cookies } from "next/headers"
import { getAuth, requireUser } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { signIn } from "@/app/_server/services/session"
import type { SessionBody } from "@/lib/api/types"
import { signInSchema } from "@/lib/validation/session"

export const POST = route(async (req) => {
  const { email, password } = await parseJson(req, signInSchema)
  const { user, cookie } = await signIn(req, email, password)
  ;(await cookies()).set(cookie.name, cookie.value, cookie.attributes)
  return Response.json({ user } satisfies SessionBody)
})

export const GET = route(async () => {
  const { user } = await requireUser()
  const body: SessionBody = {
    user: { id: user.id, email: user.email, name: user.name, role: user.role, shopId: user.shopId },
  }
  return Response.json(body)
})

export const DELETE = route(async () => {
  const { sessionId } = await requireUser()
  const auth = getAuth()
  await auth.invalidateSession(sessionId)
  const c = auth.createBlankSessionCookie()
  ;(await cookies()).set(c.name, c.value, c.attributes)
  return new Response(null, { status: 204 })
})
