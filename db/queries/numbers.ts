import { sql, type CompiledQuery, type RawBuilder } from "kysely"
import pg from "pg"
import { to as copyTo } from "pg-copy-streams"
import { crlfLineEnds } from "@/lib/export/csv"
import { wholeSeconds } from "@/lib/format"
import { CLEAR_BINS_MIN, CONDITION_PROBLEM, type Numbers } from "@/lib/numbers"
import type { ConnectionSource, Db } from "../client"
import { selectInShop } from "./shop-scope"

/**
 * The shop's finished drives since a date with their driver's and profile's names, oldest first: the rows the
 * numbers page counts, before it picks its figures (listDrivesForNumbers; the reference query over `score` in
 * tests/integration/review/read-columns.test.ts reads the same rows).
 */
export function selectFinishedDrivesWithNames(db: Db, shopId: string, since: Date) {
  return selectInShop(db, "drive", shopId)
    .leftJoin("app_user as driver", (j) =>
      j.onRef("driver.id", "=", "drive.driver_id").on("driver.shop_id", "=", shopId),
    )
    .leftJoin("condition_profile_version as pv", (j) =>
      j.onRef("pv.id", "=", "drive.profile_version_id").on("pv.shop_id", "=", shopId),
    )
    .leftJoin("condition_profile as p", (j) => j.onRef("p.id", "=", "pv.profile_id").on("p.shop_id", "=", shopId))
    .select([
      "drive.id",
      "drive.public_id", // the id the numbers show (drive ids per shop, migration 2026_12_03_0100)
      "drive.finished_at",
      "drive.verdict",
      "drive.review_status",
      "drive.driver_id",
      "driver.name as driver_name",
      "p.name as profile_name",
    ])
    .where("drive.status", "=", "finished")
    .where("drive.finished_at", ">=", since)
    .orderBy("drive.finished_at", "asc")
    .orderBy("drive.id", "asc")
}

/** At most this many drives in the numbers CSV (and in listDrivesForNumbers). */
const NUMBERS_DRIVES_LIMIT = 20_000

/**
 * Finished, scored drives of the shop since a date, with what the numbers page needs from each. The figures
 * are columns of `drive` filled when the drive is scored (migration 2026_12_02_1330), read through the
 * (shop_id, finished_at) index: the cost follows the period shown, not the shop's history.
 */
function selectDrivesForNumbers(db: Db, shopId: string, since: Date) {
  return selectFinishedDrivesWithNames(db, shopId, since)
    .select([
      "drive.cleared_at_seconds",
      "drive.duration_seconds",
      "drive.qualifying_seconds",
      "drive.following_seconds",
      "drive.harsh_events",
      "drive.unmet_conditions",
    ])
    .where("drive.scored_at", "is not", null)
    .limit(NUMBERS_DRIVES_LIMIT)
}

/**
 * The numbers CSV's drives as rows (selectDrivesForNumbers): lib/numbers numbersToCsv over these is what
 * openNumbersCsv streams, byte for byte (tests/integration/review/numbers.test.ts).
 */
export async function listDrivesForNumbers(db: Db, shopId: string, since: Date) {
  return selectDrivesForNumbers(db, shopId, since).execute()
}

// ---- the numbers CSV, written by PostgreSQL ---------------------------------------------------------------

/**
 * A text cell as csvField (lib/export/csv.ts) writes it, for COPY's CSV to quote: a leading = + - @ tab or CR
 * (code points 61 43 45 64 9 13) gets a ' before it, and an empty text is NULL (COPY writes a NULL as nothing and an
 * empty text as ""). `first`: a cheaper expression that starts with the same character, when there is one.
 */
function csvText(text: RawBuilder<string>, first: RawBuilder<string | null> = text) {
  return sql<string>`nullif(case when ascii(${first}) in (61, 43, 45, 64, 9, 13) then '''' || ${text} else ${text} end, '')`
}

