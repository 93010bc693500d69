import { describe, expect, it } from "vitest"
import { isAppOrigin } from "@/lib/http/app-origin"

// Origins are compared as RFC 6454 serializes them (scheme, host, port); "localhost" and 127.0.0.1 name the same
// machine (RFC 6761 section 6.3), so an app served on one is the same app on the other.
describe("the app's own origin", () => {
  it("is APP_URL's origin, whatever its path", () => {
    expect(isAppOrigin("https://shop.example.test", "https://shop.example.test/")).toBe(true)
    expect(isAppOrigin("https://shop.example.test", "https://shop.example.test:443/app")).toBe(true)
  })

  it("is any loopback name of a loopback APP_URL on the same scheme and port", () => {
    for (const origin of ["http://localhost:3000", "http://127.0.0.1:3000", "http://[::1]:3000"]) {
      expect(isAppOrigin(origin, "http://127.0.0.1:3000"), origin).toBe(true)
      expect(isAppOrigin(origin, "http://localhost:3000"), origin).toBe(true)
    }
  })

  it("is not another port, another scheme, another host, or a loopback name of a public APP_URL", () => {
    expect(isAppOrigin("http://localhost:3001", "http://127.0.0.1:3000")).toBe(false)
    expect(isAppOrigin("https://localhost:3000", "http://127.0.0.1:3000")).toBe(false)
    expect(isAppOrigin("http://127.0.0.2:3000", "http://127.0.0.1:3000")).toBe(false)
    expect(isAppOrigin("http://localhost.elsewhere.invalid:3000", "http://127.0.0.1:3000")).toBe(false)
    expect(isAppOrigin("http://localhost", "https://shop.example.test")).toBe(false)
    expect(isAppOrigin("https://shop.example.test.invalid", "https://shop.example.test")).toBe(false)
  })

  it("is never an origin that is not a URL (a sandboxed frame sends the text null)", () => {
    expect(isAppOrigin("null", "http://127.0.0.1:3000")).toBe(false)
    expect(isAppOrigin("", "http://127.0.0.1:3000")).toBe(false)
  })
})
