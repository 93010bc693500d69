import { describe, expect, it } from "vitest"
import { listDrivesForNumbers } from "@/db/queries/numbers"
import { numbersDriveFromRow, numbersToCsv } from "@/lib/numbers"
import { createTestShop, testDb } from "../../helpers/db"
import { signedIn } from "../../helpers/http"
import { insertScoredDrive } from "./fixtures"

// "US/Pacific-New" and "AET" are names the browser's Intl (ICU) accepts but that have no file in the IANA
// tz database PostgreSQL reads (US/Pacific-New was removed from the database in release 2020b; "AET" is an
// ICU-only three-letter ID), so pg_timezone_names does not list them and `at time zone` refuses them.
const INTL_ONLY_ZONES = ["US/Pacific-New", "AET"]

describe("the shop's time zone and the database's zone data", () => {
  it("refuses a zone the database does not know, with a 400 naming the field, and stores nothing", async () => {
    const shop = await createTestShop("ZoneGuard")
    const admin = await signedIn(shop.admin)
    for (const zone of INTL_ONLY_ZONES) {
      // the premise: Intl accepts it, so the schema alone would have let it through
      expect(() => new Intl.DateTimeFormat("en-US", { timeZone: zone })).not.toThrow()
      const res = await admin.patch("/api/shop/settings", { units: "metric", timeZone: zone })
      expect(res.status, zone).toBe(400)
      expect(res.body.error.code).toBe("validation_failed")
      expect(res.body.error.fields.timeZone).toContain("not a time zone the database knows")
    }
    // nothing half-stored: neither the zone nor the units sent with it
    const after = await admin.get("/api/shop/settings")
    expect(after.body.settings.timeZone).toBe("America/Chicago")
    expect(after.body.settings.units).toBe("imperial")
  })

  it("stores a zone the database knows in the database's spelling", async () => {
    const shop = await createTestShop("ZoneSpelling")
    const admin = await signedIn(shop.admin)
    const res = await admin.patch("/api/shop/settings", { timeZone: "america/regina" })
    expect(res.status).toBe(200)
    expect(res.body.settings.timeZone).toBe("America/Regina")
  })

  it("counts weeks in UTC, naming the shop's zone, when an unknown zone is already stored: never a 500", async () => {
    const shop = await createTestShop("ZoneFallback")
    // Stored before the guard existed (or the database's zone data is older than the browser's).
    await testDb()
      .updateTable("shop")
      .set({ settings: JSON.stringify({ timeZone: "US/Pacific-New" }) })
      .where("id", "=", shop.shopId)
      .execute()
    // A drive finished on a Monday at 02:00 UTC: Sunday evening on the US west coast, Monday in UTC.
    const now = new Date()
    const daysBack = 7 + ((now.getUTCDay() + 6) % 7)
    const monday = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() - daysBack)
    await insertScoredDrive(shop, { pattern: "met", seed: 521, finishedAt: new Date(monday + 2 * 3_600_000) })

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/numbers?days=30")
    expect(res.status).toBe(200)
    expect(res.body.weekTimeZone).toBe("UTC")
    expect(res.body.timeZoneNote).toContain("US/Pacific-New")
    // UTC weeks: the drive is in the week that starts on that Monday
    expect(res.body.verdictMix).toEqual([
      { weekStart: new Date(monday).toISOString().slice(0, 10), total: 1, met: 1, short: 0, not_met: 0, unverified: 0 },
    ])

    const page = await lead.get("/numbers?days=30")
    expect(page.status).toBe(200)
    expect(page.text).toContain("Weeks are counted in UTC")
    expect(page.text).toContain("US/Pacific-New")
    // The CSV's times fall back the same way (PostgreSQL writes them): UTC, each with its offset, +00:00.
    const csv = await lead.get("/api/numbers?format=csv&days=30")
    expect(csv.status).toBe(200)
    const rows = await listDrivesForNumbers(testDb(), shop.shopId, new Date(Date.now() - 30 * 86_400_000))
    expect(csv.text).toBe(numbersToCsv(rows.map(numbersDriveFromRow), "UTC"))
    expect(csv.text).toContain(`,${new Date(monday).toISOString().slice(0, 10)}T02:00:00+00:00,`)

    // a shop with a zone the database knows says nothing about it
    const known = await createTestShop("ZoneKnown")
    const ok = await (await signedIn(known.lead)).get("/api/numbers?days=30")
    expect(ok.body.weekTimeZone).toBe("America/Chicago")
    expect(ok.body.timeZoneNote).toBeNull()
  })
})
