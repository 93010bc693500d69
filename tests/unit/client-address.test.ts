// Which X-Forwarded-For entry to believe. MDN "X-Forwarded-For" (Security and privacy concerns / Selecting an IP
// address): with proxies that append, the rightmost entries added by trusted proxies are the reliable ones.
import { describe, expect, it } from "vitest"
import { pickClientAddress, trustedProxyHops } from "@/lib/auth/client-address"

describe("pickClientAddress", () => {
  it("reads nothing when no proxy is trusted (the client wrote the header)", () => {
    expect(pickClientAddress("203.0.113.7", 0)).toBeNull()
    expect(pickClientAddress("198.51.100.1, 203.0.113.7", 0)).toBeNull()
  })

  it("takes the entry the one trusted proxy appended, not what the client put before it", () => {
    expect(pickClientAddress("203.0.113.7", 1)).toBe("203.0.113.7")
    expect(pickClientAddress("1.2.3.4, 203.0.113.7", 1)).toBe("203.0.113.7")
    expect(pickClientAddress("spoofed, also-spoofed, 203.0.113.7", 1)).toBe("203.0.113.7")
  })

  it("counts hops from the right with two trusted proxies", () => {
    expect(pickClientAddress("spoofed, 203.0.113.7, 10.0.0.2", 2)).toBe("203.0.113.7")
    expect(pickClientAddress("203.0.113.7", 2)).toBe("203.0.113.7")
    expect(pickClientAddress("", 1)).toBeNull()
    expect(pickClientAddress(null, 1)).toBeNull()
  })
})

describe("trustedProxyHops", () => {
  it("is none unless configured", () => {
    expect(trustedProxyHops(undefined)).toBe(0)
    expect(trustedProxyHops("")).toBe(0)
    expect(trustedProxyHops("0")).toBe(0)
    expect(trustedProxyHops("false")).toBe(0)
    expect(trustedProxyHops("yes")).toBe(0)
    expect(trustedProxyHops("1")).toBe(1)
    expect(trustedProxyHops("true")).toBe(1)
    expect(trustedProxyHops("2")).toBe(2)
  })
})
