import { createTestShop, type TestShop } from "../helpers/db"
import { expect, test } from "./fixtures"

let shop: TestShop

test.beforeAll(async () => {
  shop = await createTestShop("E2E")
})

test.describe("signing in on a phone", () => {
  for (const [key, path, heading] of [
    ["lead", "/review", "Review"],
    ["tech", "/drives", "Drives"],
    ["codriver", "/drives", "Drives"],
    ["admin", "/admin/users", "People"],
  ] as const) {
    test(`takes the ${key} to their home (${path})`, async ({ phoneAs }) => {
      const page = await phoneAs(shop[key])
      expect(new URL(page.url()).pathname).toBe(path)
      await expect(page.getByRole("heading", { level: 1 }).first()).toContainText(heading)
      // phones get the bottom bar, not the side rail
      await expect(page.locator("nav[aria-label=Main]").last()).toBeVisible()
    })
  }

  test("shows one plain message for a wrong password and stays on the sign-in page", async ({ phone }) => {
    const page = await (await phone()).newPage()
    await page.goto("/sign-in")
    await page.getByLabel("E-mail").fill(shop.tech.email)
    await page.getByLabel("Password").fill("wrong password")
    await page.getByRole("button", { name: "Sign in" }).click()
    await page.getByRole("alert").filter({ hasText: "do not match" }).waitFor()
    expect(new URL(page.url()).pathname).toBe("/sign-in")
  })

  test("sends a signed-out visitor to the sign-in page", async ({ phone }) => {
    const page = await (await phone()).newPage()
    await page.goto("/review")
    expect(new URL(page.url()).pathname).toBe("/sign-in")
  })
})