/**
 * lib/format wholeSeconds in float8 (the same IEEE arithmetic as JS): down to whole seconds, never below 0. A NULL
 * is 0, as numbersDriveFromRow's Number(null) makes it (GREATEST skips NULLs); wrap it for a cell that stays empty.
 */
function wholeSecondsCell(seconds: RawBuilder<number | null>) {
  return sql<number>`greatest(floor(${seconds} + 1e-6::float8), 0)::bigint`
}

/**
 * The CSV of lib/numbers numbersToCsv as one COPY statement: the same rows (selectDrivesForNumbers), columns and
 * cells; times as lib/format isoLocalDateTime writes them, in the session's time zone (openNumbersCsv sets the
 * shop's), with its UTC offset at that instant (to_char's TZH:TZM: one conversion a row, a fifth of the cost of
 * `at time zone` twice). COPY takes no bind parameters: Kysely's are written in as literals (inlineParameters).
 * COPY ends lines with LF; openNumbersCsv makes them CRLF.
 */
function numbersCsvCopy(db: Db, shopId: string, since: Date): string {
  const query = sql`
    select d.public_id as drive_id,
           to_char(d.finished_at, 'YYYY-MM-DD"T"HH24:MI:SSTZH:TZM') as finished_at,
           ${csvText(sql`coalesce(d.driver_name, 'Former staff')`)} as technician,
           ${csvText(sql`coalesce(d.profile_name, 'Profile set on the drive')`)} as profile,
           coalesce(d.verdict, 'not_met') as verdict,
           case when d.cleared_at_seconds is not null then ${wholeSecondsCell(sql`d.cleared_at_seconds`)} end
             as time_to_learn_complete_seconds,
           ${wholeSecondsCell(sql`d.qualifying_seconds`)} as qualifying_time_before_learn_complete_seconds,
           ${wholeSecondsCell(sql`d.following_seconds`)} as following_time_before_learn_complete_seconds,
           ${wholeSecondsCell(sql`d.duration_seconds`)} as drive_time_seconds,
           d.harsh_events as harsh_events,
           d.review_status as review,
           ${csvText(sql`array_to_string(d.unmet_conditions, ' ', '')`, sql`d.unmet_conditions[1]`)} as unmet_conditions
    from ${selectDrivesForNumbers(db, shopId, since)} as d
    order by d.finished_at, d.id`
  return inlineParameters(sql`copy (${query}) to stdout with (format csv, header true)`.compile(db))
}

/** A compiled statement with its parameters written in as literals: numbers, dates (ISO 8601 UTC) and escaped text only. */
function inlineParameters({ sql: text, parameters }: CompiledQuery): string {
  return text.replace(/\$(\d+)/g, (_, n: string) => {
    const value = parameters[Number(n) - 1]
    if (typeof value === "number" && Number.isSafeInteger(value)) return String(value)
    if (value instanceof Date && !Number.isNaN(value.getTime())) return pg.escapeLiteral(value.toISOString())
    if (typeof value === "string") return pg.escapeLiteral(value)
    throw new Error(`no literal for parameter $${n} (${typeof value})`)
  })
}

export interface NumbersCsv {
  /** The CSV's bytes as PostgreSQL sends them, lines ended with CRLF. */
  chunks: AsyncGenerator<Uint8Array>
  /** Ends the download early and waits for the connection to go back; safe to call more than once. */
  close(): Promise<void>
}

/**
 * What Node may hold of one CSV before it stops reading from PostgreSQL: more than NUMBERS_DRIVES_LIMIT rows take
 * (about 130 bytes a row, 2.6 MB; long names make it more), so the COPY ends at once and its connection goes back
 * while a slow reader is still downloading. Memory stays under what the CSV built in JS took (its rows, then its text).
 */
const NUMBERS_CSV_BUFFER_BYTES = 8 * 1024 * 1024

