import type { Browser } from "playwright-core"
import { afterAll, beforeAll, describe, expect, it } from "vitest"
import { launchBrowser, newPhoneContext, signInPage } from "../helpers/browser"
import { createTestShop, type TestShop } from "../helpers/db"

let browser: Browser
let shop: TestShop

beforeAll(async () => {
  browser = await launchBrowser()
  shop = await createTestShop("E2E")
})
afterAll(async () => {
  await browser?.close()
})

describe("signing in on a phone", () => {
  it.each([
    ["lead", "/review", "Review"],
    ["tech", "/drives", "Drives"],
    ["codriver", "/drives", "Drives"],
    ["admin", "/admin/users", "People"],
  ] as const)("takes the %s to their home (%s)", async (key, path, heading) => {
    const context = await newPhoneContext(browser)
    const page = await context.newPage()
    await signInPage(page, shop[key].email, shop[key].password)
    expect(new URL(page.url()).pathname).toBe(path)
    await expect.poll(() => page.getByRole("heading", { level: 1 }).first().textContent()).toContain(heading)
    // phones get the bottom bar, not the side rail
    expect(await page.locator("nav[aria-label=Main]").last().isVisible()).toBe(true)
    await context.close()
  })

  it("shows one plain message for a wrong password and stays on the sign-in page", async () => {
    const context = await newPhoneContext(browser)
    const page = await context.newPage()
    await page.goto("/sign-in")
    await page.getByLabel("E-mail").fill(shop.tech.email)
    await page.getByLabel("Password").fill("wrong password")
    await page.getByRole("button", { name: "Sign in" }).click()
    await page.getByRole("alert").filter({ hasText: "do not match" }).waitFor()
    expect(new URL(page.url()).pathname).toBe("/sign-in")
    await context.close()
  })

  it("sends a signed-out visitor to the sign-in page", async () => {
    const context = await newPhoneContext(browser)
    const page = await context.newPage()
    await page.goto("/review")
    expect(new URL(page.url()).pathname).toBe("/sign-in")
    await context.close()
  })
})
