import { describe, expect, it } from "vitest"
import { contentSecurityPolicy, originOf } from "@/lib/http/security-headers"

const directive = (csp: string, name: string) => csp.split("; ").find((d) => d.startsWith(`${name} `))

describe("the content security policy", () => {
  it("lets the browser PUT photos to the object store's origin and nowhere else", () => {
    const csp = contentSecurityPolicy("bm9uY2U=", {
      https: false,
      dev: false,
      uploadOrigin: originOf("http://127.0.0.1:4569/"),
    })
    expect(directive(csp, "connect-src")).toBe("connect-src 'self' http://127.0.0.1:4569")
    expect(directive(csp, "script-src")).toBe("script-src 'self' 'nonce-bm9uY2U=' 'strict-dynamic'")
    expect(directive(csp, "frame-ancestors")).toBe("frame-ancestors 'none'")
  })

  it("keeps connect-src to its own origin without an object store, or with an address that is not a URL", () => {
    expect(directive(contentSecurityPolicy("x", { https: false, dev: false }), "connect-src")).toBe(
      "connect-src 'self'",
    )
    expect(originOf("not a url")).toBeNull()
    expect(originOf(undefined)).toBeNull()
  })
})
