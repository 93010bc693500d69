import type { Kysely } from "kysely"

// Session ids are now the SHA-256 of the cookie's token. Rows written before hold the token itself, which no
// cookie can match any more: remove them so those sessions end cleanly (their holders sign in again).
export async function up(db: Kysely<any>): Promise<void> {
  await db.deleteFrom("user_session").execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.deleteFrom("user_session").execute()
}
