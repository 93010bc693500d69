import { describe, expect, it } from "vitest"
import { createTestShop, testDb } from "../../helpers/db"
import { signedIn } from "../../helpers/http"

describe("GET /api/people", () => {
  it("lists the shop's active co-drivers for a technician, and no one from another shop", async () => {
    const shop = await createTestShop()
    const other = await createTestShop("Other")
    const tech = await signedIn(shop.tech)
    const res = await tech.get("/api/people?role=co_driver")
    expect(res.status).toBe(200)
    expect(res.body.people).toEqual([{ id: shop.codriver.id, name: shop.codriver.name, role: "co_driver" }])
    expect(JSON.stringify(res.body)).not.toContain(other.codriver.id)
  })

  it("leaves out disabled people", async () => {
    const shop = await createTestShop()
    await testDb().updateTable("app_user").set({ disabled: true }).where("id", "=", shop.codriver.id).execute()
    const res = await (await signedIn(shop.lead)).get("/api/people?role=co_driver")
    expect(res.body.people).toEqual([])
  })

  it("is not for co-drivers, and refuses an unknown role with 400", async () => {
    const shop = await createTestShop()
    expect((await (await signedIn(shop.codriver)).get("/api/people")).status).toBe(403)
    const bad = await (await signedIn(shop.tech)).get("/api/people?role=pilot")
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.role).toBeTruthy()
  })
})
