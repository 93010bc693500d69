// The live channel's writes and reads. Every write that changes what a screen on the drive shows says so
// with pg_notify on DRIVE_CHANNEL inside the statement that writes (no extra round trip), so the
// notice goes out when the transaction commits and never for work that rolled back. Each app process
// listens once (app/_server/live.ts) and fans the notices out to its screens and its live scorers.
import { randomUUID } from "node:crypto"
import { sql, type RawBuilder } from "kysely"
import type { ApiMark, Mark, Sample } from "@/lib/drive-file/schema"
import { encodeSampleColumns } from "@/lib/drive-file/stored"
import type { Db } from "../client"
import { selectDriveMarks } from "./marks"
import { selectInShop } from "./shop-scope"

export const DRIVE_CHANNEL = "straightaway_drive"

/** pg_notify refuses payloads of 8000 bytes or more: above this a notice carries no data, only what to fetch. */
const NOTIFY_MAX_BYTES = 7800
/** Sample rows carried in a notice; a larger batch says `reload` and other processes read the drive again. */
export const NOTIFY_MAX_SAMPLES = 60

const globalForLive = globalThis as unknown as { straightawayLiveOrigin?: string }
/** This process's mark on its notices, so it can tell its own sample notices (applied already) from others'. */
export function liveOrigin(): string {
  globalForLive.straightawayLiveOrigin ??= randomUUID()
  return globalForLive.straightawayLiveOrigin
}

export type DriveEventKind = "mark" | "unmark" | "status"

/** A durable event: a mark (with its arrival `seq`), a mark taken back (`{ id }`), a status change. */
export interface DriveEvent {
  id: number
  kind: DriveEventKind
  body: Record<string, unknown>
}

/** What a notice on DRIVE_CHANNEL holds (short keys: the payload limit is 8000 bytes). */
export type DriveNotice =
  | { k: "event"; d: string; s: string; o: string; id: number; kind: DriveEventKind; body?: Record<string, unknown> }
  | {
      k: "samples"
      d: string
      s: string
      o: string
      rows: Array<[number, number, number, number | null, number | null]> | null
    }

/** The notify call for a json payload, trimmed to `fallback` when it would be too long for pg_notify. */
function notify(payload: RawBuilder<unknown>, fallback: RawBuilder<unknown>) {
  return sql`pg_notify(${DRIVE_CHANNEL}, case when octet_length((${payload})::text) < ${NOTIFY_MAX_BYTES} then (${payload})::text else (${fallback})::text end)`
}

/** The notify call that announces stored sample rows (`rows`: a json array, or null for "read the drive again"). */
export function samplesNotice(driveId: string, shopId: string, rows: RawBuilder<unknown>) {
  const head = sql`'k', 'samples', 'd', ${driveId}::text, 's', ${shopId}::text, 'o', ${liveOrigin()}::text`
  return notify(sql`json_build_object(${head}, 'rows', ${rows})`, sql`json_build_object(${head}, 'rows', null)`)
}

export interface SamplesInserted {
  accepted: number
  /** The `t` of each sample this call stored (a `t` the drive had already is not among them). */
  ts: number[]
}

/**
 * One multi-row insert whatever the batch size (the columns travel as arrays and unnest() makes rows),
 * with the notice folded into the same statement: up to NOTIFY_MAX_SAMPLES stored rows travel in it,
 * a larger batch tells other processes to read the drive again.
 */
export async function insertSamplesNotifying(
  trx: Db,
  driveId: string,
  shopId: string,
  samples: readonly Sample[],
): Promise<SamplesInserted> {
  if (samples.length === 0) return { accepted: 0, ts: [] }
  const result = await sql<{ n: number; ts: number[] }>`
    with ins as (
      insert into sample (drive_key, t, lat, lon, speed, accuracy)
      select d.sample_key, u.t, u.lat, u.lon, u.speed, u.accuracy
      from (select sample_key from drive where id = ${driveId}::uuid and shop_id = ${shopId}::uuid) d,
        ${unnestSamples(samples)}
      order by u.ord
      on conflict (drive_key, t) do nothing
      returning t, lat, lon, speed, accuracy
    ), agg as (
      select count(*)::int as n, array_agg(t) as ts,
        case when count(*) <= ${NOTIFY_MAX_SAMPLES} then json_agg(json_build_array(t, lat / 1e7::float8, lon / 1e7::float8, speed / 1000::float8, accuracy / 1000::float8)) end as rows
      from ins
    )
    select n, ts, ${samplesNotice(driveId, shopId, sql`rows`)} as notified
    from agg where n > 0`.execute(trx)
  const row = result.rows[0]
  return row ? { accepted: row.n, ts: row.ts.map(Number) } : { accepted: 0, ts: [] }
}

