import "server-only"
import { cookies } from "next/headers"
import { redirect } from "next/navigation"
import { cache } from "react"
import { getAuth, sessionForToken, type CurrentSession } from "@/app/_server/session-token"
import type { SessionUser } from "@/lib/auth/lucia"
import { hasRole, type Role } from "@/lib/auth/roles"
import { AppError } from "@/lib/errors"

export { getAuth, type CurrentSession } from "@/app/_server/session-token"

/** The signed-in user for this request (once per request), refreshing the cookie when the session slides. */
export const getCurrentSession = cache(async (): Promise<CurrentSession> => {
  const jar = await cookies()
  const { current, cookie } = await sessionForToken(jar.get(getAuth().sessionCookieName)?.value ?? null)
  try {
    if (cookie) jar.set(cookie.name, cookie.value, cookie.attributes)
  } catch {
    // Server components may not set cookies; the route handlers will.
  }
  return current
})

/** For route handlers: the signed-in user with one of the roles (admin always passes), or a 401/403. */
export async function requireRole(...roles: Role[]): Promise<{ user: SessionUser; sessionId: string }> {
  const current = await getCurrentSession()
  if (!current.user) throw new AppError("not_signed_in", "Sign in first.")
  if (roles.length && !hasRole(current.user.role, roles)) throw new AppError("forbidden", "Your role cannot do that.")
  return current
}

export async function requireUser() {
  return requireRole()
}

/** For pages: redirects to sign-in when signed out, and to the role's home when the role may not see it. */
export async function requirePageRole(...roles: Role[]): Promise<SessionUser> {
  const current = await getCurrentSession()
  if (!current.user) redirect("/sign-in")
  if (roles.length && !hasRole(current.user.role, roles)) redirect("/")
  return current.user
}