/**
 * The numbers CSV of the shop's drives since a date (numbersToCsv over listDrivesForNumbers, byte for byte),
 * streamed out of PostgreSQL by `COPY (select ...) TO STDOUT` (pg-copy-streams) on one connection of
 * `connections`, its session's time zone set to `timeZone` (a zone PostgreSQL knows: queryTimeZone) for the COPY:
 * Node only changes line ends. A failing statement throws here, before any byte.
 *
 * The connection goes back as soon as PostgreSQL has sent the last row (after `reset time zone`, queued behind the
 * COPY), whether or not the reader has taken it all; one that failed goes back with its error, and the pool drops
 * it. A COPY cannot be stopped half-way but by dropping the connection, so close() (a reader gone) reads what is
 * left, drops it and waits for the connection to go back whole.
 */
export async function openNumbersCsv(
  db: Db,
  connections: ConnectionSource,
  shopId: string,
  since: Date,
  timeZone: string,
): Promise<NumbersCsv> {
  const statement = numbersCsvCopy(db, shopId, since)
  const client = await connections.connect()
  let failure: Error | undefined
  const fail = (error: Error) => void (failure ??= error)
  try {
    await client.query("select set_config('TimeZone', $1, false)", [timeZone])
  } catch (error) {
    client.release(error as Error)
    throw error
  }
  const stream = client.query(copyTo(statement, { highWaterMark: NUMBERS_CSV_BUFFER_BYTES }))
  // pg-copy-streams emits the statement's error, or the connection's loss, as an "error" event, also after close.
  stream.on("error", fail)
  const returned = client
    .query("reset time zone")
    .then(() => undefined, fail)
    .finally(() => client.release(failure))
  const rows = stream.iterator({ destroyOnReturn: false })
  let open = true
  const close = async () => {
    if (!open) return
    open = false
    await rows.return?.().catch(() => {})
    if (!stream.readableEnded && !failure) stream.resume() // the rest of the COPY, read and dropped
    await returned
  }
  let first: IteratorResult<Buffer>
  try {
    first = await rows.next()
  } catch (error) {
    await close()
    throw error
  }
  const crlf = crlfLineEnds()
  async function* chunks(): AsyncGenerator<Uint8Array> {
    try {
      for (let r = first; !r.done; r = await rows.next()) yield crlf(r.value)
    } finally {
      await close()
    }
  }
  return { chunks: chunks(), close }
}

/**
 * What the numbers page shows (lib/numbers computeNumbers), aggregated in PostgreSQL in one statement so
 * that only a few dozen rows leave the database however many drives the period holds. Gives the same
 * figures as computeNumbers over listDrivesForNumbers (tests/integration/review/read-columns.test.ts):
 * percentile_cont is the same linear interpolation as lib/numbers percentile(), width_bucket the same bins, and
 * weeks are the shop's: `date_trunc('week', finished_at at time zone <the shop's zone>)` is the Monday of its calendar.
 */
