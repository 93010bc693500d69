import type { Browser, Page } from "playwright-core"
import { afterAll, beforeAll, describe, expect, it } from "vitest"
import { seedRoadHistory } from "@/db/seed-roads"
import { localSlot } from "@/lib/roads/clock"
import { launchBrowser, newPhoneContext, signInPage } from "../helpers/browser"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { testEnv } from "../helpers/env"

let browser: Browser
let shop: TestShop

beforeAll(async () => {
  browser = await launchBrowser()
  shop = await createTestShop("E2ERoads")
  // A history on the three invented roads at the shop's current hour (any weekday), so "now" has loops.
  const zone = "America/Chicago"
  const hour = localSlot(Date.now(), zone).hour
  await testDb()
    .updateTable("shop")
    .set({ settings: JSON.stringify({ units: "imperial", timeZone: zone }) })
    .where("id", "=", shop.shopId)
    .execute()
  const made = await seedRoadHistory(testDb(), shop.shopId, { drives: 45, hours: [hour] })
  expect(made).toBeGreaterThan(20)
}, 180_000)
afterAll(async () => {
  await browser?.close()
})

async function expectRoadsPage(page: Page) {
  await page.goto("/roads?day=all")
  await page.getByTestId("road-map").waitFor()
  expect(await page.locator('[data-testid="road-cells"] polygon').count()).toBeGreaterThan(30)
  expect(await page.locator('[data-testid="road-loop-tracks"] polyline').count()).toBeGreaterThanOrEqual(1)
  expect(await page.getByTestId("road-scale").textContent()).toMatch(/mi/)
  expect(await page.getByTestId("road-legend").textContent()).toContain("Mostly qualifying")
  const loops = page.getByTestId("best-loop")
  expect(await loops.count()).toBeGreaterThanOrEqual(1)
  // lib/format formatDuration's one style: "15 min", "15 min 4 s", "48 s", "1 h 2 min"
  expect(await loops.first().textContent()).toMatch(
    /Learn complete in a median \d+ (h|min|s)( \d+ (min|s))* \(fastest \d+ (h|min|s)( \d+ (min|s))*\)/,
  )
  expect(await page.getByTestId("roads-explained").textContent()).toMatch(/rest on \d+ scored drives/)
}

describe("the Roads page and the start screen line", () => {
  it("draws the cells and the best loops for a lead on a phone (390x844)", async () => {
    const context = await newPhoneContext(browser)
    const page = await context.newPage()
    await signInPage(page, shop.lead.email, shop.lead.password)
    await expectRoadsPage(page)
    // nothing wider than the phone
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    await context.close()
  })

  it("draws the cells and the best loops for a lead at desktop width", async () => {
    const context = await browser.newContext({
      baseURL: testEnv().baseUrl,
      viewport: { width: 1366, height: 900 },
      extraHTTPHeaders: { "x-forwarded-for": "203.0.113.251" },
    })
    const page = await context.newPage()
    await signInPage(page, shop.lead.email, shop.lead.password)
    await expectRoadsPage(page)
    expect(await page.getByRole("link", { name: "Roads" }).count()).toBeGreaterThanOrEqual(1)
    await context.close()
  })

  it("shows the technician the good-roads-now line on the start screen", async () => {
    const context = await newPhoneContext(browser)
    const page = await context.newPage()
    await signInPage(page, shop.tech.email, shop.tech.password)
    await page.goto("/record")
    const line = page.getByTestId("good-roads-now")
    await line.waitFor({ timeout: 30_000 })
    expect(await line.textContent()).toMatch(
      /Good roads now: .+ learn complete in a median \d+ (h|min|s)( \d+ (min|s))*, from \d+ drives? at this hour/,
    )
    await context.close()
  })
})