/**
 * A batch's samples as the rows `u(t, lat, lon, speed, accuracy, ord)` for an insert, in the order sent: one array
 * parameter per column in the stored units (lib/drive-file/stored.ts encodeSampleColumns). The arrays go as
 * PostgreSQL array literals written here; pg's own array encoder would quote and escape every number.
 */
export function unnestSamples(samples: readonly Sample[]) {
  const c = encodeSampleColumns(samples)
  return sql`unnest(${arrayLiteral(c.t)}::bigint[], ${arrayLiteral(c.lat)}::int4[], ${arrayLiteral(c.lon)}::int4[],
    ${arrayLiteral(c.speed)}::int4[], ${arrayLiteral(c.accuracy)}::int4[]) with ordinality as u(t, lat, lon, speed, accuracy, ord)`
}

/** `{1,2,NULL}`: integers only (no quoting needed), null as NULL. */
function arrayLiteral(values: ReadonlyArray<number | null>): string {
  return `{${(values.includes(null) ? values.map((v) => v ?? "NULL") : values).join(",")}}`
}

const eventNotice = (driveId: string, shopId: string) => {
  const head = sql`'k', 'event', 'd', ${driveId}::text, 's', ${shopId}::text, 'o', ${liveOrigin()}::text, 'id', ev.id, 'kind', ev.kind`
  return notify(sql`json_build_object(${head}, 'body', ev.body)`, sql`json_build_object(${head})`)
}

export interface MarksInserted {
  accepted: number
  duplicates: number
  /** The marks this call stored, with their arrival order. */
  stored: Array<Mark & { id: string; seq: number }>
}

/**
 * Stores marks by their client-made ids (an id seen before on this drive is a duplicate), writes a `mark` event for
 * each new one and announces it, all in one statement.
 */
export async function insertMarksNotifying(
  trx: Db,
  driveId: string,
  shopId: string,
  marks: readonly ApiMark[],
  createdBy: string | null,
): Promise<MarksInserted> {
  if (marks.length === 0) return { accepted: 0, duplicates: 0, stored: [] }
  const ids = marks.map((m) => m.id)
  const ts = marks.map((m) => m.t)
  const kinds = marks.map((m) => m.kind)
  const gaps = marks.map((m) => m.gapFt ?? null)
  const texts = marks.map((m) => m.text ?? null)
  // Road-test check marks (drive file /2) carry their check and its result.
  const checkKeys = marks.map((m) => m.checkKey ?? null)
  const results = marks.map((m) => m.result ?? null)
  const result = await sql<{ body: Mark & { id: string; seq: number } }>`
    with ins as (
      insert into mark (id, drive_id, shop_id, t, kind, gap_ft, text, check_key, result, created_by)
      select u.id, ${driveId}::uuid, ${shopId}::uuid, u.t, u.kind, u.gap_ft, u.text, u.check_key, u.result, ${createdBy}::text
      from unnest(${ids}::uuid[], ${ts}::bigint[], ${kinds}::text[], ${gaps}::float8[], ${texts}::text[], ${checkKeys}::text[], ${results}::text[])
        with ordinality as u(id, t, kind, gap_ft, text, check_key, result, ord)
      order by u.ord
      on conflict (drive_id, id) do nothing
      returning id, t, kind, gap_ft, text, check_key, result, seq
    ), ev as (
      insert into drive_event (drive_id, shop_id, kind, body)
      select ${driveId}::uuid, ${shopId}::uuid, 'mark',
        jsonb_strip_nulls(jsonb_build_object('id', id, 't', t, 'kind', kind, 'gapFt', gap_ft, 'text', text, 'checkKey', check_key, 'result', result, 'seq', seq))
      from ins order by seq
      returning id, kind, body
    )
    select ev.body, ${eventNotice(driveId, shopId)} as notified from ev order by ev.id`.execute(trx)
  const stored = result.rows.map((r) => r.body)
  return { accepted: stored.length, duplicates: marks.length - stored.length, stored }
}

