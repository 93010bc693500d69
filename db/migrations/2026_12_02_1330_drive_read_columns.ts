import { type Kysely, sql } from "kysely"

// Reads that follow what is shown, not the shop's history (issue 10). What the review queue and the
// numbers page need from a drive's score is kept on the drive itself, copied from `score` by a trigger
// whenever a score is stored (so every writer of `score` keeps it right), with indexes that fit the reads:
// - the queue: a partial index over the drives that need a look and have had none;
// - the numbers page: (shop_id, finished_at);
// - the drive list filtered to drives still recording: a partial index.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    alter table drive
      add column scored_at timestamptz,
      add column harsh_events integer not null default 0,
      add column cleared_at_seconds float8,
      add column duration_seconds float8 not null default 0,
      add column qualifying_seconds float8 not null default 0,
      add column following_seconds float8 not null default 0,
      add column unmet_conditions text[] not null default '{}'`.execute(db)
  // The queue's rule, as it was: a verdict other than met, or any harsh event.
  await sql`
    alter table drive add column needs_review boolean
      generated always as (coalesce(verdict <> 'met', false) or harsh_events > 0) stored`.execute(db)

  await sql`
    create function drive_take_score() returns trigger language plpgsql as $$
    begin
      update drive set
        scored_at = new.scored_at,
        harsh_events = coalesce((new.result->'harshEvents'->>'accel')::int, 0) + coalesce((new.result->'harshEvents'->>'decel')::int, 0),
        cleared_at_seconds = (new.result->>'clearedAtSeconds')::float8,
        duration_seconds = coalesce((new.result->>'durationSeconds')::float8, 0),
        qualifying_seconds = coalesce((new.result->>'qualifyingSecondsBeforeClear')::float8, 0),
        following_seconds = coalesce((new.result->>'followingSecondsBeforeClear')::float8, 0),
        unmet_conditions = coalesce((select array_agg(c->>'key') from jsonb_array_elements(new.result->'conditions') c
                                     where (c->>'met')::boolean is false), '{}')
      where id = new.drive_id and shop_id = new.shop_id;
      return null;
    end $$`.execute(db)
  await sql`create trigger score_to_drive after insert or update on score for each row execute function drive_take_score()`.execute(
    db,
  )
  // Scores stored before this migration: touching each row runs the trigger once.
  await sql`update score set scored_at = scored_at`.execute(db)

  await sql`
    create index drive_review_queue_idx on drive (shop_id, finished_at, id)
      where status = 'finished' and review_status is null and needs_review and scored_at is not null`.execute(db)
  await sql`create index drive_shop_finished_idx on drive (shop_id, finished_at, id)`.execute(db)
  await sql`create index drive_recording_idx on drive (shop_id, created_at) where status = 'recording'`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop index drive_recording_idx`.execute(db)
  await sql`drop index drive_shop_finished_idx`.execute(db)
  await sql`drop index drive_review_queue_idx`.execute(db)
  await sql`drop trigger score_to_drive on score`.execute(db)
  await sql`drop function drive_take_score()`.execute(db)
  await sql`
    alter table drive drop column needs_review, drop column unmet_conditions, drop column following_seconds,
      drop column qualifying_seconds, drop column duration_seconds, drop column cleared_at_seconds,
      drop column harsh_events, drop column scored_at`.execute(db)
}
