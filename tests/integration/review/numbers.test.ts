import { describe, expect, it } from "vitest"
import { createTestShop } from "../../helpers/db"
import { signedIn } from "../../helpers/http"
import { insertScoredDrive } from "./fixtures"

describe("GET /api/numbers", () => {
  it("counts the shop's finished drives only, and exports them as CSV", async () => {
    const shop = await createTestShop("Numbers")
    const other = await createTestShop("NumbersOther")
    const met = await insertScoredDrive(shop, { pattern: "met", seed: 501 })
    await insertScoredDrive(shop, { pattern: "short", seed: 502 })
    await insertScoredDrive(shop, { pattern: "never-cleared", seed: 503 })
    await insertScoredDrive(shop, { pattern: "short", seed: 504, status: "recording" })
    await insertScoredDrive(other, { pattern: "short", seed: 505 })

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/numbers?days=30")
    expect(res.status).toBe(200)
    expect(res.body.drives).toBe(3)
    const week = res.body.verdictMix.at(-1)
    expect(week.met + week.short + week.not_met + week.unverified).toBe(3)
    expect(res.body.perTechnician).toHaveLength(1)
    expect(res.body.perTechnician[0].drives).toBe(3)
    const reasons = Object.fromEntries(
      res.body.topReasons.map((r: { key: string; drives: number }) => [r.key, r.drives]),
    )
    expect(reasons.cleared).toBe(1)
    const ttc = res.body.timeToClear[0]
    expect(ttc.drives).toBe(3)
    expect(ttc.cleared).toBe(2)

    const csv = await lead.get("/api/numbers?format=csv&days=30")
    expect(csv.status).toBe(200)
    expect(csv.headers.get("content-type")).toContain("text/csv")
    const lines = csv.text.trim().split("\r\n")
    expect(lines).toHaveLength(4)
    expect(csv.text).toContain(met.id)
    // Durations are whole seconds rounded down (the figure formatDuration writes), headed as seconds.
    expect(lines[0]).toBe(
      "drive_id,finished_at,technician,profile,verdict,time_to_learn_complete_seconds,qualifying_time_before_learn_complete_seconds,following_time_before_learn_complete_seconds,drive_time_seconds,harsh_events,review,unmet_conditions",
    )
    expect(csv.text).toContain(`,met,${Math.floor(met.score.clearedAtSeconds! + 1e-6)},`)
  })

  it("groups weeks on the shop's calendar: a drive just before midnight Sunday, shop time, is in the week before", async () => {
    const shop = await createTestShop("NumbersZone")
    // IANA tz database: America/Regina keeps UTC-6 all year (no daylight saving), so shop midnight is 06:00 UTC.
    const admin = await signedIn(shop.admin)
    expect((await admin.patch("/api/shop/settings", { timeZone: "America/Regina" })).status).toBe(200)
    // The Monday 7 to 13 days ago on the shop's calendar (the drives stay inside the 30-day period).
    const today = new Date(Date.now() - 6 * 3_600_000) // the shop's wall clock, read as UTC
    const daysBack = 7 + ((today.getUTCDay() + 6) % 7) // days since this week's Monday, plus a week
    const monday = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate() - daysBack)
    const mondayIso = new Date(monday).toISOString().slice(0, 10)
    const weekBefore = new Date(monday - 7 * 86_400_000).toISOString().slice(0, 10)
    const sunday = new Date(monday - 86_400_000).toISOString().slice(0, 10)
    // Sunday 23:30 shop time = Monday 05:30 UTC (UTC would put it in the Monday's week); Monday 00:30 = 06:30 UTC.
    const lateSunday = await insertScoredDrive(shop, {
      pattern: "met",
      seed: 511,
      finishedAt: new Date(monday + 5.5 * 3_600_000),
    })
    await insertScoredDrive(shop, { pattern: "short", seed: 512, finishedAt: new Date(monday + 6.5 * 3_600_000) })

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/numbers?days=30")
    expect(res.status).toBe(200)
    expect(res.body.verdictMix).toEqual([
      { weekStart: weekBefore, total: 1, met: 1, short: 0, not_met: 0, unverified: 0 },
      { weekStart: mondayIso, total: 1, met: 0, short: 1, not_met: 0, unverified: 0 },
    ])
    const csv = await lead.get("/api/numbers?format=csv&days=30")
    const line = csv.text.split("\r\n").find((l: string) => l.startsWith(lateSunday.id))
    expect(line).toContain(`,${sunday}T23:30:00-06:00,`)
  })

  it("is for leads, and refuses a bad period", async () => {
    const shop = await createTestShop("NumbersRoles")
    expect((await (await signedIn(shop.tech)).get("/api/numbers")).status).toBe(403)
    const bad = await (await signedIn(shop.lead)).get("/api/numbers?days=abc")
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.days).toBeDefined()
  })
})
