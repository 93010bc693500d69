// Issue 15: client headers are trusted only as far as the configuration says. The test server runs with
// TRUST_PROXY=1 (scripts/lib/stack.mjs), i.e. one proxy in front that appends to X-Forwarded-For.
import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { MAX_FAILURES_PER_ADDRESS } from "@/lib/auth/throttle"
import { createTestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient } from "../../helpers/http"

describe("X-Forwarded-For behind one appending proxy", () => {
  it("throttles by the entry the proxy appended, however the client fills the entries before it", async () => {
    const proxySaw = `203.0.113.${Math.floor(Math.random() * 200) + 1}-${randomUUID().slice(0, 6)}`
    let last = 0
    for (let i = 0; i <= MAX_FAILURES_PER_ADDRESS; i++) {
      // A different e-mail each time: only the per-address limit can stop this.
      const client = new ApiClient(`made-up-${randomUUID()}, ${proxySaw}`)
      const res = await client.post("/api/session", {
        email: `nobody-${randomUUID().slice(0, 8)}@test.invalid`,
        password: "wrong-password-1",
      })
      last = res.status
      if (i < MAX_FAILURES_PER_ADDRESS) expect(res.status).toBe(401)
    }
    expect(last).toBe(429)
  }, 120_000)
})

describe("the Origin check", () => {
  it("compares with the configured public address (APP_URL), not X-Forwarded-Host", async () => {
    const shop = await createTestShop("Origin")
    const body = JSON.stringify({ email: shop.tech.email, password: shop.tech.password })
    const spoofed = await new ApiClient().request("POST", "/api/session", undefined, {
      raw: body,
      headers: {
        "content-type": "application/json",
        origin: "https://elsewhere.invalid",
        "x-forwarded-host": "elsewhere.invalid",
      },
    })
    expect(spoofed.status).toBe(403)
    const own = await new ApiClient().request("POST", "/api/session", undefined, {
      raw: body,
      headers: {
        "content-type": "application/json",
        origin: new URL(testEnv().baseUrl).origin,
        "x-forwarded-host": "elsewhere.invalid",
      },
    })
    expect(own.status).toBe(200)
  })
})

describe("the session cookie", () => {
  it("lives as long as the session (12 h), not 400 days", async () => {
    const shop = await createTestShop("Cookie")
    const res = await new ApiClient().post("/api/session", { email: shop.tech.email, password: shop.tech.password })
    expect(res.status).toBe(200)
    const cookie = res.headers.get("set-cookie")!
    const maxAge = Number(/Max-Age=(\d+)/i.exec(cookie)?.[1])
    expect(maxAge).toBe(12 * 3600)
    const expires = Date.parse(/Expires=([^;]+)/i.exec(cookie)?.[1] ?? "")
    if (!Number.isNaN(expires)) expect(expires - Date.now()).toBeLessThanOrEqual(12 * 3600 * 1000 + 60_000)
  })
})