export async function loadNumbersSummary(db: Db, shopId: string, since: Date, timeZone: string): Promise<Numbers> {
  const bins = CLEAR_BINS_MIN.slice(1).map((m) => m * 60)
  const { rows } = await sql<{ summary: SummaryJson }>`
    with d as materialized (
      select drive.id, drive.driver_id, coalesce(driver.name, 'Former staff') as tech_name,
             coalesce(p.name, 'Profile set on the drive') as profile_name, coalesce(drive.verdict, 'not_met') as verdict,
             drive.review_status, drive.cleared_at_seconds as cs, drive.harsh_events, drive.unmet_conditions,
             date_trunc('week', drive.finished_at at time zone ${timeZone}::text) as week
      from drive
      left join app_user driver on driver.id = drive.driver_id and driver.shop_id = ${shopId}::uuid
      left join condition_profile_version pv on pv.id = drive.profile_version_id and pv.shop_id = ${shopId}::uuid
      left join condition_profile p on p.id = pv.profile_id and p.shop_id = ${shopId}::uuid
      where drive.shop_id = ${shopId}::uuid and drive.status = 'finished' and drive.finished_at >= ${since}
        and drive.scored_at is not null
    )
    select json_build_object(
      'drives', (select count(*) from d),
      'profiles', (select coalesce(json_agg(x), '[]') from (
        select profile_name, count(*) as drives, count(cs) as cleared,
               percentile_cont(0.5) within group (order by cs) as median, percentile_cont(0.9) within group (order by cs) as p90,
               array[${sql.join(CLEAR_BINS_MIN.map((_, b) => sql`count(*) filter (where width_bucket(cs, ${bins}::float8[]) = ${sql.lit(b)})`))}] as bins
        from d group by profile_name) x),
      'weeks', (select coalesce(json_agg(x), '[]') from (
        select to_char(week, 'YYYY-MM-DD') as week, count(*) as total, count(*) filter (where verdict = 'met') as met, count(*) filter (where verdict = 'short') as short,
               count(*) filter (where verdict = 'not_met') as not_met, count(*) filter (where verdict = 'unverified') as unverified
        from d group by week) x),
      'reasons', (select coalesce(json_agg(x), '[]') from (
        select k as key, count(distinct d.id) as n from d, unnest(d.unmet_conditions) k where d.unmet_conditions <> '{}' group by k) x),
      'techs', (select coalesce(json_agg(x), '[]') from (
        select driver_id, min(tech_name) as name, count(*) as drives, count(*) filter (where verdict = 'met') as met,
               percentile_cont(0.5) within group (order by cs) as median, sum(harsh_events) as harsh,
               count(*) filter (where review_status = 'redo') as sent_back
        from d group by driver_id) x)
    ) as summary`.execute(db)
  const s = rows[0]!.summary
  const drives = Number(s.drives)
  return {
    drives,
    timeToClear: s.profiles
      .map((p) => ({
        profileName: p.profile_name,
        drives: p.drives,
        cleared: p.cleared,
        medianSeconds: wholeSeconds(p.median),
        p90Seconds: wholeSeconds(p.p90),
        bins: p.bins.map(Number),
      }))
      .sort((a, b) => b.drives - a.drives || a.profileName.localeCompare(b.profileName)),
    verdictMix: s.weeks
      .map((w) => ({
        weekStart: w.week,
        total: w.total,
        met: w.met,
        short: w.short,
        not_met: w.not_met,
        unverified: w.unverified,
      }))
      .sort((a, b) => a.weekStart.localeCompare(b.weekStart)),
    topReasons: s.reasons
      .map((r) => ({
        key: r.key,
        label: CONDITION_PROBLEM[r.key] ?? r.key,
        drives: r.n,
        share: drives ? r.n / drives : 0,
      }))
      .sort((a, b) => b.drives - a.drives || a.key.localeCompare(b.key))
      .slice(0, 7),
    perTechnician: s.techs
      .map((t) => ({
        technicianId: t.driver_id,
        name: t.name,
        drives: t.drives,
        met: t.met,
        metShare: t.met / t.drives,
        medianSecondsToClear: wholeSeconds(t.median),
        harshEvents: Number(t.harsh),
        sentBack: t.sent_back,
      }))
      .sort((a, b) => b.drives - a.drives || a.name.localeCompare(b.name)),
  }
}

interface SummaryJson {
  drives: number
  profiles: Array<{
    profile_name: string
    drives: number
    cleared: number
    median: number | null
    p90: number | null
    bins: number[]
  }>
  weeks: Array<{ week: string; total: number; met: number; short: number; not_met: number; unverified: number }>
  reasons: Array<{ key: string; n: number }>
  techs: Array<{
    driver_id: string
    name: string
    drives: number
    met: number
    median: number | null
    harsh: number
    sent_back: number
  }>
}
