import { sql } from "kysely"
import { wholeSeconds } from "@/lib/format"
import { CLEAR_BINS_MIN, CONDITION_PROBLEM, type Numbers } from "@/lib/numbers"
import type { Db } from "../client"
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

/**
 * Finished, scored drives of the shop since a date, with what the numbers page needs from each. The figures
 * are columns of `drive` filled when the drive is scored (migration 2026_12_02_1330), read through the
 * (shop_id, finished_at) index: the cost follows the period shown, not the shop's history.
 */
export async function listDrivesForNumbers(db: Db, shopId: string, since: Date) {
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
    .limit(20_000)
    .execute()
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
