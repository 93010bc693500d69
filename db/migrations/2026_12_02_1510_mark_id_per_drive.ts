import { type Kysely, sql } from "kysely"

// A mark's id is the recorder's client-made UUID and names the mark within its drive only: the key is
// (drive_id, id), so another shop posting the same id on its own drive stores its own mark and learns
// nothing about the first one. Nothing references mark.id, so only the key changes.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table mark drop constraint mark_pkey`.execute(db)
  await sql`alter table mark add constraint mark_pkey primary key (drive_id, id)`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table mark drop constraint mark_pkey`.execute(db)
  await sql`alter table mark add constraint mark_pkey primary key (id)`.execute(db)
}
