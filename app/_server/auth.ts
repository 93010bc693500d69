import "server-only"
import { cookies } from "next/headers"
import { redirect } from "next/navigation"
import { cache } from "react"
import { getPool } from "@/db/client"
import { AppError } from "@/lib/errors"
import { createLucia, sessionIdFromToken, type Auth, type SessionUser } from "@/lib/auth/lucia"
import { hasRole, type Role } from "@/lib/auth/roles"
import { env } from "@/lib/env"

let lucia: Auth | undefined
export function getAuth(): Auth {
  lucia ??= createLucia(getPool(), { secure: env().SECURE_COOKIES || env().APP_URL.startsWith("https:") })
  return lucia
}

export type CurrentSession = { user: SessionUser; sessionId: string } | { user: null; sessionId: null }

const SESSION_ID = /^[a-z0-9]{16,128}$/

/** The signed-in user for this request (once per request), refreshing the cookie when the session slides. */
export const getCurrentSession = cache(async (): Promise<CurrentSession> => {
  const auth = getAuth()
  const jar = await cookies()
  const token = jar.get(auth.sessionCookieName)?.value ?? null
  // Tokens are lowercase base32 (Lucia); anything else (a NUL, a lone surrogate) is no session, never a query.
  if (!token || !SESSION_ID.test(token)) return { user: null, sessionId: null }
  const { session, user } = await auth.validateSession(sessionIdFromToken(token))
  try {
    if (session?.fresh) {
      const c = auth.createSessionCookie(token)
      jar.set(c.name, c.value, c.attributes)
    }
    if (!session) {
      const c = auth.createBlankSessionCookie()
      jar.set(c.name, c.value, c.attributes)
    }
  } catch {
    // Server components may not set cookies; the route handlers will.
  }
  if (!session || !user) return { user: null, sessionId: null }
  if (user.disabled) {
    await auth.invalidateUserSessions(user.id)
    return { user: null, sessionId: null }
  }
  return { user: { ...user }, sessionId: session.id }
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
