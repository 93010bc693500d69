import { type Kysely, sql } from "kysely"

// The shop's road knowledge: figures per H3 cell (all times, per local hour, per local weekday; -1 = all),
// each past drive's route and time to learn complete, and the loops those routes fall into.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("road_loop")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("number", "integer", (c) => c.notNull())
    .addColumn("name", "text")
    .addColumn("cells", sql`text[]`, (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("road_loop_shop_idx").on("road_loop").column("shop_id").execute()

  await db.schema
    .createTable("road_cell_stat")
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("cell", "text", (c) => c.notNull())
    .addColumn("hour", "smallint", (c) => c.notNull())
    .addColumn("weekday", "smallint", (c) => c.notNull())
    .addColumn("seconds", "float8", (c) => c.notNull())
    .addColumn("qualifying_seconds", "float8", (c) => c.notNull())
    .addColumn("following_seconds", "float8", (c) => c.notNull())
    .addColumn("harsh_events", "integer", (c) => c.notNull())
    .addColumn("speed_hist", sql`float8[]`, (c) => c.notNull())
    .addPrimaryKeyConstraint("road_cell_stat_pk", ["shop_id", "hour", "weekday", "cell"])
    .execute()

  await db.schema
    .createTable("road_drive")
    .addColumn("drive_id", "uuid", (c) => c.primaryKey().references("drive.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("profile_id", "uuid")
    .addColumn("loop_id", "uuid", (c) => c.references("road_loop.id").onDelete("set null"))
    .addColumn("started_at", "timestamptz", (c) => c.notNull())
    .addColumn("hour", "smallint", (c) => c.notNull())
    .addColumn("weekday", "smallint", (c) => c.notNull())
    .addColumn("start_lat", "float8", (c) => c.notNull())
    .addColumn("start_lon", "float8", (c) => c.notNull())
    .addColumn("driven_seconds", "float8", (c) => c.notNull())
    .addColumn("qualifying_seconds", "float8", (c) => c.notNull())
    .addColumn("following_seconds", "float8", (c) => c.notNull())
    .addColumn("harsh_events", "integer", (c) => c.notNull())
    .addColumn("cleared_seconds", "float8")
    .addColumn("route", sql`text[]`, (c) => c.notNull())
    .addColumn("track", "jsonb", (c) => c.notNull())
    /** What this drive added to road_cell_stat, so scoring it again can take it back out first. */
    .addColumn("contribution", "jsonb", (c) => c.notNull())
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("road_drive_shop_idx").on("road_drive").columns(["shop_id", "loop_id"]).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("road_drive").execute()
  await db.schema.dropTable("road_cell_stat").execute()
  await db.schema.dropTable("road_loop").execute()
}
