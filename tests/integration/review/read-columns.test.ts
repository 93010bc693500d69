// The review queue and the numbers page read columns kept on `drive` (migration 2026_12_02_1330) instead
// of the score's JSON. On a generated shop they must give exactly what the old queries over `score` gave;
// the old queries' reads of the score are kept here, word for word, as the reference. The old numbers query takes
// its rows and names from selectFinishedDrivesWithNames, which it shares with listDrivesForNumbers; the summary
// aggregated in SQL (loadNumbersSummary) finds its rows and names on its own and is held to the same figures.
import { randomUUID } from "node:crypto"
import { sql } from "kysely"
import { describe, expect, it } from "vitest"
import { listDrivesForNumbers, loadNumbersSummary, selectFinishedDrivesWithNames } from "@/db/queries/numbers"
import { internalDriveId } from "@/lib/drive-id"
import { computeNumbers, numbersDriveFromRow } from "@/lib/numbers"
import { listReviewQueue } from "@/db/queries/reviews"
import { scoreDrive, type Score } from "@/lib/scoring"
import { generateDrive, PATTERN_MIN_MINUTES, type DrivePattern } from "@/lib/tracks"
import { createTestProfile, createTestShop, insertDrive, testDb } from "../../helpers/db"

const harshSql = sql<number>`coalesce((score.result->'harshEvents'->>'accel')::int, 0) + coalesce((score.result->'harshEvents'->>'decel')::int, 0)`

async function oldQueue(shopId: string) {
  const rows = await testDb()
    .selectFrom("drive")
    .innerJoin("score", "score.drive_id", "drive.id")
    .select(["drive.id"])
    .where("drive.shop_id", "=", shopId)
    .where("drive.status", "=", "finished")
    .where("drive.review_status", "is", null)
    .where((eb) => eb.or([eb("drive.verdict", "!=", "met"), eb(harshSql, ">", 0)]))
    .orderBy("drive.finished_at", "asc")
    .orderBy("drive.id", "asc")
    .execute()
  return rows.map((r) => r.id)
}

async function oldNumbers(shopId: string, since: Date) {
  return selectFinishedDrivesWithNames(testDb(), shopId, since)
    .innerJoin("score", (j) => j.onRef("score.drive_id", "=", "drive.id").on("score.shop_id", "=", shopId))
    .select([
      sql<number | null>`(score.result->>'clearedAtSeconds')::float8`.as("cleared_at_seconds"),
      sql<number>`coalesce((score.result->>'durationSeconds')::float8, 0)`.as("duration_seconds"),
      sql<number>`coalesce((score.result->>'qualifyingSecondsBeforeClear')::float8, 0)`.as("qualifying_seconds"),
      sql<number>`coalesce((score.result->>'followingSecondsBeforeClear')::float8, 0)`.as("following_seconds"),
      harshSql.as("harsh_events"),
      sql<
        string[]
      >`coalesce((select array_agg(c->>'key') from jsonb_array_elements(score.result->'conditions') c where (c->>'met')::boolean is false), '{}')`.as(
        "unmet_conditions",
      ),
    ])
    .execute()
}

const PATTERNS: DrivePattern[] = ["met", "short", "never-cleared", "harsh", "unverified"]

/** 150 drives over 60 days: every pattern, some recording, some reviewed, some unscored, two drivers. */
async function generatedShop() {
  const shop = await createTestShop("ReadColumns")
  const other = await createTestShop("ReadColumnsOther")
  const { versionId } = await createTestProfile(shop.shopId)
  const scores = new Map<DrivePattern, Score>(
    PATTERNS.map((p, i) => [
      p,
      scoreDrive(generateDrive({ seed: 900 + i, pattern: p, minutes: Math.max(PATTERN_MIN_MINUTES[p], 6) })),
    ]),
  )
  const db = testDb()
  let state = 12345
  const rand = () => (state = (state * 1103515245 + 12345) % 2 ** 31) / 2 ** 31
  const drives = []
  const scored = []
  for (let i = 0; i < 150; i++) {
    const pattern = PATTERNS[Math.floor(rand() * PATTERNS.length)]!
    const score = scores.get(pattern)!
    const status = rand() < 0.1 ? ("recording" as const) : ("finished" as const)
    const review = rand()
    const owner = i % 25 === 0 ? other : shop
    const publicId = randomUUID()
    const id = internalDriveId(owner.shopId, publicId)
    drives.push({
      id,
      public_id: publicId,
      shop_id: owner.shopId,
      vehicle_description: "Generated drive",
      profile: JSON.stringify(score.profile),
      profile_version_id: owner === shop && i % 3 === 0 ? versionId : null,
      driver_id: i % 2 === 0 ? owner.tech.id : owner.lead.id,
      status,
      verdict: status === "finished" ? score.verdict : null,
      review_status:
        status === "finished" && review < 0.2
          ? ("approved" as const)
          : status === "finished" && review < 0.3
            ? ("redo" as const)
            : null,
      finished_at: status === "finished" ? new Date(Date.now() - Math.floor(rand() * 60 * 86_400_000)) : null,
    })
    if (status === "finished" && rand() > 0.05)
      scored.push({ drive_id: id, shop_id: owner.shopId, verdict: score.verdict, result: JSON.stringify(score) })
  }
  await db.insertInto("drive").values(drives).execute()
  await db.insertInto("score").values(scored).execute()
  return shop
}

