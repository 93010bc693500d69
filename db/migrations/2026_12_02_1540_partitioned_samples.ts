import { type Kysely, sql } from "kysely"

// `sample` becomes a table partitioned by month on `t` (ms since the epoch), with a compact row:
//   drive_key  int8  the drive's `sample_key` (a new identity on drive) instead of two uuids
//   t          int8  ms since the epoch, as in the drive file
//   lat, lon   int4  1e-7 degree          (lib/drive-file/stored.ts says how values are rounded)
//   speed      int4  mm/s, null = none
//   accuracy   int4  mm,   null = none
// 32 bytes of values, so a heap tuple is 56 bytes and the (drive_key, t) key 24: about 91 bytes a sample
// with its index (bench figure `sampleBytes`). The shop is reached through the drive: every query of
// samples names the drive by (id, shop_id). pg_partman (Debian's postgresql-<major>-partman) makes the
// monthly partitions: 4 months ahead here, and then from the app's maintenance (app/_server/maintenance.ts
// calls partman.run_maintenance; no background worker, so no shared_preload_libraries). A sample whose
// month has no partition (a clock years off, an old import) goes to `sample_default`.
// Existing rows are moved over, rounded as lib/drive-file/stored.ts rounds (half up).

/** Months before the current one that get their own partition for rows already stored (older go to the default). */
const BACKFILL_MONTHS = 36
/** Months before the current one that get a partition in any case (imports of recent drives). */
const PAST_MONTHS = 12

export async function up(db: Kysely<any>): Promise<void> {
  await sql`create schema if not exists partman`.execute(db)
  await sql`create extension if not exists pg_partman schema partman`.execute(db)

  await sql`alter table drive add column sample_key bigint generated always as identity`.execute(db)
  await sql`alter table drive add constraint drive_sample_key_unique unique (sample_key)`.execute(db)

  await sql`alter table sample rename to sample_before_partitioning`.execute(db)
  await sql`alter table sample_before_partitioning rename constraint sample_pk to sample_before_partitioning_pk`.execute(
    db,
  )

  await sql`
    create table sample (
      drive_key bigint not null references drive (sample_key) on delete cascade,
      t bigint not null,
      lat integer not null,
      lon integer not null,
      speed integer,
      accuracy integer,
      constraint sample_pk primary key (drive_key, t)
    ) partition by range (t)`.execute(db)
  await sql`comment on table sample is 'Position samples, partitioned by month on t (pg_partman). lat/lon in 1e-7 degree, speed in mm/s, accuracy in mm (lib/drive-file/stored.ts).'`.execute(
    db,
  )

  // Month boundaries in UTC: partman works in the session's time zone (app/_server/maintenance.ts too).
  const { rows: zone } = await sql<{ tz: string }>`select current_setting('TimeZone') as tz`.execute(db)
  await sql`set local timezone to 'UTC'`.execute(db)
  const { rows } = await sql<{ start: string }>`
    select to_char(greatest(
      least(
        date_trunc('month', coalesce(to_timestamp(min(t) / 1000.0), now()) at time zone 'UTC'),
        date_trunc('month', now() at time zone 'UTC') - make_interval(months => ${PAST_MONTHS})
      ),
      date_trunc('month', now() at time zone 'UTC') - make_interval(months => ${BACKFILL_MONTHS})
    ), 'YYYY-MM-DD') || ' 00:00:00+00' as start
    from sample_before_partitioning`.execute(db)
  await sql`
    select partman.create_parent(
      p_parent_table => 'public.sample', p_control => 't', p_type => 'native', p_interval => 'monthly',
      p_epoch => 'milliseconds', p_premake => 4, p_start_partition => ${rows[0]!.start}, p_jobmon => false)`.execute(db)
  // Months ahead of the clock whether or not samples arrived lately (partman's default waits for new data).
  await sql`update partman.part_config set infinite_time_partitions = true where parent_table = 'public.sample'`.execute(
    db,
  )

  await sql`select set_config('TimeZone', ${zone[0]!.tz}, true)`.execute(db)

  // Rounded half up like Math.round (floor(x + 0.5)), held at int4's largest like encodeMillis.
  await sql`
    insert into sample (drive_key, t, lat, lon, speed, accuracy)
    select d.sample_key, s.t,
      floor(s.lat * 1e7::float8 + 0.5)::int4, floor(s.lon * 1e7::float8 + 0.5)::int4,
      case when s.speed is not null then least(floor(s.speed * 1000::float8 + 0.5), 2147483647)::int4 end,
      case when s.accuracy is not null then least(floor(s.accuracy * 1000::float8 + 0.5), 2147483647)::int4 end
    from sample_before_partitioning s join drive d on d.id = s.drive_id and d.shop_id = s.shop_id`.execute(db)
  await sql`drop table sample_before_partitioning`.execute(db)

  // The samples as the drive file writes them, by drive id and shop: for people and tests reading the
  // database by hand. The app reads `sample` itself and decodes in lib/drive-file/stored.ts.
  await sql`
    create view sample_decoded as
    select d.id as drive_id, d.shop_id, s.t,
      s.lat / 1e7::float8 as lat, s.lon / 1e7::float8 as lon,
      s.speed / 1000::float8 as speed, s.accuracy / 1000::float8 as accuracy
    from sample s join drive d on d.sample_key = s.drive_key`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop view sample_decoded`.execute(db)
  await sql`
    create table sample_flat (
      drive_id uuid not null references drive (id) on delete cascade,
      shop_id uuid not null,
      t bigint not null,
      lat float8 not null,
      lon float8 not null,
      speed float8,
      accuracy float8
    )`.execute(db)
  await sql`
    insert into sample_flat
    select d.id, d.shop_id, s.t, s.lat / 1e7::float8, s.lon / 1e7::float8, s.speed / 1000::float8, s.accuracy / 1000::float8
    from sample s join drive d on d.sample_key = s.drive_key`.execute(db)
  await sql`delete from partman.part_config where parent_table = 'public.sample'`.execute(db)
  await sql`drop table sample cascade`.execute(db)
  await sql`drop table if exists partman.template_public_sample`.execute(db)
  await sql`alter table sample_flat rename to sample`.execute(db)
  await sql`alter table sample add constraint sample_pk primary key (drive_id, t)`.execute(db)
  await sql`alter table drive drop column sample_key`.execute(db)
  await sql`drop extension if exists pg_partman`.execute(db)
}
