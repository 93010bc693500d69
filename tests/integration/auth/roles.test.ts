import { describe, expect, it } from "vitest"
import { createTestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"

describe("role guard on /api/review", () => {
  it("answers 401 without a session", async () => {
    const res = await new ApiClient().get("/api/review")
    expect(res.status).toBe(401)
    expect(res.body.error.code).toBe("not_signed_in")
  })

  it.each([
    ["technician", "tech", 403],
    ["co_driver", "codriver", 403],
    ["shop_lead", "lead", 200],
    ["admin", "admin", 200],
  ] as const)("gives a %s (%s) a %i", async (_role, key, status) => {
    const shop = await createTestShop()
    const res = await (await signedIn(shop[key])).get("/api/review")
    expect(res.status).toBe(status)
    if (status === 200) expect(res.body).toEqual({ drives: [], nextCursor: null })
    else expect(res.body.error.code).toBe("forbidden")
  })
})

describe("admin user management", () => {
  it("adds a person to the admin's own shop, who can then sign in", async () => {
    const shop = await createTestShop()
    const admin = await signedIn(shop.admin)
    const email = `new-${shop.shopId}@test.invalid`
    const res = await admin.post("/api/users", {
      email,
      name: "New Person",
      role: "co_driver",
      password: "a-long-first-password",
    })
    expect(res.status).toBe(201)
    expect(res.body.user).toMatchObject({ email, role: "co_driver", shopId: shop.shopId, disabled: false })
    const me = await (await signedIn({ email, password: "a-long-first-password" })).get("/api/session")
    expect(me.body.user.shopId).toBe(shop.shopId)
  })

  it("refuses a duplicate e-mail with 409 and a short password with 400", async () => {
    const shop = await createTestShop()
    const admin = await signedIn(shop.admin)
    const dup = await admin.post("/api/users", {
      email: shop.tech.email,
      name: "Dup",
      role: "technician",
      password: "a-long-first-password",
    })
    expect(dup.status).toBe(409)
    const short = await admin.post("/api/users", {
      email: `s-${shop.shopId}@test.invalid`,
      name: "S",
      role: "technician",
      password: "short",
    })
    expect(short.status).toBe(400)
    expect(short.body.error.fields.password).toBeTruthy()
  })

  it("lets only admins manage people", async () => {
    const shop = await createTestShop()
    const lead = await signedIn(shop.lead)
    expect((await lead.get("/api/users")).status).toBe(403)
    expect((await lead.patch(`/api/users/${shop.tech.id}`, { role: "admin" })).status).toBe(403)
  })

  it("answers 404 for a person of another shop, and changes nothing", async () => {
    const mine = await createTestShop()
    const theirs = await createTestShop("Other")
    const admin = await signedIn(mine.admin)
    const res = await admin.patch(`/api/users/${theirs.tech.id}`, { disabled: true })
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe("not_found")
    expect((await signedIn(theirs.tech)).cookie).toBeTruthy()
    const list = await admin.get("/api/users")
    expect(list.body.users.map((u: { id: string }) => u.id)).not.toContain(theirs.tech.id)
  })
})
