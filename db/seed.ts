// Demo data, all invented: two shops, their people and condition profiles. Idempotent: re-running changes nothing.
import { randomUUID } from "node:crypto"
import { sql } from "kysely"
import { hashPassword } from "@/lib/auth/password"
import type { Role } from "@/lib/auth/roles"
import { createDb, type Db } from "./client"
import { seedDemoJobsAndDrives } from "./seed-demo-drives"
import { seedRoadHistory } from "./seed-roads"

export const DEMO_PASSWORD = "drive-demo-2026"

const SHOPS = [
  {
    name: "Alder Creek Collision",
    users: [
      { email: "admin@demo.test", name: "Rosa Quintero", role: "admin" },
      { email: "lead@demo.test", name: "Dale Okafor", role: "shop_lead" },
      { email: "tech@demo.test", name: "Mina Halvorsen", role: "technician" },
      { email: "codriver@demo.test", name: "Theo Brandt", role: "co_driver" },
    ],
  },
  {
    name: "Birchline Auto Glass",
    users: [{ email: "lead@othershop.test", name: "Priya Szabo", role: "shop_lead" }],
  },
] as const satisfies ReadonlyArray<{ name: string; users: ReadonlyArray<{ email: string; name: string; role: Role }> }>

/** Default condition profiles: one per drive-type sensor task. Keys as in the drive file's profile. */
export const DEFAULT_PROFILES = [
  { key: "forward-radar", name: "Forward radar, drive learn", sensor: "forward_radar", settings: {} },
  {
    key: "forward-camera",
    name: "Forward camera, drive learn",
    sensor: "forward_camera",
    settings: { minFollowingMinutes: 0 },
  },
  {
    key: "corner-radar",
    name: "Corner radar, drive learn",
    sensor: "corner_radar",
    settings: { minFollowingMinutes: 0 },
  },
  { key: "rear-radar", name: "Rear radar, drive learn", sensor: "rear_radar", settings: { minFollowingMinutes: 0 } },
] as const

export async function seed(db: Db) {
  const passwordHash = await hashPassword(DEMO_PASSWORD)
  const shopIds: string[] = []
  for (const shopSeed of SHOPS) {
    const shopId = await db.transaction().execute(async (trx) => {
      const existing = await trx.selectFrom("shop").select("id").where("name", "=", shopSeed.name).executeTakeFirst()
      const shopId =
        existing?.id ??
        (
          await trx
            .insertInto("shop")
            .values({
              name: shopSeed.name,
              settings: JSON.stringify({ units: "imperial", tirePressureTolerancePsi: 3 }),
            })
            .returning("id")
            .executeTakeFirstOrThrow()
        ).id
      await trx
        .insertInto("app_user")
        .values(
          shopSeed.users.map((u) => ({
            id: randomUUID(),
            shop_id: shopId,
            email: u.email,
            name: u.name,
            role: u.role,
            password_hash: passwordHash,
          })),
        )
        .onConflict((oc) => oc.column("email").doNothing())
        .execute()
      for (const p of DEFAULT_PROFILES) {
        const inserted = await trx
          .insertInto("condition_profile")
          .values({ shop_id: shopId, key: p.key, name: p.name, sensor: p.sensor })
          .onConflict((oc) => oc.columns(["shop_id", "key"]).doNothing())
          .returning("id")
          .executeTakeFirst()
        if (inserted) {
          await trx
            .insertInto("condition_profile_version")
            .values({ shop_id: shopId, profile_id: inserted.id, version: 1, settings: JSON.stringify(p.settings) })
            .execute()
        }
      }
      return shopId
    })
    shopIds.push(shopId)
  }
  await seedDemoJobsAndDrives(db, shopIds[0]!)
  await seedRoadHistory(db, shopIds[0]!)
  const counts = await sql<{
    users: number
    shops: number
  }>`select (select count(*) from app_user)::int as users, (select count(*) from shop)::int as shops`.execute(db)
  return counts.rows[0]
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const db = createDb()
  seed(db)
    .then((c) => console.log(`[straightaway] demo data ready (${c?.shops} shops, ${c?.users} users)`))
    .catch((error) => {
      console.error(error)
      process.exitCode = 1
    })
    .finally(() => db.destroy())
}
