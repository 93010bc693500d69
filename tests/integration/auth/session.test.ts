import { describe, expect, it } from "vitest"
import { MAX_FAILURES_PER_ADDRESS, MAX_FAILURES_PER_EMAIL } from "@/lib/auth/throttle"
import { createTestShop, testDb } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"

describe("POST /api/session", () => {
  it("answers a wrong password and an unknown e-mail with the same 401 message", async () => {
    const shop = await createTestShop()
    const client = new ApiClient()
    const wrongPassword = await client.post("/api/session", { email: shop.tech.email, password: "not-the-password" })
    const unknownEmail = await client.post("/api/session", {
      email: `nobody-${shop.shopId}@test.invalid`,
      password: shop.tech.password,
    })
    expect(wrongPassword.status).toBe(401)
    expect(unknownEmail.status).toBe(401)
    expect(wrongPassword.body.error.code).toBe("not_signed_in")
    expect(unknownEmail.body.error.message).toBe(wrongPassword.body.error.message)
    expect(client.cookie).toBeNull()
  })

  it("signs in, sets an HttpOnly SameSite=Lax cookie and reports the user", async () => {
    const shop = await createTestShop()
    const client = new ApiClient()
    const res = await client.post("/api/session", {
      email: shop.lead.email.toUpperCase(),
      password: shop.lead.password,
    })
    expect(res.status).toBe(200)
    const cookie = res.headers.get("set-cookie") ?? ""
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(res.body.user).toEqual({
      id: shop.lead.id,
      email: shop.lead.email,
      name: shop.lead.name,
      role: "shop_lead",
      shopId: shop.shopId,
    })
    const me = await client.get("/api/session")
    expect(me.status).toBe(200)
    expect(me.body.user.id).toBe(shop.lead.id)
  })

  it(`throttles an e-mail after ${MAX_FAILURES_PER_EMAIL} failures with 429 and Retry-After, even with the right password`, async () => {
    const shop = await createTestShop()
    for (let i = 0; i < MAX_FAILURES_PER_EMAIL; i++) {
      // each attempt from a different address: the limit is per e-mail
      const res = await new ApiClient().post("/api/session", { email: shop.tech.email, password: `wrong-${i}` })
      expect(res.status).toBe(401)
    }
    const blocked = await new ApiClient().post("/api/session", { email: shop.tech.email, password: shop.tech.password })
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.code).toBe("too_many_attempts")
    expect(Number(blocked.headers.get("retry-after"))).toBeGreaterThan(0)
    // another account from another address is not affected
    expect(
      (await new ApiClient().post("/api/session", { email: shop.lead.email, password: shop.lead.password })).status,
    ).toBe(200)
  })

  it(`throttles a client address after ${MAX_FAILURES_PER_ADDRESS} failures across e-mails`, async () => {
    const shop = await createTestShop()
    const client = new ApiClient()
    for (let i = 0; i < MAX_FAILURES_PER_ADDRESS; i++) {
      const res = await client.post("/api/session", {
        email: `guess-${i}-${shop.shopId}@test.invalid`,
        password: "guess",
      })
      expect(res.status).toBe(401)
    }
    const blocked = await client.post("/api/session", { email: shop.lead.email, password: shop.lead.password })
    expect(blocked.status).toBe(429)
    expect(blocked.headers.get("retry-after")).toBeTruthy()
  })

  it("answers malformed JSON with 400 and the error shape", async () => {
    const res = await new ApiClient().request("POST", "/api/session", undefined, {
      raw: "{not json",
      headers: { "content-type": "application/json" },
    })
    expect(res.status).toBe(400)
    expect(res.body).toEqual({ error: { code: "invalid_request", message: expect.any(String) } })
  })

  it("answers a body of the wrong shape with 400 naming the field", async () => {
    const res = await new ApiClient().post("/api/session", { email: "not-an-email", password: "" })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe("validation_failed")
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(["email", "password"]))
  })

  it("refuses a write whose Origin is another site", async () => {
    const shop = await createTestShop()
    const res = await new ApiClient().request("POST", "/api/session", undefined, {
      raw: JSON.stringify({ email: shop.tech.email, password: shop.tech.password }),
      headers: { "content-type": "application/json", origin: "https://elsewhere.invalid" },
    })
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe("forbidden")
  })

  it("signs in from the server's other loopback name (localhost for 127.0.0.1), and no other port", async () => {
    const shop = await createTestShop()
    // The suites' server runs with APP_URL at its own 127.0.0.1 address (scripts/lib/stack.mjs).
    const app = new URL(testEnv().baseUrl)
    expect(app.hostname).toBe("127.0.0.1")
    const from = async (origin: string) =>
      new ApiClient().request("POST", "/api/session", undefined, {
        raw: JSON.stringify({ email: shop.tech.email, password: shop.tech.password }),
        headers: { "content-type": "application/json", origin },
      })
    expect((await from(`http://localhost:${app.port}`)).status).toBe(200)
    const otherPort = await from(`http://localhost:${Number(app.port) + 1}`)
    expect(otherPort.status).toBe(403)
    expect(otherPort.body.error.code).toBe("forbidden")
  })
})

describe("DELETE /api/session", () => {
  it("ends the session: the same cookie is refused afterwards", async () => {
    const shop = await createTestShop()
    const client = await signedIn(shop.tech)
    const cookie = client.cookie
    expect((await client.delete("/api/session")).status).toBe(204)
    const replay = new ApiClient()
    replay.cookie = cookie
    const res = await replay.get("/api/session")
    expect(res.status).toBe(401)
    expect(res.body.error.code).toBe("not_signed_in")
  })

  it("needs a session", async () => {
    expect((await new ApiClient().delete("/api/session")).status).toBe(401)
  })
})

describe("stored session ids", () => {
  it("keep only a hash of the cookie's token: the stored id sent as the cookie gets 401", async () => {
    const shop = await createTestShop()
    const client = await signedIn(shop.tech)
    const [name, token] = client.cookie!.split("=") as [string, string]
    const rows = await testDb().selectFrom("user_session").select("id").where("user_id", "=", shop.tech.id).execute()
    expect(rows).toHaveLength(1)
    // FIPS 180-4: SHA-256 digests are 256 bits, written here as 64 hex digits
    expect(rows[0]!.id).toMatch(/^[0-9a-f]{64}$/)
    expect(rows[0]!.id).not.toBe(token)
    const stolen = new ApiClient()
    stolen.cookie = `${name}=${rows[0]!.id}`
    const res = await stolen.get("/api/session")
    expect(res.status).toBe(401)
    expect(res.body.error.code).toBe("not_signed_in")
    expect((await client.get("/api/session")).status).toBe(200)
  })
})

describe("disabled users", () => {
  it("cannot sign in, and a disabled user's open session ends at once", async () => {
    const shop = await createTestShop()
    const techSession = await signedIn(shop.tech)
    const admin = await signedIn(shop.admin)
    const res = await admin.patch(`/api/users/${shop.tech.id}`, { disabled: true })
    expect(res.status).toBe(200)
    expect(res.body.user.disabled).toBe(true)
    expect((await techSession.get("/api/session")).status).toBe(401)
    const again = await new ApiClient().post("/api/session", { email: shop.tech.email, password: shop.tech.password })
    expect(again.status).toBe(401)
  })

  it("is refused even if the flag was set straight in the database", async () => {
    const shop = await createTestShop()
    const session = await signedIn(shop.codriver)
    await testDb().updateTable("app_user").set({ disabled: true }).where("id", "=", shop.codriver.id).execute()
    expect((await session.get("/api/session")).status).toBe(401)
  })
})
