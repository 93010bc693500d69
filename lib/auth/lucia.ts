// Lucia v3 is unmaintained upstream: it is kept behind this one module so that it can be swapped.
import { NodePostgresAdapter } from "@lucia-auth/adapter-postgresql"
import { createHash } from "node:crypto"
import { generateIdFromEntropySize, Lucia, TimeSpan } from "lucia"
import type pg from "pg"
import type { Role } from "./roles"

export type SessionUser = { id: string; email: string; name: string; role: Role; shopId: string; disabled: boolean }

export function createLucia(pool: pg.Pool, { secure }: { secure: boolean }) {
  return new Lucia(new NodePostgresAdapter(pool, { user: "app_user", session: "user_session" }), {
    sessionExpiresIn: new TimeSpan(12, "h"),
    // expires: the cookie lasts as long as the session (12 h, renewed when the session slides), not 400 days.
    sessionCookie: { name: "straightaway_session", expires: true, attributes: { secure, sameSite: "lax", path: "/" } },
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      role: row.role,
      shopId: row.shop_id,
      disabled: row.disabled,
    }),
  })
}

export type Auth = ReturnType<typeof createLucia>

/**
 * The cookie holds a random token; the database keeps only its SHA-256 as the session id, so a copy of
 * the sessions table signs nobody in (Lucia v3 takes a caller's session id).
 */
export function newSessionToken(): string {
  return generateIdFromEntropySize(25)
}

export function sessionIdFromToken(token: string): string {
  return createHash("sha256").update(token).digest("hex")
}

declare module "lucia" {
  interface Register {
    Lucia: Auth
    DatabaseUserAttributes: { email: string; name: string; role: Role; shop_id: string; disabled: boolean }
  }
}
