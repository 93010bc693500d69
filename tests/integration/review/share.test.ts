import { describe, expect, it } from "vitest"
import { signShareToken } from "@/lib/share"
import { createTestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { insertJob, insertScoredDrive } from "./fixtures"

describe("share links", () => {
  it("lets anyone with the link read the record without signing in, PDF included", async () => {
    const shop = await createTestShop("Share")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "met", seed: 401, job })
    const made = await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/share`, { expiresInDays: 3 })
    expect(made.status).toBe(201)
    expect(made.body.url).toMatch(/\/share\//)
    expect(Date.parse(made.body.expiresAt) - Date.now()).toBeGreaterThan(2.9 * 86_400_000)

    const anonymous = new ApiClient()
    const page = await anonymous.get(`/share/${made.body.token}`)
    expect(page.status).toBe(200)
    expect(page.text).toContain(job.vin)
    expect(page.text).toContain('data-testid="shared-record"')
    const pdf = await anonymous.get(`/share/${made.body.token}/record`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get("content-type")).toBe("application/pdf")
  })

  it("refuses a tampered link with a clear page and no data", async () => {
    const shop = await createTestShop("ShareTamper")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 402, job })
    const { token } = (await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/share`, {})).body
    const [id, exp, sig] = token.split(".")
    const longer = `${id}.${Number(exp) + 86_400 * 365}.${sig}`
    const anonymous = new ApiClient()
    for (const bad of [longer, `${token.slice(0, -2)}xx`, "nonsense"]) {
      const page = await anonymous.get(`/share/${bad}`)
      expect(page.text).toContain("This link is not valid")
      expect(page.text).not.toContain(job.vin)
      expect(page.text).not.toContain(job.roNumber)
      expect((await anonymous.get(`/share/${bad}/record`)).status).toBe(404)
    }
  })

  it("refuses an expired link", async () => {
    const shop = await createTestShop("ShareExpired")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 403, job })
    const secret = process.env.APP_SECRET
    expect(secret, "APP_SECRET reaches the tests as it reaches the app").toBeTruthy()
    const expired = signShareToken(secret!, drive.internalId, Date.now() - 60_000) // tokens name the internal id
    const anonymous = new ApiClient()
    const page = await anonymous.get(`/share/${expired}`)
    expect(page.text).toContain("This link has expired")
    expect(page.text).not.toContain(job.vin)
    const pdf = await anonymous.get(`/share/${expired}/record`)
    expect(pdf.status).toBe(404)
    expect(pdf.body.error.message).toContain("expired")
  })

  it("is made by leads only, for drives of their own shop", async () => {
    const shop = await createTestShop("ShareRoles")
    const other = await createTestShop("ShareOther")
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 404 })
    const theirs = await insertScoredDrive(other, { pattern: "short", seed: 405 })
    expect((await (await signedIn(shop.tech)).post(`/api/drives/${drive.id}/share`, {})).status).toBe(403)
    expect((await (await signedIn(shop.lead)).post(`/api/drives/${theirs.id}/share`, {})).status).toBe(404)
    expect((await (await signedIn(shop.lead)).post(`/api/drives/${drive.id}/share`, { expiresInDays: 0 })).status).toBe(
      400,
    )
  })

  it("withdraws every link made so far: they show a clear page and no data, and a new link works", async () => {
    const shop = await createTestShop("ShareWithdraw")
    const job = await insertJob(shop)
    const drive = await insertScoredDrive(shop, { pattern: "met", seed: 406, job })
    const lead = await signedIn(shop.lead)
    const first = (await lead.post(`/api/drives/${drive.id}/share`, {})).body.token
    const second = (await lead.post(`/api/drives/${drive.id}/share`, { expiresInDays: 30 })).body.token
    expect((await (await signedIn(shop.tech)).delete(`/api/drives/${drive.id}/share`)).status).toBe(403)
    expect((await lead.delete(`/api/drives/${drive.id}/share`)).status).toBe(204)
    const anonymous = new ApiClient()
    for (const token of [first, second]) {
      const page = await anonymous.get(`/share/${token}`)
      expect(page.text).toContain("This link was withdrawn")
      expect(page.text).not.toContain(job.vin)
      expect((await anonymous.get(`/share/${token}/record`)).status).toBe(404)
    }
    const fresh = (await lead.post(`/api/drives/${drive.id}/share`, {})).body.token
    const page = await anonymous.get(`/share/${fresh}`)
    expect(page.status).toBe(200)
    expect(page.text).toContain(job.vin)
    const theirs = await signedIn((await createTestShop("ShareWithdrawOther")).lead)
    expect((await theirs.delete(`/api/drives/${drive.id}/share`)).status).toBe(404)
  })
})
