import type { Db } from "../client"

export type VehicleFields = { vin: string; year: number | null; make: string | null; model: string | null; plate: string | null }

export function findVehicleInShop(db: Db, id: string, shopId: string) {
  return db.selectFrom("vehicle").selectAll().where("id", "=", id).where("shop_id", "=", shopId).executeTakeFirst()
}

export function findVehicleByVin(db: Db, vin: string, shopId: string) {
  return db.selectFrom("vehicle").selectAll().where("vin", "=", vin).where("shop_id", "=", shopId).orderBy("created_at").executeTakeFirst()
}

/**
 * The shop's vehicle with this VIN, its details refreshed from the newest intake (a blank box keeps what
 * was known), or a new one.
 */
export async function upsertVehicleByVin(db: Db, shopId: string, v: VehicleFields) {
  const existing = await findVehicleByVin(db, v.vin, shopId)
  if (!existing) {
    return db.insertInto("vehicle").values({ shop_id: shopId, ...v }).returningAll().executeTakeFirstOrThrow()
  }
  return db
    .updateTable("vehicle")
    .set({ year: v.year ?? existing.year, make: v.make ?? existing.make, model: v.model ?? existing.model, plate: v.plate ?? existing.plate })
    .where("id", "=", existing.id)
    .where("shop_id", "=", shopId)
    .returningAll()
    .executeTakeFirstOrThrow()
}
