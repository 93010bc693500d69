import type { Kysely } from "kysely"

// A lead may ask for an e-mail, besides the notice in the app, when a drive waits for review. Off unless asked.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("app_user")
    .addColumn("review_mail", "boolean", (c) => c.notNull().defaultTo(false))
    .execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("app_user").dropColumn("review_mail").execute()
}
