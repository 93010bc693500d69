import { type Kysely, sql } from "kysely"

// Drive ids per shop (DEVELOPERS.md "Drive ids: public per shop, internal across the server"). `public_id` is the
// id people, the API and the recorder use, unique per shop; `id` stays the key of every child table and becomes
// drive_internal_id(shop_id, public_id), the same function as lib/drive-id.ts internalDriveId. Existing drives keep
// their id as their public id; their internal id is rewritten, and every foreign key to drive(id) follows it
// (ON UPDATE CASCADE). The samples reference drive(sample_key) and do not move.

const FUNCTION = sql`
  create function drive_internal_id(shop uuid, public uuid) returns uuid
  language sql immutable strict parallel safe as $$
    select encode(set_byte(set_byte(h, 6, (get_byte(h, 6) & 15) | 128), 8, (get_byte(h, 8) & 63) | 128), 'hex')::uuid
    from (select substring(sha256(uuid_send(shop) || uuid_send(public)) from 1 for 16) as h) as digest
  $$`

/** Every foreign key to drive(id): table, name and definition. */
async function foreignKeysToDriveId(db: Kysely<any>) {
  const { rows } = await sql<{ tbl: string; name: string; def: string }>`
    select c.conrelid::regclass::text as tbl, c.conname as name, pg_get_constraintdef(c.oid) as def
    from pg_constraint c
    where c.contype = 'f' and c.confrelid = 'drive'::regclass
      and c.confkey = array[(select attnum from pg_attribute where attrelid = 'drive'::regclass and attname = 'id')]
    order by 1, 2`.execute(db)
  return rows
}

export async function up(db: Kysely<any>): Promise<void> {
  await FUNCTION.execute(db)
  await sql`alter table drive add column public_id uuid`.execute(db)
  await sql`update drive set public_id = id`.execute(db)
  await sql`alter table drive alter column public_id set not null`.execute(db)
  for (const fk of await foreignKeysToDriveId(db)) {
    if (/ON UPDATE/i.test(fk.def)) continue
    await sql`alter table ${sql.raw(fk.tbl)} drop constraint ${sql.id(fk.name)}, add constraint ${sql.id(fk.name)} ${sql.raw(fk.def)} on update cascade`.execute(
      db,
    )
  }
  // The score's copy onto the drive (trigger score_to_drive) has nothing new to copy when only the key moves.
  await sql`alter table score disable trigger score_to_drive`.execute(db)
  await sql`update drive set id = drive_internal_id(shop_id, public_id)`.execute(db)
  await sql`alter table score enable trigger score_to_drive`.execute(db)
  await sql`alter table drive add constraint drive_shop_public_id_key unique (shop_id, public_id)`.execute(db)
  await sql`alter table drive add constraint drive_id_from_public_id check (id = drive_internal_id(shop_id, public_id))`.execute(
    db,
  )
  // The numbers page shows the public id: keep its read an index-only scan (2026_12_02_1560_numbers_covering_index).
  await sql`drop index drive_numbers_idx`.execute(db)
  await sql`
    create index drive_numbers_idx on drive (shop_id, finished_at, id)
      include (verdict, review_status, driver_id, profile_version_id, cleared_at_seconds, duration_seconds,
               qualifying_seconds, following_seconds, harsh_events, unmet_conditions, public_id)
      where status = 'finished' and scored_at is not null`.execute(db)
  // The view for people reading by hand names drives as people know them: by public id (with the shop beside it).
  await viewWith(db, "public_id")
}

function viewWith(db: Kysely<any>, idColumn: "id" | "public_id") {
  return sql`
    create or replace view sample_decoded as
    select d.${sql.raw(idColumn)} as drive_id, d.shop_id, s.t,
      s.lat / 1e7::float8 as lat, s.lon / 1e7::float8 as lon,
      s.speed / 1000::float8 as speed, s.accuracy / 1000::float8 as accuracy
    from sample s join drive d on d.sample_key = s.drive_key`.execute(db)
}

export async function down(db: Kysely<any>): Promise<void> {
  const { rows } = await sql<{ public_id: string }>`
    select public_id from drive group by public_id having count(*) > 1 limit 1`.execute(db)
  if (rows[0])
    throw new Error(
      `Drive id ${rows[0].public_id} is used by more than one shop; ids cannot be made unique across the server again.`,
    )
  await viewWith(db, "id")
  await sql`drop index drive_numbers_idx`.execute(db)
  await sql`
    create index drive_numbers_idx on drive (shop_id, finished_at, id)
      include (verdict, review_status, driver_id, profile_version_id, cleared_at_seconds, duration_seconds,
               qualifying_seconds, following_seconds, harsh_events, unmet_conditions)
      where status = 'finished' and scored_at is not null`.execute(db)
  await sql`alter table drive drop constraint drive_id_from_public_id`.execute(db)
  await sql`alter table drive drop constraint drive_shop_public_id_key`.execute(db)
  await sql`alter table score disable trigger score_to_drive`.execute(db)
  await sql`update drive set id = public_id`.execute(db)
  await sql`alter table score enable trigger score_to_drive`.execute(db)
  for (const fk of await foreignKeysToDriveId(db)) {
    const def = fk.def.replace(/\s+ON UPDATE CASCADE/i, "")
    await sql`alter table ${sql.raw(fk.tbl)} drop constraint ${sql.id(fk.name)}, add constraint ${sql.id(fk.name)} ${sql.raw(def)}`.execute(
      db,
    )
  }
  await sql`alter table drive drop column public_id`.execute(db)
  await sql`drop function drive_internal_id(uuid, uuid)`.execute(db)
}
