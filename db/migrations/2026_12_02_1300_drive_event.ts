import { type Kysely, sql } from "kysely"

// The live channel's durable events (a mark added or taken back, a status change), so a screen that was
// away resumes from the last event id it saw. Score events are not stored: they follow from the data.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("drive_event")
    .addColumn("id", "bigint", (c) => c.primaryKey().generatedAlwaysAsIdentity())
    .addColumn("drive_id", "uuid", (c) => c.notNull().references("drive.id").onDelete("cascade"))
    .addColumn("shop_id", "uuid", (c) => c.notNull().references("shop.id").onDelete("cascade"))
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("body", "jsonb", (c) => c.notNull())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute()
  await db.schema.createIndex("drive_event_drive_id_idx").on("drive_event").columns(["drive_id", "id"]).execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("drive_event").execute()
}
