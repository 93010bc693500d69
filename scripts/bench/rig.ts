// What the figures share: a throwaway shop, its people, signing one in as a phone does, and percentiles.
import { randomUUID } from "node:crypto"
import type { Db } from "@/db/client"
import { hashPassword } from "@/lib/auth/password"
import type { Role } from "@/lib/auth/roles"

/** A throwaway shop ("Bench <label> 1a2b3c4d"); the figure that made it deletes it. */
export async function benchShop(db: Db, label: string, settings: object = {}): Promise<string> {
  const { id } = await db
    .insertInto("shop")
    .values({ name: `Bench ${label} ${randomUUID().slice(0, 8)}`, settings: JSON.stringify(settings) })
    .returning("id")
    .executeTakeFirstOrThrow()
  return id
}

export type BenchPerson = { id: string; email: string; password: string }

/**
 * One person of a bench shop. `login`: a password and its hash made once, for a figure that makes several people
 * (argon2 takes a while); without it each gets a password of their own.
 */
export async function benchPerson(
  db: Db,
  shopId: string,
  role: Role,
  login?: { password: string; hash: string },
): Promise<BenchPerson> {
  const id = randomUUID()
  const email = `bench-${id.slice(0, 8)}@bench.invalid`
  const password = login?.password ?? `bench-${randomUUID()}`
  await db
    .insertInto("app_user")
    .values({
      id,
      shop_id: shopId,
      email,
      name: `Bench ${role}`,
      role,
      password_hash: login?.hash ?? (await hashPassword(password)),
    })
    .execute()
  return { id, email, password }
}

/** A password and its hash, for benchPerson's `login`. */
export async function benchLogin() {
  const password = `bench-${randomUUID()}`
  return { password, hash: await hashPassword(password) }
}

/**
 * Signs a person in over HTTP and gives the session cookie (`name=value`). `address` goes out as X-Forwarded-For:
 * the server throttles sign-ins per address, so each figure signs in from its own.
 */
export async function signInCookie(
  baseUrl: string,
  person: Pick<BenchPerson, "email" | "password">,
  address: string,
): Promise<string> {
  const res = await fetch(`${baseUrl}/api/session`, {
    method: "POST",
    headers: { "content-type": "application/json", "x-forwarded-for": address },
    body: JSON.stringify({ email: person.email, password: person.password }),
  })
  if (!res.ok) throw new Error(`bench sign-in failed: ${res.status}`)
  return res.headers.get("set-cookie")!.split(";")[0]!
}

/** The p-th percentile, nearest rank. */
export function percentileOf(values: number[], p: number) {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}
