import { sql, type Kysely } from "kysely"

// One vehicle per VIN per shop, enforced by the database so that two intakes at once cannot make two.
// Duplicates made before are merged first: the oldest row is kept, blanks in it are filled from the newest
// duplicate that knows the value, every job is pointed at the kept row, and the others are removed.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    with ranked as (
      select id, shop_id, vin,
             first_value(id) over (partition by shop_id, vin order by created_at, id) as keep_id,
             count(*) over (partition by shop_id, vin) as n
      from vehicle
    ),
    dupes as (select id, keep_id from ranked where n > 1 and id <> keep_id)
    update job set vehicle_id = dupes.keep_id from dupes where job.vehicle_id = dupes.id
  `.execute(db)
  await sql`
    with groups as (
      select shop_id, vin,
             (array_agg(year order by created_at desc, id desc) filter (where year is not null))[1] as year,
             (array_agg(make order by created_at desc, id desc) filter (where make is not null))[1] as make,
             (array_agg(model order by created_at desc, id desc) filter (where model is not null))[1] as model,
             (array_agg(plate order by created_at desc, id desc) filter (where plate is not null))[1] as plate
      from vehicle group by shop_id, vin having count(*) > 1
    )
    update vehicle v set
      year = coalesce(v.year, g.year), make = coalesce(v.make, g.make),
      model = coalesce(v.model, g.model), plate = coalesce(v.plate, g.plate)
    from groups g
    where v.shop_id = g.shop_id and v.vin = g.vin
      and v.id = (select id from vehicle k where k.shop_id = g.shop_id and k.vin = g.vin order by created_at, id limit 1)
  `.execute(db)
  await sql`
    delete from vehicle v using vehicle k
    where v.shop_id = k.shop_id and v.vin = k.vin and (k.created_at, k.id) < (v.created_at, v.id)
  `.execute(db)
  await db.schema.dropIndex("vehicle_shop_vin_idx").execute()
  await db.schema.createIndex("vehicle_shop_vin_uq").on("vehicle").columns(["shop_id", "vin"]).unique().execute()
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("vehicle_shop_vin_uq").execute()
  await db.schema.createIndex("vehicle_shop_vin_idx").on("vehicle").columns(["shop_id", "vin"]).execute()
}
