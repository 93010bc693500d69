import { randomUUID } from "node:crypto"
import { createDb, type Db } from "@/db/client"
import type { NewDrive } from "@/db/types"
import { hashPassword } from "@/lib/auth/password"
import { internalDriveId } from "@/lib/drive-id"
import type { Role } from "@/lib/auth/roles"
import { testEnv } from "./env"

export const TEST_PASSWORD = "correct-horse-battery-9"

let db: Db | undefined
export function testDb(): Db {
  db ??= createDb(testEnv().databaseUrl)
  return db
}

let passwordHash: Promise<string> | undefined

export type TestUser = { id: string; email: string; name: string; role: Role; shopId: string; password: string }
export type TestShop = { shopId: string; admin: TestUser; lead: TestUser; tech: TestUser; codriver: TestUser }

/** A fresh shop with one person per role; every test makes its own, so tests never share rows. */
export async function createTestShop(label = "Test"): Promise<TestShop> {
  passwordHash ??= hashPassword(TEST_PASSWORD)
  const hash = await passwordHash
  const tag = randomUUID().slice(0, 8)
  const { id: shopId } = await testDb()
    .insertInto("shop")
    .values({
      name: `${label} shop ${tag}`,
      settings: JSON.stringify({ units: "imperial", tirePressureTolerancePsi: 3 }),
    })
    .returning("id")
    .executeTakeFirstOrThrow()
  const make = async (role: Role, key: string): Promise<TestUser> => {
    const user = { id: randomUUID(), email: `${key}-${tag}@test.invalid`, name: `${key} ${tag}`, role, shopId }
    await testDb()
      .insertInto("app_user")
      .values({ id: user.id, shop_id: shopId, email: user.email, name: user.name, role, password_hash: hash })
      .execute()
    return { ...user, password: TEST_PASSWORD }
  }
  return {
    shopId,
    admin: await make("admin", "admin"),
    lead: await make("shop_lead", "lead"),
    tech: await make("technician", "tech"),
    codriver: await make("co_driver", "codriver"),
  }
}

/** A drive row's ids for a direct insert: its public id (a new one unless given) and the internal id it makes. */
export function testDriveIds(shopId: string, publicId: string = randomUUID()) {
  return { id: internalDriveId(shopId, publicId), public_id: publicId }
}

/** A drive row's columns for `insertDrives`: its id follows from `public_id` (a new one unless given), its shop is the shop's. */
type DriveRow = Partial<Omit<NewDrive, "id" | "shop_id">>

/**
 * Drive rows written straight into the database for `shop`, with an empty profile and the shop's technician as
 * driver unless a row says otherwise. Answers each drive's public id (`id`, the one the API knows) and internal id.
 */
export async function insertDrives(shop: TestShop, rows: DriveRow[]) {
  const values = rows.map((row) => ({
    ...testDriveIds(shop.shopId, row.public_id),
    shop_id: shop.shopId,
    profile: "{}",
    driver_id: shop.tech.id,
    ...row,
  }))
  await testDb().insertInto("drive").values(values).execute()
  return values.map((v) => ({ id: v.public_id, internalId: v.id }))
}

/** One drive row written straight into the database for `shop` (see `insertDrives`). */
export async function insertDrive(shop: TestShop, row: DriveRow = {}) {
  const [drive] = await insertDrives(shop, [row])
  return drive!
}

/** Condition profiles like the demo seed's, for a test shop. */
export async function createTestProfile(shopId: string, key = "forward-radar", settings: Record<string, unknown> = {}) {
  const profile = await testDb()
    .insertInto("condition_profile")
    .values({ shop_id: shopId, key, name: `Profile ${key}`, sensor: "forward_radar" })
    .returning("id")
    .executeTakeFirstOrThrow()
  const version = await testDb()
    .insertInto("condition_profile_version")
    .values({ shop_id: shopId, profile_id: profile.id, version: 1, settings: JSON.stringify(settings) })
    .returning("id")
    .executeTakeFirstOrThrow()
  return { profileId: profile.id, versionId: version.id }
}
