import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { formatDuration } from "@/lib/format"
import { createTestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { insertJob, insertScoredDrive, waitForMail } from "./fixtures"
import { pdfText } from "../../helpers/pdf"

describe("GET /api/drives/:id/record", () => {
  it("is a PDF whose text holds the VIN, the verdict and the qualifying minutes", async () => {
    const shop = await createTestShop("Record")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 301, job })
    const res = await (await signedIn(shop.tech)).getBytes(`/api/drives/${drive.id}/record`)
    expect(res.status).toBe(200)
    expect(res.headers.get("content-type")).toBe("application/pdf")
    expect(Buffer.from(res.bytes.subarray(0, 5)).toString()).toBe("%PDF-")
    const text = await pdfText(res.bytes)
    expect(text).toContain(job.vin)
    expect(text).toContain("Short")
    expect(text).toContain(`${formatDuration(drive.score.qualifyingSecondsBeforeClear)} (10 min needed)`)
    expect(text).toContain(job.roNumber)
  })

  it("writes times in the shop's time zone, named, and numbers in the shop's units, with the speed chart", async () => {
    const shop = await createTestShop("RecordZone")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 305 })
    const admin = await signedIn(shop.admin)
    const set = await admin.patch("/api/shop/settings", { units: "metric", timeZone: "Pacific/Auckland" })
    expect(set.status).toBe(200)
    expect(set.body.settings.timeZone).toBe("Pacific/Auckland")
    expect((await admin.patch("/api/shop/settings", { timeZone: "Mars/Olympus" })).status).toBe(400)
    const text = await pdfText((await (await signedIn(shop.tech)).getBytes(`/api/drives/${drive.id}/record`)).bytes)
    // IANA tz database: Pacific/Auckland is UTC+13 (NZDT) in the southern summer, UTC+12 (NZST) in winter.
    const started = new Date(drive.score.startedAtMs ?? Date.now())
    const zoneShort = new Intl.DateTimeFormat("en-US", { timeZone: "Pacific/Auckland", timeZoneName: "short" })
      .formatToParts(started)
      .find((p) => p.type === "timeZoneName")!.value
    expect(text).toContain(`Pacific/Auckland (${zoneShort})`)
    expect(text).not.toMatch(/\d UTC/)
    expect(text).toContain("km/h")
    expect(text).not.toMatch(/\d mph/)
    expect(text).toContain("Speed over time")
    expect(text).toContain("Speed (km/h)")
  })

  it("is a 404 for another shop's drive and for a co-driver the drive does not name", async () => {
    const shop = await createTestShop("RecordMine")
    const other = await createTestShop("RecordTheirs")
    const theirs = await insertScoredDrive(other, { pattern: "short", seed: 302 })
    expect((await (await signedIn(shop.lead)).getBytes(`/api/drives/${theirs.id}/record`)).status).toBe(404)
    const notNamed = await insertScoredDrive(shop, { pattern: "short", seed: 303, coDriverId: null })
    expect((await (await signedIn(shop.codriver)).getBytes(`/api/drives/${notNamed.id}/record`)).status).toBe(404)
    expect((await new ApiClient().getBytes(`/api/drives/${notNamed.id}/record`)).status).toBe(401)
  })
})

describe("POST /api/drives/:id/record/email", () => {
  it("sends the record to the mail fake with the PDF attached (202)", async () => {
    const shop = await createTestShop("RecordMail")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "met", seed: 304, job })
    const to = `customer-${randomUUID().slice(0, 8)}@customer.invalid`
    const res = await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/record/email`, { to })
    expect(res.status).toBe(202)
    const mail = await waitForMail(await signedIn(shop.admin), to)
    expect(mail).toBeDefined()
    expect(mail!.subject).toContain(job.roNumber)
    expect(mail!.attachments).toHaveLength(1)
    expect(mail!.attachments[0]!.contentType).toBe("application/pdf")
    expect(mail!.attachments[0]!.filename).toMatch(/\.pdf$/)
    expect(mail!.attachments[0]!.size).toBeGreaterThan(1000)
  })

  it("refuses a bad address (400) and technicians (403)", async () => {
    const shop = await createTestShop("RecordMailBad")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 305 })
    const bad = await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/record/email`, { to: "not an address" })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.to).toBeDefined()
    const tech = await (await signedIn(shop.tech)).post(`/api/drives/${drive.id}/record/email`, { to: "a@b.invalid" })
    expect(tech.status).toBe(403)
  })
})

describe("GET /api/dev/mail", () => {
  it("is for admins only", async () => {
    const shop = await createTestShop("DevMail")
    expect((await (await signedIn(shop.lead)).get("/api/dev/mail")).status).toBe(403)
    expect((await new ApiClient().get("/api/dev/mail")).status).toBe(401)
    const admin = await (await signedIn(shop.admin)).get("/api/dev/mail")
    expect(admin.status).toBe(200)
    expect(Array.isArray(admin.body.messages)).toBe(true)
  })
})
