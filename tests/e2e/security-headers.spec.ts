// Issue 15: a content security policy on every page (a fresh nonce each time), no framing, a referrer policy; the
// recorder, the share page and the record PDF still work in Chromium under it, with no policy violation reported.
import { createTestShop, type TestShop } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { insertScoredDrive } from "../integration/review/fixtures"
import { expect, signInPage, test, type Page } from "./fixtures"
let shop: TestShop

test.beforeAll(async () => {
  shop = await createTestShop("E2ECsp")
})

/** Every CSP violation the page reports (securitypolicyviolation events and console messages). */
async function watchViolations(page: Page) {
  const found: string[] = []
  page.on("console", (m) => {
    if (/Content Security Policy/i.test(m.text())) found.push(m.text())
  })
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) =>
      console.error(`Content Security Policy violation: ${e.violatedDirective} ${e.blockedURI}`),
    )
  })
  return found
}

function expectPolicy(headers: Record<string, string>) {
  const csp = headers["content-security-policy"] ?? ""
  expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/)
  expect(csp).toContain("frame-ancestors 'none'")
  expect(csp).toContain("object-src 'none'")
  expect(headers["referrer-policy"]).toBe("strict-origin-when-cross-origin")
  // Served over plain HTTP here: no HSTS (RFC 6797 section 7.2).
  expect(headers["strict-transport-security"]).toBeUndefined()
  return /'nonce-([^']+)'/.exec(csp)![1]!
}

test.describe("the content security policy", () => {
  test("gives every page a fresh nonce and the recorder still runs under it", async ({ phone }) => {
    const context = await phone()
    const page = await context.newPage()
    const violations = await watchViolations(page)
    const signIn = await page.goto("/sign-in")
    const first = expectPolicy(signIn!.headers())
    await signInPage(page, shop.tech)
    const record = await page.goto("/record")
    const second = expectPolicy(record!.headers())
    expect(second).not.toBe(first)
    // The recorder's own scripts run: the form takes input and moves on to the gate.
    await page.getByTestId("vehicle-description").fill("Invented Corvan 2.0, silver")
    await page.getByTestId("to-gate").click()
    await page.getByTestId("gate-codes").waitFor()
    expect(violations).toEqual([])
  })

  test("the share page opens under it and its record PDF downloads", async ({ phone }) => {
    const drive = await insertScoredDrive(shop, { pattern: "short", seed: 733 })
    const lead = await signedIn(shop.lead)
    const share = await lead.post(`/api/drives/${drive.id}/share`, {})
    expect(share.status).toBe(201)
    const url = new URL(share.body.url)
    const context = await phone()
    const page = await context.newPage()
    const violations = await watchViolations(page)
    const res = await page.goto(url.pathname)
    expectPolicy(res!.headers())
    await page.getByTestId("shared-record").waitFor()
    const href = await page.locator(`a[href$="/record"]`).first().getAttribute("href")
    const pdf = await context.request.get(href!)
    expect(pdf.status()).toBe(200)
    expect(pdf.headers()["content-type"]).toBe("application/pdf")
    expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-")
    expect(violations).toEqual([])
  })
})