describe("reads from the drive's own columns", () => {
  it("the review queue and the numbers give the same answers as the queries over the score's JSON", async () => {
    const shop = await generatedShop()
    const expected = await oldQueue(shop.shopId)
    expect(expected.length).toBeGreaterThan(20)
    const got: string[] = []
    let cursor: { time: string; id: string } | undefined
    for (;;) {
      const page = await listReviewQueue(testDb(), shop.shopId, cursor)
      got.push(...page.rows.map((r) => r.id))
      if (!page.nextCursor) break
      const [time, id] = page.nextCursor.split("|")
      cursor = { time: time!, id: id! }
    }
    expect(got).toEqual(expected)

    for (const days of [7, 30, 90]) {
      const since = new Date(Date.now() - days * 86_400_000)
      const before = await oldNumbers(shop.shopId, since)
      const now = await listDrivesForNumbers(testDb(), shop.shopId, since)
      expect(now.length).toBe(before.length)
      expect(now.map((r) => ({ ...r, harsh_events: Number(r.harsh_events) }))).toEqual(
        before.map((r) => ({ ...r, harsh_events: Number(r.harsh_events) })),
      )
      // The page's figures, aggregated in the database, equal lib/numbers over the old rows.
      // Weeks on three calendars: behind UTC with daylight saving, UTC, and ahead of UTC by a half hour.
      for (const zone of ["America/Chicago", "UTC", "Asia/Kolkata"]) {
        const summary = await loadNumbersSummary(testDb(), shop.shopId, since, zone)
        expect(summary.drives).toBe(before.length)
        expect(summary).toEqual(computeNumbers(before.map(numbersDriveFromRow), zone))
      }
    }
  })

  it("a score stored again (late samples) moves the drive in or out of the queue", async () => {
    const shop = await createTestShop("ReadColumnsRescore")
    const met = scoreDrive(generateDrive({ seed: 77, pattern: "met", minutes: PATTERN_MIN_MINUTES.met }))
    const harsh = scoreDrive(generateDrive({ seed: 78, pattern: "harsh", minutes: PATTERN_MIN_MINUTES.harsh }))
    expect(met.verdict).toBe("met")
    expect(harsh.harshEvents.accel + harsh.harshEvents.decel).toBeGreaterThan(0)
    const { internalId: id } = await insertDrive(shop, {
      profile: JSON.stringify(met.profile),
      status: "finished",
      verdict: "met",
      finished_at: new Date(),
    })
    const db = testDb()
    await db
      .insertInto("score")
      .values({ drive_id: id, shop_id: shop.shopId, verdict: "met", result: JSON.stringify(met) })
      .execute()
    expect((await listReviewQueue(db, shop.shopId)).rows.map((r) => r.id)).toEqual(await oldQueue(shop.shopId))
    expect((await listReviewQueue(db, shop.shopId)).rows).toHaveLength(0)
    await db
      .updateTable("score")
      .set({ result: JSON.stringify(harsh) })
      .where("drive_id", "=", id)
      .execute()
    expect((await listReviewQueue(db, shop.shopId)).rows.map((r) => r.id)).toEqual([id])
    expect(await oldQueue(shop.shopId)).toEqual([id])
    const row = await db
      .selectFrom("drive")
      .select(["harsh_events", "needs_review"])
      .where("id", "=", id)
      .executeTakeFirstOrThrow()
    expect(row.harsh_events).toBe(harsh.harshEvents.accel + harsh.harshEvents.decel)
    expect(row.needs_review).toBe(true)
  })
})
