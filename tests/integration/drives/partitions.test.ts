import { sql } from "kysely"
import { beforeAll, describe, expect, it } from "vitest"
import {
  applySampleRetention,
  listSamplePartitions,
  retentionCutoffMs,
  runPartitionMaintenance,
} from "@/db/queries/sample-retention"
import { createTestShop, testDb } from "../../helpers/db"
import { signedIn, type ApiClient } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { sampleRun, startDrive } from "./helpers"

// Samples are partitioned by month on `t` (migration 2026_12_02_1540_partitioned_samples, pg_partman).

const monthStart = (year: number, month0: number) => Date.UTC(year, month0, 1)

async function sampleCount(driveId: string) {
  const row = await testDb()
    .selectFrom("sample_decoded")
    .select((eb) => eb.fn.countAll<string>().as("n"))
    .where("drive_id", "=", driveId)
    .executeTakeFirstOrThrow()
  return Number(row.n)
}

describe("sample partitions", () => {
  it("has next month's partition (and the months after it) as soon as the database is migrated", async () => {
    const now = new Date()
    const parts = await listSamplePartitions(testDb())
    for (let ahead = 1; ahead <= 3; ahead++) {
      const from = monthStart(now.getUTCFullYear(), now.getUTCMonth() + ahead)
      const to = monthStart(now.getUTCFullYear(), now.getUTCMonth() + ahead + 1)
      expect(
        parts.find((p) => p.fromMs === from),
        `month +${ahead}`,
      ).toMatchObject({ toMs: to })
    }
    // And a row of next month goes there, not to the default partition.
    const next = monthStart(now.getUTCFullYear(), now.getUTCMonth() + 1)
    const { rows } = await sql<{ name: string }>`
      select c.relname as name from pg_inherits i join pg_class c on c.oid = i.inhrelid
      where i.inhparent = 'public.sample'::regclass
        and pg_get_expr(c.relpartbound, c.oid) = ${`FOR VALUES FROM ('${next}') TO ('${monthStart(now.getUTCFullYear(), now.getUTCMonth() + 2)}')`}`.execute(
      testDb(),
    )
    expect(rows).toHaveLength(1)
  })
})

