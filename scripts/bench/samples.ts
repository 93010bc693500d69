// sampleBytes: what a stored sample costs on disk, with its share of the primary key. 1,000,000 samples go
// into one month of the real partitioned `sample` table (January 2001, a month nothing else writes in,
// made with pg_partman as maintenance makes any month) the way recorders send them: 100 drives recording
// at once, each sending 50-sample batches in turn, through the same insert the API uses (db/queries/samples
// insertSamples), four connections at a time. After VACUUM ANALYZE (so the free-space and visibility maps
// are counted too), the month's pg_total_relation_size (table, indexes, TOAST, all forks) / 1,000,000.
// The drives, their samples and the month are removed afterwards. Needs DATABASE_URL.
import { randomUUID } from "node:crypto"
import { internalDriveId } from "@/lib/drive-id"
import { sql } from "kysely"
import { createDb } from "@/db/client"
import { insertSamples } from "@/db/queries/samples"
import { resolveProfile } from "@/lib/drive-file/profile"
import type { Sample } from "@/lib/drive-file/schema"
import { SEND_MAX_SAMPLES } from "@/lib/recorder/batching"
import { generateDrive } from "@/lib/tracks"
import { benchPerson, benchShop } from "./rig"
import type { BenchFigure } from "./types"

const SAMPLES = 1_000_000
const DRIVES = 100
const PER_DRIVE = SAMPLES / DRIVES
const CONNECTIONS = 4
const MONTH = "2001-01-01 00:00:00+00"
const MONTH_START_MS = Date.UTC(2001, 0, 1)
const PARTITION = "sample_p2001_01"

export const sampleBytes: BenchFigure = {
  name: "sampleBytes",
  target: "<= 100",
  unit: "bytes/sample",
  requiresEnv: ["DATABASE_URL"],
  async run(ctx) {
    const db = createDb(ctx.env.DATABASE_URL)
    const shopId = await benchShop(db, "samples")
    const userId = (await benchPerson(db, shopId, "technician")).id
    try {
      await db.transaction().execute(async (trx) => {
        await sql`set local timezone to 'UTC'`.execute(trx)
        await sql`select partman.create_partition_time('public.sample', array[${MONTH}]::timestamptz[], false)`.execute(
          trx,
        )
      })
      const existing = await sql<{ n: string }>`select count(*) as n from ${sql.table(PARTITION)}`.execute(db)
      if (Number(existing.rows[0]!.n) !== 0)
        throw new Error(`${PARTITION} is not empty: sampleBytes needs a month of its own`)

      // One 10 Hz track (16 min 40 s, 10,000 samples); each drive takes it at its own start within the month.
      const track = generateDrive({
        seed: 1_000_000,
        hz: 10,
        minutes: Math.ceil(PER_DRIVE / 600) + 1,
        pattern: "met",
      }).samples.slice(0, PER_DRIVE)
      if (track.length !== PER_DRIVE) throw new Error(`track has ${track.length} samples, not ${PER_DRIVE}`)
      const t0 = track[0]!.t
      const drives = Array.from({ length: DRIVES }, (_, i) => ({
        id: randomUUID(),
        startMs: MONTH_START_MS + i * 3 * 3_600_000,
      }))
      await db
        .insertInto("drive")
        .values(
          drives.map((d) => ({
            id: internalDriveId(shopId, d.id),
            public_id: d.id,
            shop_id: shopId,
            profile: JSON.stringify(resolveProfile({})),
            driver_id: userId,
            created_at: new Date(d.startMs),
          })),
        )
        .execute()

      // Round robin: batch k of every drive, then batch k+1 of every drive, as recorders interleave.
      const jobs: Array<{ driveId: string; samples: Sample[] }> = []
      for (let k = 0; k < PER_DRIVE; k += SEND_MAX_SAMPLES) {
        for (const d of drives)
          jobs.push({
            driveId: internalDriveId(shopId, d.id),
            samples: track.slice(k, k + SEND_MAX_SAMPLES).map((s) => ({ ...s, t: s.t - t0 + d.startMs })),
          })
      }
      let next = 0
      await Promise.all(
        Array.from({ length: CONNECTIONS }, async () => {
          while (next < jobs.length) {
            const job = jobs[next++]!
            await insertSamples(db, job.driveId, shopId, job.samples)
          }
        }),
      )
      await sql`vacuum analyze ${sql.table(PARTITION)}`.execute(db)
      const { rows } = await sql<{ n: string; total: string; heap: string; indexes: string }>`
        select (select count(*) from ${sql.table(PARTITION)}) as n,
          pg_total_relation_size(${PARTITION}::regclass) as total,
          pg_table_size(${PARTITION}::regclass) as heap,
          pg_indexes_size(${PARTITION}::regclass) as indexes`.execute(db)
      const r = rows[0]!
      if (Number(r.n) !== SAMPLES) throw new Error(`stored ${r.n} samples, not ${SAMPLES}`)
      console.error(
        `[sampleBytes] per sample: table ${(Number(r.heap) / SAMPLES).toFixed(1)} B, primary key ${(Number(r.indexes) / SAMPLES).toFixed(1)} B`,
      )
      return Number(r.total) / SAMPLES
    } finally {
      // The month first (a drop, not a million deletes), then the drives.
      await sql`alter table sample detach partition ${sql.table(PARTITION)}`.execute(db).catch(() => undefined)
      await sql`drop table if exists ${sql.table(PARTITION)}`.execute(db)
      await db.deleteFrom("drive").where("shop_id", "=", shopId).execute()
      await db.deleteFrom("app_user").where("shop_id", "=", shopId).execute()
      await db.deleteFrom("shop").where("id", "=", shopId).execute()
      await db.destroy()
    }
  },
  meets: (v) => v <= 100,
}
