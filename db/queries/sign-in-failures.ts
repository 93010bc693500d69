import { sql } from "kysely"
import type { Db } from "../client"

export function insertSignInFailure(db: Db, email: string, clientAddress: string) {
  return db.insertInto("sign_in_failure").values({ email, client_address: clientAddress }).execute()
}

/** Failures in the window, per e-mail and per client address, with the oldest of each (for Retry-After). */
export async function countRecentSignInFailures(db: Db, email: string, clientAddress: string, windowSeconds: number) {
  const since = new Date(Date.now() - windowSeconds * 1000)
  const row = await db
    .selectFrom("sign_in_failure")
    .select([
      sql<number>`count(*) filter (where email = ${email})::int`.as("byEmail"),
      sql<number>`count(*) filter (where client_address = ${clientAddress})::int`.as("byAddress"),
      sql<Date | null>`min(created_at) filter (where email = ${email})`.as("oldestByEmail"),
      sql<Date | null>`min(created_at) filter (where client_address = ${clientAddress})`.as("oldestByAddress"),
    ])
    .where("created_at", ">", since)
    .where((eb) => eb.or([eb("email", "=", email), eb("client_address", "=", clientAddress)]))
    .executeTakeFirstOrThrow()
  return row
}

export function clearSignInFailures(db: Db, email: string) {
  return db.deleteFrom("sign_in_failure").where("email", "=", email).execute()
}
