// Monthly partitions of `sample` (migration 2026_12_02_1540_partitioned_samples) and each shop's sample
// retention (shop settings `sampleRetentionMonths`, default null = keep everything). Months are shared by
// every shop, so retention works in two steps (DEVELOPERS.md "Samples: partitions and retention"):
//  1. each shop with a retention loses its own samples from the whole months before its cutoff;
//  2. a month partition that ends at or before the latest cutoff any shop has, and that no shop has rows in
//     any more, is detached and dropped whole.
import { sql } from "kysely"
import type { Db } from "../client"

const SAMPLE_PARENT = "public.sample"
const MAX_RETENTION_MONTHS = 120

/**
 * How long (ms) retention waits for the lock a detach needs before it leaves that month to the next run:
 * inserts queue behind the waiting lock, so this bounds how long a sample POST can stall.
 */
const DETACH_LOCK_TIMEOUT_MS = 1000

/** Start (UTC, ms) of the month `months` months before `now`'s month: a shop keeping `months` months drops samples before it. */
export function retentionCutoffMs(now: Date, months: number): number {
  return Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - months, 1)
}

/**
 * pg_partman makes the months ahead (and the next ones as time goes on). Month boundaries are UTC.
 *
 * A phone whose clock runs months ahead leaves samples in `sample_default` for a month that has no partition yet.
 * When partman comes to make that month, PostgreSQL refuses a partition whose rows sit in the default one, and
 * without this every later month would go unmade. So first, in the same transaction, such rows of the months partman
 * is about to make are taken out of the default, their month is made, and they go back in (into it).
 */
export async function runPartitionMaintenance(db: Db): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await sql`set local timezone to 'UTC'`.execute(trx)
    const { rows: months } = await sql<{ month: string }>`
      select distinct to_char(date_trunc('month', to_timestamp(d.t / 1000.0)), 'YYYY-MM-DD') || ' 00:00:00+00' as month
      from sample_default d, partman.part_config c
      where c.parent_table = ${SAMPLE_PARENT}
        and d.t >= extract(epoch from date_trunc('month', now())) * 1000
        and d.t < extract(epoch from date_trunc('month', now()) + make_interval(months => c.premake + 1)) * 1000
      order by 1`.execute(trx)
    for (const { month } of months) await makeMonthHoldingDefaultRows(trx, month)
    await sql`select partman.run_maintenance(p_parent_table => ${SAMPLE_PARENT}, p_analyze => false, p_jobmon => false)`.execute(
      trx,
    )
  })
}

async function makeMonthHoldingDefaultRows(trx: Db, month: string): Promise<void> {
  const columns = sql.raw("drive_key, t, lat, lon, speed, accuracy")
  await sql`create temp table if not exists sample_moving (like sample) on commit drop`.execute(trx)
  await sql`
    with moved as (
      delete from sample_default
      where t >= extract(epoch from ${month}::timestamptz) * 1000
        and t < extract(epoch from ${month}::timestamptz + interval '1 month') * 1000
      returning ${columns})
    insert into sample_moving (${columns}) select ${columns} from moved`.execute(trx)
  await sql`select partman.create_partition_time(${SAMPLE_PARENT}, array[${month}::timestamptz], false)`.execute(trx)
  await sql`insert into sample (${columns}) select ${columns} from sample_moving`.execute(trx)
  await sql`truncate sample_moving`.execute(trx)
}

export interface SamplePartition {
  name: string
  /** Inclusive start and exclusive end, ms since the epoch; null for the default partition. */
  fromMs: number | null
  toMs: number | null
}

/** The partitions of `sample` with their bounds, oldest first (the default one last). */
export async function listSamplePartitions(db: Db): Promise<SamplePartition[]> {
  const { rows } = await sql<{ name: string; bound: string }>`
    select c.relname as name, pg_get_expr(c.relpartbound, c.oid) as bound
    from pg_inherits i join pg_class c on c.oid = i.inhrelid
    where i.inhparent = 'public.sample'::regclass`.execute(db)
  return rows
    .map((r) => {
      const m = /FROM \('?(-?\d+)'?\) TO \('?(-?\d+)'?\)/.exec(r.bound)
      return { name: r.name, fromMs: m ? Number(m[1]) : null, toMs: m ? Number(m[2]) : null }
    })
    .sort((a, b) => (a.fromMs ?? Infinity) - (b.fromMs ?? Infinity))
}

export interface RetentionResult {
  /** Samples deleted from months only some shops still keep. */
  deletedSamples: number
  /** Whole month partitions detached and dropped. */
  droppedPartitions: string[]
}

/**
 * Applies every shop's retention as of `now`. Only whole months go: the cutoff is the first day of a
 * month (UTC). Safe to run again and from several processes at once (deletes of deleted rows find nothing;
 * a partition another run dropped is skipped).
 */
export async function applySampleRetention(
  db: Db,
  now: Date = new Date(),
  lockTimeoutMs = DETACH_LOCK_TIMEOUT_MS,
): Promise<RetentionResult> {
  const shops = await db
    .selectFrom("shop")
    .select(["id", sql<number>`(settings->>'sampleRetentionMonths')::int`.as("months")])
    .where(sql<boolean>`jsonb_typeof(settings->'sampleRetentionMonths') = 'number'`)
    .execute()
  let deletedSamples = 0
  let latestCutoff = -Infinity
  for (const shop of shops) {
    const months = Math.min(Math.max(Math.trunc(shop.months), 1), MAX_RETENTION_MONTHS)
    const cutoff = retentionCutoffMs(now, months)
    latestCutoff = Math.max(latestCutoff, cutoff)
    const result = await sql`
      delete from sample s using drive d
      where d.shop_id = ${shop.id}::uuid and s.drive_key = d.sample_key and s.t < ${cutoff}::bigint`.execute(db)
    deletedSamples += Number(result.numAffectedRows ?? 0)
  }

  const droppedPartitions: string[] = []
  for (const p of await listSamplePartitions(db)) {
    if (p.toMs === null || p.toMs > latestCutoff) continue
    const dropped = await db.transaction().execute(async (trx) => {
      await sql`select set_config('lock_timeout', ${`${Math.round(lockTimeoutMs)}ms`}, true)`.execute(trx)
      // The detach locks the parent (ACCESS EXCLUSIVE) for a moment; with a default partition PostgreSQL
      // cannot detach CONCURRENTLY. The lock comes first, then the month is checked empty under it, so a
      // late sample cannot slip in between the check and the drop.
      try {
        await sql`lock table sample in access exclusive mode`.execute(trx)
      } catch (error) {
        if ((error as { code?: string }).code === "55P03") return false // busy: the next run tries again
        throw error
      }
      const exists =
        await sql`select 1 from pg_class where relname = ${p.name} and relnamespace = 'public'::regnamespace`.execute(
          trx,
        )
      if (exists.rows.length === 0) return false
      const { rows } = await sql`select 1 from ${sql.table(p.name)} limit 1`.execute(trx)
      if (rows.length > 0) return false // some shop still keeps samples of this month
      await sql`alter table sample detach partition ${sql.table(p.name)}`.execute(trx)
      await sql`drop table ${sql.table(p.name)}`.execute(trx)
      return true
    })
    if (dropped) droppedPartitions.push(p.name)
  }
  return { deletedSamples, droppedPartitions }
}
