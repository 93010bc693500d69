import { type Kysely, sql } from "kysely"

// One row per shop with road knowledge: a token that changes whenever the shop's road model does (a drive
// added or scored again, the model removed). The Roads page keeps its figures per token, so a page view
// reads one small row instead of the model while nothing changed.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("road_model")
    .addColumn("shop_id", "uuid", (c) => c.primaryKey().references("shop.id").onDelete("cascade"))
    .addColumn("version", "uuid", (c) => c.notNull().defaultTo(sql`gen_random_uuid()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  // the loops' drives of one hour window are read by (shop, hour)
  await db.schema.createIndex("road_drive_shop_hour_idx").on("road_drive").columns(["shop_id", "hour"]).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("road_drive_shop_hour_idx").execute()
  await db.schema.dropTable("road_model").execute()
}
