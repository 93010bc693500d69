// Road knowledge from the shop's own drives (issue 14): drives imported through the API are scored and
// added to the road model; the ranking of loops follows the history, hour by hour; other shops see nothing.
import { PDFParse } from "pdf-parse"
import { beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"
import { generateRoadDrive, type RoadLayout } from "@/lib/tracks/roads"

const HOME = { lat: 43.8731, lon: -91.9187 }
const STEADY: RoadLayout = { key: "steady", name: "Test Parkway", kind: "steady", headingDeg: 35, lengthM: 6500 }
const ARTERIAL: RoadLayout = {
  key: "arterial",
  name: "Test Avenue",
  kind: "stop-and-go",
  headingDeg: 255,
  lengthM: 5500,
}
const WINDING: RoadLayout = { key: "winding", name: "Test Bend Road", kind: "winding", headingDeg: 160, lengthM: 6000 }

// Weekdays of 2-6 November 2026; America/Chicago is UTC-6 then (IANA tz database), so 10:00 local = 16:00 UTC.
const at = (day: number, localHour: number, minute: number) => Date.UTC(2026, 10, 2 + day, localHour + 6, minute)

let shop: TestShop
let lead: ApiClient
let tech: ApiClient
const layoutOfDrive = new Map<string, string>()

async function importRoadDrive(layout: RoadLayout, seed: number, startMs: number, traffic: number) {
  // steady 50 mph on the parkway; the avenue stops at signals; traffic slows the road at rush hour
  const file = generateRoadDrive({ layout, seed, startMs, home: HOME, traffic, hz: 0.5 })
  const res = await tech.post("/api/drives/import", file)
  expect(res.status).toBe(201)
  layoutOfDrive.set(res.body.drive.id, layout.key)
  return res.body
}

async function loopLayouts(client: ApiClient, loopId: string) {
  const res = await client.get(`/api/roads/loops/${loopId}`)
  expect(res.status).toBe(200)
  return new Set(res.body.loop.drives.map((d: { driveId: string }) => layoutOfDrive.get(d.driveId)))
}

beforeAll(async () => {
  shop = await createTestShop("Roads")
  const admin = await signedIn(shop.admin)
  expect((await admin.patch("/api/shop/settings", { location: HOME, timeZone: "America/Chicago" })).status).toBe(200)
  lead = await signedIn(shop.lead)
  tech = await signedIn(shop.tech)
  let seed = 1400
  for (let day = 0; day < 5; day++) {
    // 10:00: free-flowing parkway, the avenue as usual
    await importRoadDrive(STEADY, seed++, at(day, 10, 5), 0)
    await importRoadDrive(ARTERIAL, seed++, at(day, 10, 40), 0.15)
    // 17:00: the parkway is jammed, the bend road is not
    await importRoadDrive(STEADY, seed++, at(day, 17, 0), 0.6)
    await importRoadDrive(WINDING, seed++, at(day, 17, 30), 0.05)
  }
}, 240_000)

describe("road knowledge", () => {
  it("ranks the steady road first at 10:00 for qualifying share and median time to learn complete", async () => {
    const res = await lead.get("/api/roads?hour=10&day=all")
    expect(res.status).toBe(200)
    expect(res.body.enabled).toBe(true)
    expect(res.body.location).toMatchObject({ ...HOME, source: "settings" })
    expect(res.body.drives).toBe(20)
    const loops = res.body.loops
    expect(loops.length).toBeGreaterThanOrEqual(2)
    expect(await loopLayouts(lead, loops[0].loopId)).toEqual(new Set(["steady"]))
    expect(await loopLayouts(lead, loops[1].loopId)).toEqual(new Set(["arterial"]))
    expect(loops[0].medianClearSeconds).toBeLessThan(loops[1].medianClearSeconds)
    expect(loops[0].qualifyingShare).toBeGreaterThan(loops[1].qualifyingShare)
    expect(loops[0].drives).toBe(5)
    expect(loops[0].trusted).toBe(true)
    expect(loops[0].track.length).toBeGreaterThan(10)
  })

  it("ranks another road first at 17:00, when the history says the steady road is slow then", async () => {
    const res = await lead.get("/api/roads?hour=17&day=all")
    const loops = res.body.loops
    expect(loops.length).toBeGreaterThanOrEqual(1)
    expect(await loopLayouts(lead, loops[0].loopId)).toEqual(new Set(["winding"]))
    const ten = await lead.get("/api/roads?hour=10&day=all")
    expect(loops[0].loopId).not.toBe(ten.body.loops[0].loopId)
    // the steady road's loop, when it completed at all at 17:00, took longer than at 10:00 and ranks lower
    const steadyAt17 = loops.find((l: { loopId: string }) => l.loopId === ten.body.loops[0].loopId)
    if (steadyAt17) expect(steadyAt17.medianClearSeconds).toBeGreaterThan(ten.body.loops[0].medianClearSeconds)
  })

  it("keeps cell figures that reflect the roads: the steady road's cells qualify more than the avenue's", async () => {
    const res = await lead.get("/api/roads?hour=10&day=all")
    const cells: { cell: string; qualifyingShare: number; minutes: number; medianSpeedMph: number }[] = res.body.cells
    expect(cells.length).toBeGreaterThan(20)
    const routes = await testDb()
      .selectFrom("road_drive")
      .innerJoin("drive", "drive.id", "road_drive.drive_id")
      .select(["drive.public_id as drive_id", "road_drive.route"])
      .where("road_drive.shop_id", "=", shop.shopId)
      .execute()
    const cellsOf = (key: string) =>
      new Set(routes.filter((r) => layoutOfDrive.get(r.drive_id) === key).flatMap((r) => r.route))
    const steadyCells = cellsOf("steady")
    const arterialCells = cellsOf("arterial")
    const meanShare = (set: Set<string>) => {
      const own = cells.filter((c) => set.has(c.cell) && c.minutes > 0.5)
      return own.reduce((s, c) => s + c.qualifyingShare * c.minutes, 0) / own.reduce((s, c) => s + c.minutes, 0)
    }
    expect(meanShare(steadyCells)).toBeGreaterThan(meanShare(arterialCells) + 0.2)
  })

  it("gives the recorder one line for now", async () => {
    const res = await tech.get("/api/roads/now")
    expect(res.status).toBe(200)
    expect(res.body.enabled).toBe(true)
    // "now" is whatever hour the test runs; the line is a loop or null, never an error
    if (res.body.line)
      expect(res.body.line).toMatchObject({
        drives: expect.any(Number),
        medianClearMinutes: expect.any(Number),
        medianClearSeconds: expect.any(Number),
      })
  })

  it("shows another shop nothing of this shop's model", async () => {
    const other = await createTestShop("Roads other")
    const otherLead = await signedIn(other.lead)
    const mine = await lead.get("/api/roads?hour=all&day=all")
    const theirs = await otherLead.get("/api/roads?hour=all&day=all")
    expect(theirs.status).toBe(200)
    expect(theirs.body).toMatchObject({ drives: 0, loops: [], cells: [], location: null })
    const loopId = mine.body.loops[0].loopId
    const res = await otherLead.get(`/api/roads/loops/${loopId}`)
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe("not_found")
  })

  it("refuses a co-driver and a bad hour with the error shape", async () => {
    const codriver = await signedIn(shop.codriver)
    expect((await codriver.get("/api/roads")).status).toBe(403)
    const bad = await lead.get("/api/roads?hour=25")
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.hour).toBeTruthy()
    expect((await lead.get("/api/roads/loops/not-a-uuid")).status).toBe(404)
  })

  it("turns off on the shop's say-so and removes the model", async () => {
    const own = await createTestShop("Roads off")
    const admin = await signedIn(own.admin)
    const ownTech = await signedIn(own.tech)
    const file = generateRoadDrive({ layout: STEADY, seed: 77, startMs: at(0, 10, 0), home: HOME, hz: 0.5 })
    expect((await ownTech.post("/api/drives/import", file)).status).toBe(201)
    const count = () =>
      testDb()
        .selectFrom("road_cell_stat")
        .select((e) => e.fn.countAll<number>().as("n"))
        .where("shop_id", "=", own.shopId)
        .executeTakeFirstOrThrow()
    expect(Number((await count()).n)).toBeGreaterThan(0)
    expect((await admin.patch("/api/shop/settings", { roadKnowledge: false })).body.settings.roadKnowledge).toBe(false)
    expect(Number((await count()).n)).toBe(0)
    expect(
      await testDb().selectFrom("road_drive").select("drive_id").where("shop_id", "=", own.shopId).execute(),
    ).toEqual([])
    expect((await ownTech.post("/api/drives/import", file)).status).toBe(201)
    expect(Number((await count()).n)).toBe(0)
    expect((await ownTech.get("/api/roads")).body).toMatchObject({ enabled: false, loops: [], cells: [] })
    expect((await ownTech.get("/api/roads/now")).body).toEqual({ enabled: false, line: null })
    expect((await ownTech.patch("/api/shop/settings", { roadKnowledge: true })).status).toBe(403)
  })

  it("never shows road knowledge on a drive's share page or its PDF", async () => {
    const [driveId] = [...layoutOfDrive.entries()].find(([, key]) => key === "steady")!
    const road = await testDb()
      .selectFrom("road_drive")
      .select(["loop_id", "route"])
      .where("drive_id", "=", internalDriveId(shop.shopId, driveId))
      .executeTakeFirstOrThrow()
    await testDb()
      .updateTable("road_loop")
      .set({ name: "Quillfeather Causeway" })
      .where("id", "=", road.loop_id!)
      .execute()
    const made = await lead.post(`/api/drives/${driveId}/share`, { expiresInDays: 1 })
    expect(made.status).toBe(201)
    const page = await new ApiClient().get(`/share/${made.body.token}`)
    expect(page.status).toBe(200)
    const pdfRes = await fetch(`${testEnv().baseUrl}/share/${made.body.token}/record`)
    expect(pdfRes.status).toBe(200)
    const parser = new PDFParse({ data: Buffer.from(await pdfRes.arrayBuffer()) })
    const pdf = (await parser.getText()).text
    await parser.destroy()
    for (const text of [page.text, pdf]) {
      expect(text).not.toContain("Quillfeather Causeway")
      expect(text).not.toMatch(/good roads|road knowledge|best loop/i)
      expect(text).not.toContain(road.route[0]!)
    }
  })

  it("ranks by weekday where the history holds enough, and says when it fell back to the kind of day or the hour alone", async () => {
    // Saturday 7 November 2026, 13:00 local: six drives on the bend road (the only drives near 13:00)
    for (let k = 0; k < 6; k++) await importRoadDrive(WINDING, 1500 + k, at(5, 13, k * 8), 0.05)
    const sat = await lead.get("/api/roads?hour=13&day=saturday")
    expect(sat.status).toBe(200)
    expect(sat.body).toMatchObject({ weekday: 6, dayKind: null, fellBackFromWeekday: null })
    expect(await loopLayouts(lead, sat.body.loops[0].loopId)).toEqual(new Set(["winding"]))
    expect(sat.body.loops[0].drives).toBeGreaterThanOrEqual(5)
    // Sunday has none: the weekend's drives carry it
    const sun = await lead.get("/api/roads?hour=13&day=sunday")
    expect(sun.body).toMatchObject({ weekday: null, dayKind: "weekend", fellBackFromWeekday: 0 })
    expect(sun.body.loops[0].loopId).toBe(sat.body.loops[0].loopId)
    // Tuesday: no weekday drive near 13:00 either, so the hour alone (any day)
    const tue = await lead.get("/api/roads?hour=13&day=tuesday")
    expect(tue.body).toMatchObject({ weekday: null, dayKind: null, fellBackFromWeekday: 2 })
    expect(tue.body.loops[0].loopId).toBe(sat.body.loops[0].loopId)
    const page = await lead.get("/roads?hour=13&day=tuesday")
    expect(page.status).toBe(200)
    const words = page.text.replaceAll("<!-- -->", "")
    expect(words).toContain("Too few learns on Tuesdays at this hour")
    expect(words).toContain("hour of day only")
    // 10:00 on a Tuesday: one drive a road, so the weekdays' five carry the ranking, steady road first
    const tue10 = await lead.get("/api/roads?hour=10&day=tuesday")
    expect(tue10.body).toMatchObject({ weekday: null, dayKind: "weekday", fellBackFromWeekday: 2 })
    expect(await loopLayouts(lead, tue10.body.loops[0].loopId)).toEqual(new Set(["steady"]))
    expect((await lead.get("/api/roads?day=someday")).status).toBe(400)
  })

  it("lets the admin set the shop's location and time zone, and the Roads page follows at once", async () => {
    const own = await createTestShop("Roads place")
    const admin = await signedIn(own.admin)
    const ownLead = await signedIn(own.lead)
    const ownTech = await signedIn(own.tech)
    expect(
      (
        await ownTech.post(
          "/api/drives/import",
          generateRoadDrive({ layout: STEADY, seed: 88, startMs: at(0, 10, 0), home: HOME, hz: 0.5 }),
        )
      ).status,
    ).toBe(201)
    const before = await ownLead.get("/api/roads?hour=all&day=all")
    expect(before.body.location.source).toBe("drive starts")
    const place = { lat: 43.9, lon: -91.95 }
    const set = await admin.patch("/api/shop/settings", { location: place, timeZone: "America/Denver" })
    expect(set.status).toBe(200)
    expect(set.body.settings).toMatchObject({ location: place, timeZone: "America/Denver" })
    const after = await ownLead.get("/api/roads?hour=all&day=all")
    expect(after.body).toMatchObject({ location: { ...place, source: "settings" }, timeZone: "America/Denver" })
    const page = await admin.get("/settings")
    expect(page.text).toContain('data-testid="shop-location-form"')
    expect(page.text).toContain('value="43.9"')
    // out of range, not a zone, not a number: 400 with the field named, nothing stored
    for (const body of [
      { location: { lat: 95, lon: 0 } },
      { location: { lat: 43, lon: -200 } },
      { location: { lat: "43.9", lon: 0 } },
      { timeZone: "Mars/Olympus" },
    ]) {
      const bad = await admin.patch("/api/shop/settings", body)
      expect(bad.status).toBe(400)
      expect(bad.body.error.code).toBeTruthy()
    }
    expect((await admin.get("/api/shop/settings")).body.settings).toMatchObject({
      location: place,
      timeZone: "America/Denver",
    })
    // a lead reads it but may not change it (the spec: the admin manages the shop's settings)
    expect((await ownLead.patch("/api/shop/settings", { location: HOME })).status).toBe(403)
    // cleared: the page takes the drive starts again
    expect((await admin.patch("/api/shop/settings", { location: null })).status).toBe(200)
    expect((await ownLead.get("/api/roads?hour=all&day=all")).body.location.source).toBe("drive starts")
  })
})
