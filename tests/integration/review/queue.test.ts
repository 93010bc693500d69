import { randomUUID } from "node:crypto"
import { sql } from "kysely"
import { describe, expect, it } from "vitest"
import { REVIEW_PAGE_SIZE } from "@/db/queries/reviews"
import { internalDriveId } from "@/lib/drive-id"
import { createTestShop, testDb, testDriveIds } from "../../helpers/db"
import { signedIn } from "../../helpers/http"
import { insertJob, insertScoredDrive } from "./fixtures"

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000)

describe("GET /api/review", () => {
  it("holds exactly the finished, unreviewed drives that are not met or had harsh events, oldest first", async () => {
    const shop = await createTestShop("Queue")
    const other = await createTestShop("Other")
    const job = await insertJob(shop)

    const met = await insertScoredDrive(shop, { pattern: "met", seed: 101, finishedAt: minutesAgo(50), job })
    const short = await insertScoredDrive(shop, { pattern: "short", seed: 102, finishedAt: minutesAgo(40), job })
    const never = await insertScoredDrive(shop, { pattern: "never-cleared", seed: 103, finishedAt: minutesAgo(45) })
    const harsh = await insertScoredDrive(shop, { pattern: "harsh", seed: 104, finishedAt: minutesAgo(30) })
    const unverified = await insertScoredDrive(shop, { pattern: "unverified", seed: 105, finishedAt: minutesAgo(20) })
    await insertScoredDrive(shop, { pattern: "short", seed: 106, status: "recording" })
    await insertScoredDrive(shop, { pattern: "short", seed: 107, finishedAt: minutesAgo(60), reviewStatus: "redo" })
    await insertScoredDrive(shop, {
      pattern: "never-cleared",
      seed: 108,
      finishedAt: minutesAgo(65),
      reviewStatus: "approved",
    })
    await insertScoredDrive(other, { pattern: "short", seed: 109, finishedAt: minutesAgo(70) })

    // The generated patterns score as intended (drive-file.md verdict rules).
    expect(met.score.verdict).toBe("met")
    expect(met.score.harshEvents.accel + met.score.harshEvents.decel).toBe(0)
    expect(short.score.verdict).toBe("short")
    expect(never.score.verdict).toBe("not_met")
    expect(harsh.score.harshEvents.accel + harsh.score.harshEvents.decel).toBeGreaterThan(0)
    expect(unverified.score.verdict).toBe("unverified")

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/review")
    expect(res.status).toBe(200)
    expect(res.body.drives.map((d: { id: string }) => d.id)).toEqual([never.id, short.id, harsh.id, unverified.id])
    const first = res.body.drives[1]
    expect(first.verdict).toBe("short")
    expect(first.reasons.length).toBeGreaterThan(0)
    expect(first.roNumber).toBe(job.roNumber)
  })

  it("pages with the cursor without repeating or skipping a drive, with finish times finer than a millisecond", async () => {
    const shop = await createTestShop("QueuePages")
    const { score } = await insertScoredDrive(shop, {
      pattern: "short",
      seed: 201,
      finishedAt: new Date(Date.UTC(2026, 0, 5, 9, 0, 0)),
    })
    // PostgreSQL keeps microseconds; a cursor cut to milliseconds would bring a page's last drive back.
    const rows = Array.from({ length: REVIEW_PAGE_SIZE + 5 }, (_, i) => ({
      id: randomUUID(),
      finishedAt: `2026-01-05T10:00:${String(i).padStart(2, "0")}.123456Z`,
    }))
    const db = testDb()
    await db
      .insertInto("drive")
      .values(
        rows.map((r) => ({
          ...testDriveIds(shop.shopId, r.id),
          shop_id: shop.shopId,
          vehicle_description: "Loaner, unplanned drive",
          profile: JSON.stringify(score.profile),
          driver_id: shop.tech.id,
          status: "finished" as const,
          verdict: score.verdict,
          finished_at: sql<Date>`${r.finishedAt}::timestamptz`,
        })),
      )
      .execute()
    await db
      .insertInto("score")
      .values(
        rows.map((r) => ({
          drive_id: internalDriveId(shop.shopId, r.id),
          shop_id: shop.shopId,
          verdict: score.verdict,
          result: JSON.stringify(score),
        })),
      )
      .execute()

    const lead = await signedIn(shop.lead)
    const page1 = await lead.get("/api/review")
    expect(page1.status).toBe(200)
    expect(page1.body.drives).toHaveLength(REVIEW_PAGE_SIZE)
    expect(page1.body.nextCursor).toEqual(expect.any(String))
    const page2 = await lead.get(`/api/review?cursor=${encodeURIComponent(page1.body.nextCursor)}`)
    expect(page2.status).toBe(200)
    expect(page2.body.nextCursor).toBeNull()
    const ids = [...page1.body.drives, ...page2.body.drives].map((d: { id: string }) => d.id)
    expect(ids).toHaveLength(rows.length + 1)
    expect(new Set(ids).size).toBe(ids.length)
    expect(ids.slice(1)).toEqual(rows.map((r) => r.id))
    expect((await lead.get("/api/review?cursor=nonsense")).status).toBe(400)
  })

  it("is for shop leads and admins only", async () => {
    const shop = await createTestShop("QueueRoles")
    for (const user of [shop.tech, shop.codriver]) {
      const res = await (await signedIn(user)).get("/api/review")
      expect(res.status).toBe(403)
      expect(res.body.error.code).toBe("forbidden")
    }
    expect((await (await signedIn(shop.admin)).get("/api/review")).status).toBe(200)
  })
})
