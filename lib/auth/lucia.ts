// Lucia v3 is unmaintained upstream: it is kept behind this one module so that it can be swapped.
import { NodePostgresAdapter } from "@lucia-auth/adapter-postgresql"
import { createHash } from "node:crypto"
import { generateIdFromEntropySize, Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from "lucia"
import type pg from "pg"
import type { Role } from "./roles"

export type SessionUser = { id: string; email: string; name: string; role: Role; shopId: string; disabled: boolean }

/**
 * Lucia's PostgreSQL adapter, with the session and its user read in one statement (the adapter's own sends two,
 * each on its own pooled connection). Every signed-in request starts here, the recorder's sample POST included.
 * Only the user columns getUserAttributes maps are read (never the password hash).
 */
class SessionAdapter extends NodePostgresAdapter {
  constructor(private readonly pool: pg.Pool) {
    super(pool, { user: "app_user", session: "user_session" })
  }

  override async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const { rows } = await this.pool.query<SessionRow>({
      name: "session-and-user",
      text: SESSION_AND_USER,
      values: [sessionId],
    })
    const row = rows[0]
    if (!row) return [null, null]
    return [
      { id: row.id, userId: row.user_id, expiresAt: row.expires_at, attributes: {} },
      {
        id: row.user_id,
        attributes: { email: row.email, name: row.name, role: row.role, shop_id: row.shop_id, disabled: row.disabled },
      },
    ]
  }
}

const SESSION_AND_USER = `
  select s.id, s.user_id, s.expires_at, u.email, u.name, u.role, u.shop_id, u.disabled
  from user_session s join app_user u on u.id = s.user_id
  where s.id = $1`

type SessionRow = {
  id: string
  user_id: string
  expires_at: Date
  email: string
  name: string
  role: Role
  shop_id: string
  disabled: boolean
}

/** How long a session lasts without use; Lucia slides it once less than half of this is left. */
const SESSION_HOURS = 12

/**
 * Whether Lucia would take a session stored with this expiry as it is: still valid and not yet due to slide (Lucia
 * v3's validateSession deletes an expired session and extends one past half its life, each a write). A caller that
 * read the session with other data may then skip Lucia's own lookup; any other session goes through Lucia.
 */
export function sessionIsSettled(expiresAt: Date, now = Date.now()): boolean {
  return expiresAt.getTime() - (SESSION_HOURS * 3_600_000) / 2 > now
}

export function createLucia(pool: pg.Pool, { secure }: { secure: boolean }) {
  return new Lucia(new SessionAdapter(pool), {
    sessionExpiresIn: new TimeSpan(SESSION_HOURS, "h"),
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
