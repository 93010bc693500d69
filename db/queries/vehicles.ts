import type { Db } from "../client"

export type VehicleFields = {
  vin: string
  year: number | null
  make: string | null
  model: string | null
  plate: string | null
}

/**
 * The shop's vehicle with this VIN, its details refreshed from the newest intake (a blank box keeps what
 * was known), or a new one. One statement on the (shop_id, vin) unique index: two intakes at once share one row.
 */
export async function upsertVehicleByVin(db: Db, shopId: string, v: VehicleFields) {
  return db
    .insertInto("vehicle")
    .values({ shop_id: shopId, ...v })
    .onConflict((oc) =>
      oc.columns(["shop_id", "vin"]).doUpdateSet((eb) => ({
        year: eb.fn.coalesce("excluded.year", "vehicle.year"),
        make: eb.fn.coalesce("excluded.make", "vehicle.make"),
        model: eb.fn.coalesce("excluded.model", "vehicle.model"),
        plate: eb.fn.coalesce("excluded.plate", "vehicle.plate"),
      })),
    )
    .returningAll()
    .executeTakeFirstOrThrow()
}
