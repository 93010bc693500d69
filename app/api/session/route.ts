import { cookies } from "next/headers"
import { getAuth, requireUser } from "@/app/_server/auth"
import { clientAddress } from "@/app/_server/client-address"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { clearSignInFailures, countRecentSignInFailures, insertSignInFailure } from "@/db/queries/sign-in-failures"
import { findUserByEmail } from "@/db/queries/users"
import { newSessionToken, sessionIdFromToken } from "@/lib/auth/lucia"
import { verifyAgainstDummy, verifyPassword } from "@/lib/auth/password"
import { computeRetryAfterSeconds, SIGN_IN_WINDOW_SECONDS } from "@/lib/auth/throttle"
import { AppError } from "@/lib/errors"
import { signInSchema } from "@/lib/validation/session"

const WRONG = "That e-mail and password do not match an active account."

export const POST = route(async (req) => {
  const { email, password } = await parseJson(req, signInSchema)
  const db = getDb()
  // No trusted address (no proxy configured): only the per-e-mail limit applies, so no client can lock others out.
  const address = clientAddress(req)
  const counts = await countRecentSignInFailures(db, email, address ?? "", SIGN_IN_WINDOW_SECONDS)
  const wait = computeRetryAfterSeconds(address ? counts : { ...counts, byAddress: 0, oldestByAddress: null })
  if (wait > 0) {
    throw new AppError("too_many_attempts", `Too many failed sign-ins. Try again in ${Math.ceil(wait / 60)} min.`, undefined, {
      "Retry-After": String(wait),
    })
  }
  const user = await findUserByEmail(db, email)
  const ok = user && !user.disabled ? await verifyPassword(user.password_hash, password) : await verifyAgainstDummy(password)
  if (!user || !ok || user.disabled) {
    await insertSignInFailure(db, email, address ?? "")
    throw new AppError("not_signed_in", WRONG)
  }
  await clearSignInFailures(db, email)
  const auth = getAuth()
  const token = newSessionToken()
  await auth.createSession(user.id, {}, { sessionId: sessionIdFromToken(token) })
  const c = auth.createSessionCookie(token)
  ;(await cookies()).set(c.name, c.value, c.attributes)
  return Response.json({ user: { id: user.id, email: user.email, name: user.name, role: user.role, shopId: user.shop_id } })
})

export const GET = route(async () => {
  const { user } = await requireUser()
  return Response.json({ user: { id: user.id, email: user.email, name: user.name, role: user.role, shopId: user.shopId } })
})

export const DELETE = route(async () => {
  const { sessionId } = await requireUser()
  const auth = getAuth()
  await auth.invalidateSession(sessionId)
  const c = auth.createBlankSessionCookie()
  ;(await cookies()).set(c.name, c.value, c.attributes)
  return new Response(null, { status: 204 })
})