/** Removes one mark (the recorder's undo) and writes and announces an `unmark` event. Returns whether a mark went. */
export async function deleteMarkNotifying(trx: Db, driveId: string, shopId: string, markId: string): Promise<boolean> {
  const result = await sql`
    with del as (
      delete from mark where id = ${markId}::uuid and drive_id = ${driveId}::uuid and shop_id = ${shopId}::uuid returning id
    ), ev as (
      insert into drive_event (drive_id, shop_id, kind, body)
      select ${driveId}::uuid, ${shopId}::uuid, 'unmark', jsonb_build_object('id', id) from del
      returning id, kind, body
    )
    select ${eventNotice(driveId, shopId)} as notified from ev`.execute(trx)
  return result.rows.length > 0
}

/** Writes one durable event and announces it (one statement). Call inside the transaction of the change. */
export async function insertDriveEvent(
  db: Db,
  driveId: string,
  shopId: string,
  kind: DriveEventKind,
  body: Record<string, unknown>,
): Promise<number> {
  const result = await sql<{ id: number }>`
    with ev as (
      insert into drive_event (drive_id, shop_id, kind, body)
      values (${driveId}::uuid, ${shopId}::uuid, ${kind}, ${JSON.stringify(body)}::jsonb)
      returning id, kind, body
    )
    select ev.id, ${eventNotice(driveId, shopId)} as notified from ev`.execute(db)
  return Number(result.rows[0]!.id)
}

/**
 * Events after `afterId`, oldest first. Ids are handed out at insert and a transaction can commit after
 * one that started later, so events of the last few seconds are sent again whatever their id: a
 * screen applies them by mark id, so a repeat changes nothing.
 */
export async function listDriveEventsAfter(
  db: Db,
  driveId: string,
  shopId: string,
  afterId: number,
  limit = 1000,
): Promise<DriveEvent[]> {
  const rows = await db
    .selectFrom("drive_event")
    .select(["id", "kind", "body"])
    .where("drive_id", "=", driveId)
    .where("shop_id", "=", shopId)
    .where((eb) => eb.or([eb("id", ">", afterId), eb("created_at", ">", sql<Date>`now() - interval '5 seconds'`)]))
    .orderBy("id", "asc")
    .limit(limit)
    .execute()
  return rows.map((r) => ({
    id: Number(r.id),
    kind: r.kind as DriveEventKind,
    body: r.body as Record<string, unknown>,
  }))
}

export async function findDriveEvent(
  db: Db,
  driveId: string,
  shopId: string,
  id: number,
): Promise<DriveEvent | undefined> {
  const r = await db
    .selectFrom("drive_event")
    .select(["id", "kind", "body"])
    .where("id", "=", id)
    .where("drive_id", "=", driveId)
    .where("shop_id", "=", shopId)
    .executeTakeFirst()
  return r ? { id: Number(r.id), kind: r.kind as DriveEventKind, body: r.body as Record<string, unknown> } : undefined
}

/** The newest event id of the drive (0 when it has none): where a fresh screen starts. */
export async function lastDriveEventId(db: Db, driveId: string, shopId: string): Promise<number> {
  const r = await selectInShop(db, "drive_event", shopId)
    .select((eb) => eb.fn.max("id").as("id"))
    .where("drive_id", "=", driveId)
    .executeTakeFirst()
  return Number(r?.id ?? 0)
}

/** Marks of the drive with their arrival order, by time then arrival (the live scorer's start). */
export async function listMarksWithSeq(
  db: Db,
  driveId: string,
  shopId: string,
): Promise<Array<Mark & { id: string; seq: number }>> {
  const rows = await selectDriveMarks(db, driveId, shopId).select("seq").execute()
  return rows.map((r) => {
    const m: Mark & { id: string; seq: number } = { id: r.id, t: r.t, kind: r.kind as Mark["kind"], seq: Number(r.seq) }
    if (r.gap_ft !== null) m.gapFt = r.gap_ft
    if (r.text !== null) m.text = r.text
    return m
  })
}
