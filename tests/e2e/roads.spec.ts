import { seedRoadHistory } from "@/db/seed-roads"
import { localSlot } from "@/lib/roads/clock"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { expect, signInPage, test, type Page } from "./fixtures"
let shop: TestShop

test.beforeAll(async () => {
  test.setTimeout(180_000) // seeds 45 drives of road history
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
})

async function expectRoadsPage(page: Page) {
  await page.goto("/roads?day=all")
  await page.getByTestId("road-map").waitFor()
  expect(await page.locator('[data-testid="road-cells"] polygon').count()).toBeGreaterThan(30)
  expect(await page.locator('[data-testid="road-loop-tracks"] polyline').count()).toBeGreaterThanOrEqual(1)
  expect(await page.getByTestId("road-scale").textContent()).toMatch(/mi/)
  await expect(page.getByTestId("road-legend")).toContainText("Mostly qualifying")
  const loops = page.getByTestId("best-loop")
  expect(await loops.count()).toBeGreaterThanOrEqual(1)
  // lib/format formatDuration's one style: "15 min", "15 min 4 s", "48 s", "1 h 2 min"
  expect(await loops.first().textContent()).toMatch(
    /Learn complete in a median \d+ (h|min|s)( \d+ (min|s))* \(fastest \d+ (h|min|s)( \d+ (min|s))*\)/,
  )
  expect(await page.getByTestId("roads-explained").textContent()).toMatch(/rest on \d+ scored drives/)
}

test.describe("the Roads page and the start screen line", () => {
  test("draws the cells and the best loops for a lead on a phone (390x844)", async ({ phone }) => {
    const context = await phone()
    const page = await context.newPage()
    await signInPage(page, shop.lead)
    await expectRoadsPage(page)
    // nothing wider than the phone
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
  })

  test("draws the cells and the best loops for a lead at desktop width", async ({ desk }) => {
    const page = await (await desk()).newPage()
    await signInPage(page, shop.lead)
    await expectRoadsPage(page)
    expect(await page.getByRole("link", { name: "Roads" }).count()).toBeGreaterThanOrEqual(1)
  })

  test("shows the technician the good-roads-now line on the start screen", async ({ phone }) => {
    const context = await phone()
    const page = await context.newPage()
    await signInPage(page, shop.tech)
    await page.goto("/record")
    const line = page.getByTestId("good-roads-now")
    await line.waitFor({ timeout: 30_000 })
    expect(await line.textContent()).toMatch(
      /Good roads now: .+ learn complete in a median \d+ (h|min|s)( \d+ (min|s))*, from \d+ drives? at this hour/,
    )
  })
})
