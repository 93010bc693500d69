import "server-only"
// Signing in: throttled per e-mail (and per client address behind a trusted proxy), Argon2id, a hashed session id.
import { getAuth } from "@/app/_server/auth"
import { clientAddress } from "@/app/_server/client-address"
import { getDb } from "@/db/client"
import { clearSignInFailures, countRecentSignInFailures, insertSignInFailure } from "@/db/queries/sign-in-failures"
import { findUserByEmail } from "@/db/queries/users"
import { newSessionToken, sessionIdFromToken } from "@/lib/auth/lucia"
import { verifyAgainstDummy, verifyPassword } from "@/lib/auth/password"
import { computeRetryAfterSeconds, SIGN_IN_WINDOW_SECONDS } from "@/lib/auth/throttle"
import { AppError } from "@/lib/errors"

const WRONG = "That e-mail and password do not match an active account."

/** Checks the password and makes a session; answers the user and the session cookie to set. */
export async function signIn(req: Request, email: string, password: string) {
  const db = getDb()
  // No trusted address (no proxy configured): only the per-e-mail limit applies, so no client can lock others out.
  const address = clientAddress(req)
  const counts = await countRecentSignInFailures(db, email, address ?? "", SIGN_IN_WINDOW_SECONDS)
  const wait = computeRetryAfterSeconds(address ? counts : { ...counts, byAddress: 0, oldestByAddress: null })
  if (wait > 0) {
    const minutes = Math.ceil(wait / 60)
    throw new AppError("too_many_attempts", `Too many failed sign-ins. Try again in ${minutes} min.`, undefined, {
      "Retry-After": String(wait),
    })
  }
  const user = await findUserByEmail(db, email)
  const ok =
    user && !user.disabled ? await verifyPassword(user.password_hash, password) : await verifyAgainstDummy(password)
  if (!user || !ok || user.disabled) {
    await insertSignInFailure(db, email, address ?? "")
    throw new AppError("not_signed_in", WRONG)
  }
  await clearSignInFailures(db, email)
  const auth = getAuth()
  const token = newSessionToken()
  await auth.createSession(user.id, {}, { sessionId: sessionIdFromToken(token) })
  const cookie = auth.createSessionCookie(token)
  return { user: { id: user.id, email: user.email, name: user.name, role: user.role, shopId: user.shop_id }, cookie }
}
