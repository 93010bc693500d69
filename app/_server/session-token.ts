import "server-only"
import { getPool } from "@/db/client"
import type { Cookie } from "lucia"
import { createLucia, sessionIdFromToken, type Auth, type SessionUser } from "@/lib/auth/lucia"
import { env } from "@/lib/env"

// The session behind a cookie's token, without Next's request scope: auth.ts reads the token from next/headers for
// pages and most routes; the sample batch (sample-batch.ts) reads it from its request, as the app's own server
// answers that request before Next sees it (scripts/server.mjs).

let lucia: Auth | undefined
export function getAuth(): Auth {
  lucia ??= createLucia(getPool(), { secure: env().SECURE_COOKIES || env().APP_URL.startsWith("https:") })
  return lucia
}

export type CurrentSession = { user: SessionUser; sessionId: string } | { user: null; sessionId: null }

const SESSION_TOKEN = /^[a-z0-9]{16,128}$/

/** The signed-in user for a cookie's token, and the cookie the answer should set: the session slid, or is gone. */
export async function sessionForToken(
  token: string | null,
): Promise<{ current: CurrentSession; cookie: Cookie | null }> {
  const none = { user: null, sessionId: null } as const
  // Tokens are lowercase base32 (Lucia); anything else (a NUL, a lone surrogate) is no session, never a query.
  if (!token || !SESSION_TOKEN.test(token)) return { current: none, cookie: null }
  const auth = getAuth()
  const { session, user } = await auth.validateSession(sessionIdFromToken(token))
  const cookie = session?.fresh ? auth.createSessionCookie(token) : !session ? auth.createBlankSessionCookie() : null
  if (!session || !user) return { current: none, cookie }
  if (user.disabled) {
    await auth.invalidateUserSessions(user.id)
    return { current: none, cookie }
  }
  return { current: { user: { ...user }, sessionId: session.id }, cookie }
}

/** The session cookie's token from a Cookie request header. */
export function tokenFromCookieHeader(header: string | null): string | null {
  if (!header) return null
  const name = getAuth().sessionCookieName
  for (const part of header.split(";")) {
    const eq = part.indexOf("=")
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim()
  }
  return null
}
