// Reads that must follow what is shown, not the shop's history: one shop with 100,000 drives over two
// years, seeded here with generate_series (a few seconds), then the review queue's first page and the
// numbers page's default 90 days (its aggregate, and the CSV download) read 40 times each. The shop is deleted at the end.
import { sql } from "kysely"
import pg from "pg"
import { createDb, type Db } from "@/db/client"
import { loadNumbersSummary, openNumbersCsv } from "@/db/queries/numbers"
import { listReviewQueue } from "@/db/queries/reviews"
import { benchShop, percentileOf } from "./rig"
import type { BenchContext, BenchFigure } from "./types"

const DRIVES = 100_000
const RUNS = 40

interface BigShop {
  db: Db
  /** Raw connections to the same database, for the CSV's COPY (the app's read pool in production). */
  pool: pg.Pool
  shopId: string
  done: number
}

function bigShop(ctx: BenchContext): Promise<BigShop> {
  return ctx.memo("reads-big-shop", async () => {
    const db = createDb(ctx.env.DATABASE_URL)
    const shopId = await benchShop(db, "history")
    await sql`
      insert into app_user (id, shop_id, email, name, role, password_hash)
      select 'bench-' || ${shopId}::text || '-' || i, ${shopId}::uuid, 'bench-' || ${shopId}::text || '-' || i || '@bench.invalid',
             'Bench technician ' || i, 'technician', 'x'
      from generate_series(1, 12) i`.execute(db)
    await sql`
      with p as (insert into condition_profile (shop_id, key, name, sensor)
                 select ${shopId}::uuid, 'bench-' || i, 'Bench profile ' || i, 'forward_radar' from generate_series(1, 3) i returning id)
      insert into condition_profile_version (shop_id, profile_id, version, settings) select ${shopId}::uuid, id, 1, '{}' from p`.execute(
      db,
    )
    // Two years of drives, about 137 a day; 98% finished, 70% met; older drives mostly reviewed.
    await sql`
      insert into drive (id, public_id, shop_id, vehicle_description, profile_version_id, profile, driver_id, status, verdict, review_status, created_at, finished_at)
      select drive_internal_id(${shopId}::uuid, g.pid), g.pid, ${shopId}::uuid, 'Bench drive',
             (select id from condition_profile_version where shop_id = ${shopId}::uuid order by id offset (i % 3) limit 1),
             '{}'::jsonb, 'bench-' || ${shopId}::text || '-' || (1 + i % 12),
             case when i % 50 = 0 then 'recording' else 'finished' end,
             case when i % 50 = 0 then null when i % 10 < 7 then 'met' when i % 10 < 8 then 'short' when i % 10 < 9 then 'not_met' else 'unverified' end,
             case when i % 50 = 0 then null when (i * 7919) % 100 < 40 then null when i % 13 = 0 then 'redo' else 'approved' end,
             now() - make_interval(secs => (${DRIVES} - i) * (730 * 86400.0 / ${DRIVES})) - interval '40 minutes',
             case when i % 50 = 0 then null else now() - make_interval(secs => (${DRIVES} - i) * (730 * 86400.0 / ${DRIVES})) end
      from (select i, gen_random_uuid() as pid from generate_series(1, ${DRIVES}) i) g`.execute(db)
    // The drives' statistics before the scores are written: the score trigger updates each drive by its key, and on
    // a stack where an earlier run's 100,000 drives were just deleted, planning on stale statistics took minutes.
    await sql`analyze drive`.execute(db)
    // A score for every finished drive; the trigger copies its figures onto the drive.
    await sql`
      insert into score (drive_id, shop_id, verdict, result)
      select d.id, d.shop_id, d.verdict, jsonb_build_object(
        'verdict', d.verdict,
        'durationSeconds', 900 + (h % 900),
        'clearedAtSeconds', case when d.verdict = 'met' then 300 + (h % 600) else null end,
        'qualifyingSecondsBeforeClear', 200 + (h % 400),
        'followingSecondsBeforeClear', h % 120,
        'harshEvents', jsonb_build_object('accel', case when h % 17 = 0 then 1 else 0 end, 'decel', case when h % 23 = 0 then 2 else 0 end),
        'conditions', jsonb_build_array(
          jsonb_build_object('key', 'speed', 'met', d.verdict = 'met' or h % 2 = 0),
          jsonb_build_object('key', 'following', 'met', d.verdict = 'met' or h % 3 = 0),
          jsonb_build_object('key', 'accuracy', 'met', d.verdict <> 'unverified')))
      from (select id, shop_id, verdict, abs(hashtext(id::text)) as h from drive where shop_id = ${shopId}::uuid and status = 'finished') d`.execute(
      db,
    )
    // As autovacuum leaves a table that has settled (the trigger rewrote each drive row once).
    await sql`vacuum analyze drive`.execute(db)
    await sql`vacuum analyze score`.execute(db)
    return { db, pool: new pg.Pool({ connectionString: ctx.env.DATABASE_URL, max: 2 }), shopId, done: 0 }
  })
}

