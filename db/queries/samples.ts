import { sql } from "kysely"
import type { Sample } from "@/lib/drive-file/schema"
import { decodeSample, encodeSampleColumns } from "@/lib/drive-file/stored"
import type { Db } from "../client"
import { selectInShop } from "./shop-scope"
import type { Drive } from "../types"
import { insertSamplesNotifying, NOTIFY_MAX_SAMPLES, samplesNotice } from "./drive-events"

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
    return storedClaim(trx, driveId, shopId, batchId)
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
export async function insertSamples(
  trx: Db,
  driveId: string,
  shopId: string,
  samples: readonly Sample[],
): Promise<number> {
  if (samples.length === 0) return 0
  const { t, lat, lon, speed, accuracy } = encodeSampleColumns(samples)
  const result = await sql`
    insert into sample (drive_key, t, lat, lon, speed, accuracy)
    select d.sample_key, u.t, u.lat, u.lon, u.speed, u.accuracy
    from (${driveKeyQuery(driveId, shopId)}) d,
      unnest(${t}::bigint[], ${lat}::int4[], ${lon}::int4[], ${speed}::int4[], ${accuracy}::int4[])
      with ordinality as u(t, lat, lon, speed, accuracy, ord)
    order by u.ord
    on conflict (drive_key, t) do nothing`.execute(trx)
  return Number(result.numAffectedRows ?? 0)
}

/** The drive's key in `sample`, found by its id and shop: every read and write of samples goes through it. */
function driveKeyQuery(driveId: string, shopId: string) {
  return sql<{
    sample_key: number
  }>`select sample_key from drive where id = ${driveId}::uuid and shop_id = ${shopId}::uuid`
}

/** `(select sample_key ...)` as a value, for `where drive_key = ...`. */
export function driveKey(driveId: string, shopId: string) {
  return sql<number>`(${driveKeyQuery(driveId, shopId)})`
}

export async function listSamples(db: Db, driveId: string, shopId: string): Promise<Sample[]> {
  const rows = await db
    .selectFrom("sample")
    .select(SAMPLE_COLUMNS)
    .where("drive_key", "=", driveKey(driveId, shopId))
    .orderBy("t", "asc")
    .execute()
  return rows.map(sampleOfRow)
}

/** The columns a Sample is read from (listSamples, and the export cursor in db/queries/drive-export.ts). */
export const SAMPLE_COLUMNS = ["t", "lat", "lon", "speed", "accuracy"] as const

/** A stored row: integers in the units of lib/drive-file/stored.ts. */
export interface SampleRow {
  t: number
  lat: number
  lon: number
  speed: number | null
  accuracy: number | null
}

export function sampleOfRow(r: SampleRow): Sample {
  return decodeSample(r.t, r.lat, r.lon, r.speed, r.accuracy)
}

/** The answer a batch already stored gets: its counts, marked as a replay. */
async function storedClaim(db: Db, driveId: string, shopId: string, batchId: string): Promise<BatchResult> {
  const seen = await selectInShop(db, "sample_batch", shopId)
    .select(["accepted", "duplicates"])
    .where("drive_id", "=", driveId)
    .where("batch_id", "=", batchId)
    .executeTakeFirstOrThrow()
  return { accepted: seen.accepted, duplicates: seen.duplicates, replayed: true, storedTs: [] }
}

export type DriveAndBatch = { drive: Drive; claim: BatchResult | null }

/** Where a drive is looked up: by its internal id and shop, or by its public id in the shop of a session's user. */
export type DriveLocator = { driveId: string; shopId: string } | { sessionId: string; publicId: string }

/**
 * The drive and, when `batchId` was stored before, that batch's claim: one statement, so a replayed batch is
 * answered before its body is validated (app/_server/services/recording.ts). Located by session, it can run while
 * the session itself is being checked; only a caller that then holds the session valid may use what it found.
 */
