// What the figures share: a throwaway shop, its people and drives, signing one in and asking the app as a phone does,
// deleting the shop again, and percentiles.
import { randomUUID } from "node:crypto"
import { createDb, type Db } from "@/db/client"
import { markRow } from "@/db/queries/marks"
import { hashPassword } from "@/lib/auth/password"
import type { Role } from "@/lib/auth/roles"
import { internalDriveId } from "@/lib/drive-id"
import type { Mark2, Profile } from "@/lib/drive-file/schema"
import { resolveProfile } from "@/lib/drive-file/profile"

/** A throwaway shop ("Bench <label> 1a2b3c4d"); the figure that made it deletes it. */
export async function benchShop(db: Db, label: string, settings: object = {}): Promise<string> {
  const { id } = await db
    .insertInto("shop")
    .values({ name: `Bench ${label} ${randomUUID().slice(0, 8)}`, settings: JSON.stringify(settings) })
    .returning("id")
    .executeTakeFirstOrThrow()
  return id
}

/** Deletes a bench shop (its people, drives and all theirs go with it) and closes the figure's connection. */
export async function dropBenchShop(db: Db, shopId: string) {
  await db.deleteFrom("shop").where("id", "=", shopId).execute()
  await db.destroy()
}

/** Where a figure against the app works: the app's address, a connection to its database and a throwaway shop there. */
export interface BenchStack {
  baseUrl: string
  db: Db
  shopId: string
  /** Deletes the shop and closes the connection. */
  cleanup(): Promise<void>
}

/** A BenchStack from BASE_URL and DATABASE_URL, its shop named after `label`. */
export async function benchStack(env: NodeJS.ProcessEnv, label: string): Promise<BenchStack> {
  const db = createDb(env.DATABASE_URL)
  const shopId = await benchShop(db, label)
  return { baseUrl: env.BASE_URL!, db, shopId, cleanup: () => dropBenchShop(db, shopId) }
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

/** A phone's session: its cookie (`name=value`) and the address it sends as X-Forwarded-For. */
export interface Phone {
  cookie: string
  address: string
}

/** One JSON request to the app as `phone`, and what came back (the body as text, parsed by the caller). */
export async function phoneRequest(baseUrl: string, phone: Phone, method: string, path: string, body?: unknown) {
  const res = await fetch(`${baseUrl}${path}`, {
    method,
    headers: {
      cookie: phone.cookie,
      "x-forwarded-for": phone.address,
      ...(body === undefined ? {} : { "content-type": "application/json" }),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  return { status: res.status, text: await res.text() }
}

/** A finished drive of `driverId`'s row, stored straight into the database, started and finished at `startMs`. */
export async function benchDriveRow(db: Db, shopId: string, driverId: string, startMs: number, profile?: Profile) {
  const publicId = randomUUID()
  const id = internalDriveId(shopId, publicId)
  await db
    .insertInto("drive")
    .values({
      id,
      public_id: publicId,
      shop_id: shopId,
      profile: JSON.stringify(resolveProfile(profile)),
      driver_id: driverId,
      status: "finished",
      created_at: new Date(startMs),
      finished_at: new Date(startMs),
    })
    .execute()
  return { id, public_id: publicId, shop_id: shopId, profile_version_id: null }
}

/** A file's marks stored on a bench drive (by its internal id), each with an id of its own. */
export async function benchMarks(db: Db, driveId: string, shopId: string, marks: readonly Mark2[]) {
  await db
    .insertInto("mark")
    .values(marks.map((m) => markRow(m, { id: randomUUID(), driveId, shopId })))
    .execute()
}

/** The p-th percentile, nearest rank. */
export function percentileOf(values: number[], p: number) {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}
