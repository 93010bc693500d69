import { type Kysely, sql } from "kysely"

// The numbers page (and its CSV) read every finished, scored drive of the period shown: about 12,000 rows
// for 90 days of a busy shop. Through drive_shop_finished_idx that was a bitmap scan of the heap and a sort.
// This partial index holds, in (shop_id, finished_at, id) order, every column those reads take from `drive`,
// so they are an index-only scan in the order they need, whatever the rest of the row holds.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create index drive_numbers_idx on drive (shop_id, finished_at, id)
      include (verdict, review_status, driver_id, profile_version_id, cleared_at_seconds, duration_seconds,
               qualifying_seconds, following_seconds, harsh_events, unmet_conditions)
      where status = 'finished' and scored_at is not null`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop index drive_numbers_idx`.execute(db)
}