describe("sample retention", () => {
  // Two months long past (1999) that no other test writes in, made as partman would have made them then.
  const OLD = monthStart(1999, 1) // Feb 1999: shop A and shop B have samples here
  const OLDER_ONLY_A = monthStart(1999, 2) // Mar 1999: only shop A has samples here
  const shopA = setUpShopTeam("Retention A")
  const shopB = setUpShopTeam("Retention B")
  beforeAll(async () => {
    await testDb()
      .transaction()
      .execute(async (trx) => {
        await sql`set local timezone to 'UTC'`.execute(trx)
        await sql`select partman.create_partition_time('public.sample', array['1999-02-01 00:00:00+00', '1999-03-01 00:00:00+00']::timestamptz[], false)`.execute(
          trx,
        )
      })
  })

  it("is a shop setting: null (keep everything) by default, whole months from 1 to 120", async () => {
    const before = await shopA.admin.get("/api/shop/settings")
    expect(before.body.settings.sampleRetentionMonths).toBeNull()
    for (const bad of [0, 1.5, 121, "6"]) {
      const res = await shopA.admin.patch("/api/shop/settings", { sampleRetentionMonths: bad })
      expect(res.status, JSON.stringify(bad)).toBe(400)
      expect(res.body.error.fields).toHaveProperty("sampleRetentionMonths")
    }
    expect((await shopA.lead.patch("/api/shop/settings", { sampleRetentionMonths: 3 })).status).toBe(403)
    const set = await shopA.admin.patch("/api/shop/settings", { sampleRetentionMonths: 3 })
    expect(set.status).toBe(200)
    expect(set.body.settings.sampleRetentionMonths).toBe(3)
  })

  it("drops an old month's samples of the shop that keeps less, and nothing else", async () => {
    const now = new Date()
    expect((await shopA.admin.patch("/api/shop/settings", { sampleRetentionMonths: 3 })).status).toBe(200)
    const post = async (client: ApiClient, startMs: number, count: number) => {
      const drive = await startDrive(client)
      const res = await client.post(`/api/drives/${drive.id}/samples`, {
        batchId: `r-${startMs}`,
        samples: sampleRun(count, 3, startMs),
      })
      expect(res.status).toBe(200)
      expect(res.body.accepted).toBe(count)
      return drive.id as string
    }
    const aOld = await post(shopA.tech, OLD + 3_600_000, 30)
    const aOlder = await post(shopA.tech, OLDER_ONLY_A + 3_600_000, 20)
    const aRecent = await post(shopA.tech, Date.now() - 60_000, 25)
    const bOld = await post(shopB.tech, OLD + 7_200_000, 40)
    const bRecent = await post(shopB.tech, Date.now() - 120_000, 15)
    const partsBefore = (await listSamplePartitions(testDb())).map((p) => p.name)
    expect(partsBefore).toEqual(expect.arrayContaining(["sample_p1999_02", "sample_p1999_03"]))
    expect(retentionCutoffMs(now, 3)).toBeGreaterThan(OLDER_ONLY_A)

    // (a generous lock wait: the browser tests may be inserting samples meanwhile)
    await applySampleRetention(testDb(), now, 15_000)

    // Shop A keeps 3 months: its 1999 samples are gone, in both months.
    expect(await sampleCount(aOld)).toBe(0)
    expect(await sampleCount(aOlder)).toBe(0)
    // Shop B keeps everything: its sample in the same old month stays, so that month's partition stays.
    expect(await sampleCount(bOld)).toBe(40)
    // March 1999 held only shop A's samples: the whole month is dropped.
    const partsAfter = (await listSamplePartitions(testDb())).map((p) => p.name)
    expect(partsAfter).toContain("sample_p1999_02")
    expect(partsAfter).not.toContain("sample_p1999_03")
    // Recent months of both shops are untouched, and A's drives are still there (their samples went).
    expect(await sampleCount(aRecent)).toBe(25)
    expect(await sampleCount(bRecent)).toBe(15)
    expect((await shopA.tech.get(`/api/drives/${aOld}`)).status).toBe(200)
    // This month and the months ahead are never dropped.
    const thisMonth = monthStart(now.getUTCFullYear(), now.getUTCMonth())
    const left = await listSamplePartitions(testDb())
    expect(left.some((p) => p.fromMs === thisMonth)).toBe(true)

    // Running again changes nothing.
    const again = await applySampleRetention(testDb(), now, 15_000)
    expect(again.deletedSamples).toBe(0)
    expect(await sampleCount(bOld)).toBe(40)
    expect(await sampleCount(aRecent)).toBe(25)
  })
})

describe("partition upkeep with samples from a clock months ahead", () => {
  it("makes the month those samples sit in, moves them into it, and keeps making the months after", async () => {
    const db = testDb()
    const shop = await createTestShop("Clock ahead")
    await startDrive(await signedIn(shop.tech))
    const { sample_key: driveKey } = await db
      .selectFrom("drive")
      .select("sample_key")
      .where("shop_id", "=", shop.shopId)
      .executeTakeFirstOrThrow()
    const now = new Date()
    // Eight months ahead: past partman's four months made ahead, so these rows land in the default partition.
    const ahead = monthStart(now.getUTCFullYear(), now.getUTCMonth() + 8)
    const values = [0, 1000, 2000].map((dt) => ({ drive_key: driveKey, t: ahead + dt, lat: 1, lon: 1 }))
    await db.insertInto("sample").values(values).execute()
    const whereRows = async () =>
      (
        await sql<{
          part: string
        }>`select tableoid::regclass::text as part from sample where drive_key = ${driveKey}`.execute(db)
      ).rows.map((r) => r.part)
    expect(await whereRows()).toEqual(["sample_default", "sample_default", "sample_default"])

    // Partman comes to make that month (here: made to look nine months ahead instead of four).
    await sql`update partman.part_config set premake = 9 where parent_table = 'public.sample'`.execute(db)
    try {
      await runPartitionMaintenance(db)
    } finally {
      await sql`update partman.part_config set premake = 4 where parent_table = 'public.sample'`.execute(db)
    }
    const parts = await listSamplePartitions(db)
    const month = parts.find((p) => p.fromMs === ahead)
    expect(month).toBeDefined()
    expect(new Set(await whereRows())).toEqual(new Set([month!.name]))
    const after = monthStart(now.getUTCFullYear(), now.getUTCMonth() + 9)
    expect(parts.find((p) => p.fromMs === after)).toBeDefined()
  })
})