async function finish(ctx: BenchContext, shop: BigShop) {
  shop.done += 1
  if (shop.done < 3) return
  await shop.pool.end()
  if (ctx.env.BENCH_KEEP_SEED) return void (await shop.db.destroy()) // to look at the plans afterwards
  await shop.db.deleteFrom("shop").where("id", "=", shop.shopId).execute()
  // The 100,000 deleted drives and their scores vacuumed now, as autovacuum would within the minute: otherwise it
  // does so while the next figures (the replay's latency, the ingest ceiling) are being timed.
  await sql`vacuum analyze drive`.execute(shop.db)
  await sql`vacuum analyze score`.execute(shop.db)
  await shop.db.destroy()
}

async function p95Ms(fn: () => Promise<unknown>): Promise<number> {
  for (let i = 0; i < 5; i++) await fn()
  const times: number[] = []
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now()
    await fn()
    times.push(performance.now() - t0)
  }
  return percentileOf(times, 95)
}

/**
 * A read over the seeded history, timed as p95Ms does, against 50 ms. `check` looks at a first answer before the clock
 * (throwing when the seed is not what the figure needs) and may give a line to print.
 */
function historyFigure<T>(
  name: string,
  read: (shop: BigShop, since: Date) => Promise<T>,
  check: (first: T) => string | undefined,
): BenchFigure {
  return {
    name,
    target: "<= 50",
    unit: "ms",
    requiresEnv: ["DATABASE_URL"],
    async run(ctx) {
      const shop = await bigShop(ctx)
      const since = new Date(Date.now() - 90 * 86_400_000)
      const line = check(await read(shop, since))
      const ms = await p95Ms(() => read(shop, since))
      if (line) console.error(line)
      await finish(ctx, shop)
      return ms
    },
    meets: (v) => v <= 50,
  }
}

/** The review queue's first page. */
export const reviewQueueP95Ms100k = historyFigure(
  "reviewQueueP95Ms100k",
  (shop) => listReviewQueue(shop.db, shop.shopId),
  (first) => {
    if (first.rows.length === 0) throw new Error("the seeded review queue is empty")
    return undefined
  },
)

/** The numbers page (and its JSON API): the period's figures aggregated in PostgreSQL (app/_server/numbers.ts loadNumbers). */
export const numbersP95Ms100k = historyFigure(
  "numbersP95Ms100k",
  (shop, since) => loadNumbersSummary(shop.db, shop.shopId, since, "America/Chicago"),
  (first) => {
    if (first.drives < 10_000) throw new Error(`expected about 12,000 drives in 90 days, got ${first.drives}`)
    return undefined
  },
)

/**
 * The numbers CSV download (GET /api/numbers?format=csv): the whole body of the period's rows, read to the last byte
 * from openNumbersCsv (app/_server/numbers.ts numbersCsvBody streams it), written by PostgreSQL with COPY.
 */
export const numbersCsvRowsP95Ms100k = historyFigure(
  "numbersCsvRowsP95Ms100k",
  async (shop, since) => {
    const csv = await openNumbersCsv(shop.db, shop.pool, shop.shopId, since, "America/Chicago")
    const chunks: Uint8Array[] = []
    for await (const chunk of csv.chunks) chunks.push(chunk)
    return chunks
  },
  (chunks) => {
    const body = Buffer.concat(chunks)
    let lines = 0
    for (let i = body.indexOf(10); i >= 0; i = body.indexOf(10, i + 1)) lines++
    const drives = lines - 1 // the header; the bench's drives have no line breaks in their names
    if (drives < 10_000) throw new Error(`expected about 12,000 drives in 90 days, got ${drives}`)
    return `[bench] numbers CSV: ${drives} drives in 90 days, ${Math.round(body.length / 1024)} kB`
  },
)
