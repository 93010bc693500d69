import { sql } from "kysely"
import type { Sample } from "@/lib/drive-file/schema"
import type { Db } from "../client"
import { insertSamplesNotifying } from "./drive-events"

export interface BatchResult {
  accepted: number
  duplicates: number
  /** True when this batch id had been stored before: nothing was written this time. */
  replayed: boolean
  /** The `t` of each sample this call stored (empty on a replay), for the live scorer. */
  storedTs: number[]
}

/**
 * Stores one batch of samples whole or not at all: the batch id is claimed first (a replay finds it
 * and writes nothing), then every sample goes in one statement; a `t` the drive already has is kept
 * as it was. Call inside a transaction.
 */
export async function insertSampleBatch(
  trx: Db,
  driveId: string,
  shopId: string,
  batchId: string,
  samples: readonly Sample[],
): Promise<BatchResult> {
  const claimed = await trx
    .insertInto("sample_batch")
    .values({ drive_id: driveId, batch_id: batchId, shop_id: shopId, accepted: 0, duplicates: 0 })
    .onConflict((oc) => oc.columns(["drive_id", "batch_id"]).doNothing())
    .returning("batch_id")
    .execute()
  if (claimed.length === 0) {
    const seen = await trx
      .selectFrom("sample_batch")
      .select(["accepted", "duplicates"])
      .where("drive_id", "=", driveId)
      .where("batch_id", "=", batchId)
      .where("shop_id", "=", shopId)
      .executeTakeFirstOrThrow()
    return { accepted: seen.accepted, duplicates: seen.duplicates, replayed: true, storedTs: [] }
  }
  // The insert also announces the stored samples to the live channel (db/queries/drive-events.ts).
  const { accepted, ts: storedTs } = await insertSamplesNotifying(trx, driveId, shopId, samples)
  const duplicates = samples.length - accepted
  await trx
    .updateTable("sample_batch")
    .set({ accepted, duplicates })
    .where("drive_id", "=", driveId)
    .where("batch_id", "=", batchId)
    .where("shop_id", "=", shopId)
    .execute()
  return { accepted, duplicates, replayed: false, storedTs }
}

/**
 * One multi-row insert whatever the batch size: the columns travel as seven arrays and unnest()
 * turns them into rows (a VALUES list would hit PostgreSQL's 65,535-parameter limit at ~9,000 rows).
 * Returns how many rows were new.
 */
export async function insertSamples(trx: Db, driveId: string, shopId: string, samples: readonly Sample[]): Promise<number> {
  if (samples.length === 0) return 0
  const n = samples.length
  const t = new Array<number>(n)
  const lat = new Array<number>(n)
  const lon = new Array<number>(n)
  const speed = new Array<number | null>(n)
  const accuracy = new Array<number | null>(n)
  for (let i = 0; i < n; i++) {
    const s = samples[i]!
    t[i] = s.t
    lat[i] = s.lat
    lon[i] = s.lon
    speed[i] = s.speed ?? null
    accuracy[i] = s.accuracy ?? null
  }
  const result = await sql`
    insert into sample (drive_id, shop_id, t, lat, lon, speed, accuracy)
    select ${driveId}::uuid, ${shopId}::uuid, u.t, u.lat, u.lon, u.speed, u.accuracy
    from unnest(${t}::bigint[], ${lat}::float8[], ${lon}::float8[], ${speed}::float8[], ${accuracy}::float8[])
      with ordinality as u(t, lat, lon, speed, accuracy, ord)
    order by u.ord
    on conflict (drive_id, t) do nothing`.execute(trx)
  return Number(result.numAffectedRows ?? 0)
}

export async function listSamples(db: Db, driveId: string, shopId: string): Promise<Sample[]> {
  const rows = await db
    .selectFrom("sample")
    .select(["t", "lat", "lon", "speed", "accuracy"])
    .where("drive_id", "=", driveId)
    .where("shop_id", "=", shopId)
    .orderBy("t", "asc")
    .execute()
  return rows.map((r) => {
    const s: Sample = { t: r.t, lat: r.lat, lon: r.lon }
    if (r.speed !== null) s.speed = r.speed
    if (r.accuracy !== null) s.accuracy = r.accuracy
    return s
  })
}
