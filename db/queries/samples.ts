import { sql } from "kysely"
import type pg from "pg"
import type { SessionUser } from "@/lib/auth/lucia"
import type { Role } from "@/lib/auth/roles"
import type { Sample } from "@/lib/drive-file/schema"
import { decodeSample } from "@/lib/drive-file/stored"
import type { Db } from "../client"
import { selectInShop } from "./shop-scope"
import type { DriveAccess } from "../types"
import { insertSamplesNotifying, NOTIFY_MAX_SAMPLES, samplesNotice, unnestSamples } from "./drive-events"

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
  const result = await sql`
    insert into sample (drive_key, t, lat, lon, speed, accuracy)
    select d.sample_key, u.t, u.lat, u.lon, u.speed, u.accuracy
    from (${driveKeyQuery(driveId, shopId)}) d, ${unnestSamples(samples)}
    order by u.ord
    on conflict (drive_key, t) do nothing`.execute(trx)
  return Number(result.numAffectedRows ?? 0)
}

/**
 * The t of each sample stored: all of them when none was a duplicate (the usual batch, for which the statement sends
 * no list back), else the list the statement returned.
 */
function storedTs(row: { accepted: number; ts: Array<number | string> | null }, samples: readonly Sample[]) {
  if (row.ts) return row.ts.map(Number)
  return row.accepted === samples.length ? samples.map((s) => s.t) : []
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

/** The drive as the sample path needs it (who may record, whether it is open), not its whole row. */
export type DriveAndBatch = { drive: DriveAccess; claim: BatchResult | null }

/**
 * The drive and, when `batchId` was stored before, that batch's claim: one statement, so a replayed batch is
 * answered before its body is validated (app/_server/services/recording.ts).
 */
export async function findDriveAndBatch(
  db: Db,
  at: { driveId: string; shopId: string },
  batchId: string | null,
): Promise<DriveAndBatch | undefined> {
  const row = await db
    .selectFrom("drive")
    .leftJoin("sample_batch as b", (j) =>
      j
        .onRef("b.drive_id", "=", "drive.id")
        .onRef("b.shop_id", "=", "drive.shop_id")
        .on("b.batch_id", "=", batchId ?? ""),
    )
    .select([
      "drive.id",
      "drive.shop_id",
      "drive.driver_id",
      "drive.co_driver_id",
      "drive.status",
      "drive.review_status",
      "b.accepted as batch_accepted",
      "b.duplicates as batch_duplicates",
    ])
    .where("drive.id", "=", at.driveId)
    .where("drive.shop_id", "=", at.shopId)
    .executeTakeFirst()
  return row && driveAndClaim(row, batchId)
}

function driveAndClaim(
  {
    batch_accepted,
    batch_duplicates,
    ...drive
  }: DriveAccess & { batch_accepted: number | null; batch_duplicates: number | null },
  batchId: string | null,
): DriveAndBatch {
  const claim: BatchResult | null =
    batchId !== null && batch_accepted !== null && batch_duplicates !== null
      ? { accepted: batch_accepted, duplicates: batch_duplicates, replayed: true, storedTs: [] }
      : null
  return { drive, claim }
}

/** A session with its user, read with the drive it names (see findSessionDriveAndBatch). */
export type SessionDriveAndBatch = {
  sessionExpiresAt: Date
  user: SessionUser
  /** Undefined when the user's shop has no drive of that public id. */
  found: DriveAndBatch | undefined
}

/**
 * A session, its user, and in that user's shop the drive of a public id with a batch's claim: one prepared
 * statement, the whole database work of a replayed sample batch. The session is returned as stored: the caller
 * decides whether it is valid (lib/auth/lucia.ts sessionIsSettled) before using anything else.
 */
export async function findSessionDriveAndBatch(
  pool: pg.Pool,
  sessionId: string,
  publicId: string,
  batchId: string,
): Promise<SessionDriveAndBatch | undefined> {
  const { rows } = await pool.query<SessionDriveRow>({
    name: "session-drive-and-batch",
    text: SESSION_DRIVE_AND_BATCH,
    values: [sessionId, publicId, batchId],
  })
  const row = rows[0]
  if (!row) return undefined
  const {
    session_user_id,
    session_expires_at,
    user_email,
    user_name,
    user_role,
    user_shop_id,
    user_disabled,
    ...rest
  } = row
  return {
    sessionExpiresAt: session_expires_at,
    user: {
      id: session_user_id,
      email: user_email,
      name: user_name,
      role: user_role,
      shopId: user_shop_id,
      disabled: user_disabled,
    },
    // No drive of that id in the shop: the left join gave nulls for all its columns.
    found: rest.id === null ? undefined : driveAndClaim(rest, batchId),
  }
}

// The drive's columns last, unprefixed (DriveAccess): the session's and user's carry prefixes no drive column has.
const SESSION_DRIVE_AND_BATCH = `
  select s.user_id as session_user_id, s.expires_at as session_expires_at,
    u.email as user_email, u.name as user_name, u.role as user_role, u.shop_id as user_shop_id,
    u.disabled as user_disabled, b.accepted as batch_accepted, b.duplicates as batch_duplicates,
    d.id, d.shop_id, d.driver_id, d.co_driver_id, d.status, d.review_status
  from user_session s
  join app_user u on u.id = s.user_id
  left join drive d on d.shop_id = u.shop_id and d.public_id = $2::uuid
  left join sample_batch b on b.drive_id = d.id and b.shop_id = d.shop_id and b.batch_id = $3
  where s.id = $1`

type SessionDriveRow = DriveAccess & {
  session_user_id: string
  session_expires_at: Date
  user_email: string
  user_name: string
  user_role: Role
  user_shop_id: string
  user_disabled: boolean
  batch_accepted: number | null
  batch_duplicates: number | null
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
        from d, ${unnestSamples(samples)}
        order by u.ord
        on conflict (drive_key, t) do nothing
        returning t, lat, lon, speed, accuracy
      ),
      n as (
        select count(*)::int as accepted, case when count(*) < ${samples.length}::int then array_agg(t) end as ts,
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
      ? { accepted: row.accepted, duplicates: row.duplicates, replayed: false, storedTs: storedTs(row, samples) }
      : null
  } catch (error) {
    const e = error as { code?: string; constraint?: string }
    if (e.code !== "23505" || e.constraint !== "sample_batch_pk") throw error
    return storedClaim(db, driveId, shopId, batchId)
  }
}