export async function findDriveAndBatch(
  db: Db,
  at: DriveLocator,
  batchId: string | null,
): Promise<DriveAndBatch | undefined> {
  let query = db
    .selectFrom("drive")
    .leftJoin("sample_batch as b", (j) =>
      j
        .onRef("b.drive_id", "=", "drive.id")
        .onRef("b.shop_id", "=", "drive.shop_id")
        .on("b.batch_id", "=", batchId ?? ""),
    )
    .selectAll("drive")
    .select(["b.accepted as batch_accepted", "b.duplicates as batch_duplicates"])
  query =
    "sessionId" in at
      ? query
          .innerJoin("app_user as u", "u.shop_id", "drive.shop_id")
          .innerJoin("user_session as s", "s.user_id", "u.id")
          .where("s.id", "=", at.sessionId)
          .where("drive.public_id", "=", at.publicId)
      : query.where("drive.id", "=", at.driveId).where("drive.shop_id", "=", at.shopId)
  const row = await query.executeTakeFirst()
  if (!row) return undefined
  const { batch_accepted, batch_duplicates, ...drive } = row
  const claim: BatchResult | null =
    batchId !== null && batch_accepted !== null && batch_duplicates !== null
      ? { accepted: batch_accepted, duplicates: batch_duplicates, replayed: true, storedTs: [] }
      : null
  return { drive, claim }
}

/**
 * insertSampleBatch in one statement and one round trip, for a drive still recording: the drive row is
 * read FOR SHARE (a Finish that locks it FOR UPDATE waits for this batch, or this batch waits for it), the
 * samples go in (a `t` the drive has is kept as it was), the batch is recorded with its counts, and the
 * stored rows are announced to the live channel (db/queries/drive-events.ts). The statement is its own
 * transaction: whole or nothing. A batch id claimed meanwhile by a concurrent copy of the same batch breaks
 * the batch's primary key, which undoes the whole statement; the copy that won is then answered as a
 * replay. Returns null, having written nothing, when the drive is no longer recording (finished meanwhile,
 * or reviewed): the caller takes the transactional path that scores the drive again.
 */
export async function ingestSampleBatch(
  db: Db,
  driveId: string,
  shopId: string,
  batchId: string,
  samples: readonly Sample[],
): Promise<BatchResult | null> {
  const c = encodeSampleColumns(samples)
  try {
    const { rows } = await sql<{ accepted: number; duplicates: number; ts: Array<number | string> | null }>`
      with d as (
        select id, sample_key from drive
        where id = ${driveId}::uuid and shop_id = ${shopId}::uuid and status = 'recording' and review_status is null
        for share
      ),
      ins as (
        insert into sample (drive_key, t, lat, lon, speed, accuracy)
        select d.sample_key, u.t, u.lat, u.lon, u.speed, u.accuracy
        from d, unnest(${c.t}::bigint[], ${c.lat}::int4[], ${c.lon}::int4[], ${c.speed}::int4[], ${c.accuracy}::int4[])
          with ordinality as u(t, lat, lon, speed, accuracy, ord)
        order by u.ord
        on conflict (drive_key, t) do nothing
        returning t, lat, lon, speed, accuracy
      ),
      n as (
        select count(*)::int as accepted, array_agg(t) as ts,
          case when count(*) <= ${NOTIFY_MAX_SAMPLES} then json_agg(json_build_array(t, lat / 1e7::float8, lon / 1e7::float8, speed / 1000::float8, accuracy / 1000::float8)) end as rows
        from ins
      ),
      b as (
        insert into sample_batch (drive_id, batch_id, shop_id, accepted, duplicates)
        select d.id, ${batchId}, ${shopId}::uuid, n.accepted, ${samples.length}::int - n.accepted from d, n
        returning accepted, duplicates
      )
      select b.accepted, b.duplicates, n.ts,
        case when n.accepted > 0 then ${samplesNotice(driveId, shopId, sql`n.rows`)} end as notified
      from b, n`.execute(db)
    const row = rows[0]
    return row
      ? { accepted: row.accepted, duplicates: row.duplicates, replayed: false, storedTs: (row.ts ?? []).map(Number) }
      : null
  } catch (error) {
    const e = error as { code?: string; constraint?: string }
    if (e.code !== "23505" || e.constraint !== "sample_batch_pk") throw error
    return storedClaim(db, driveId, shopId, batchId)
  }
}
