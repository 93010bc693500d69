import type { Kysely } from "kysely"

// Share links are signed with the drive's share epoch; withdrawing them moves the epoch on.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("drive")
    .addColumn("share_epoch", "integer", (c) => c.notNull().defaultTo(0))
    .execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("drive").dropColumn("share_epoch").execute()
}
