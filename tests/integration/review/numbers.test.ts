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
    const reasons = Object.fromEntries(res.body.topReasons.map((r: { key: string; drives: number }) => [r.key, r.drives]))
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
    // Minutes to clear in the CSV match the stored score.
    expect(csv.text).toContain(`,met,${(met.score.clearedAtSeconds! / 60).toFixed(1)},`)
  })

  it("is for leads, and refuses a bad period", async () => {
    const shop = await createTestShop("NumbersRoles")
    expect((await (await signedIn(shop.tech)).get("/api/numbers")).status).toBe(403)
    const bad = await (await signedIn(shop.lead)).get("/api/numbers?days=abc")
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.days).toBeDefined()
  })
})
