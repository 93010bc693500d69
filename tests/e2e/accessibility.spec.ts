import { AxeBuilder } from "@axe-core/playwright"
import { createTestShop, type TestShop, type TestUser } from "../helpers/db"
import { insertJob, insertScoredDrive } from "../integration/review/fixtures"
import { expect, signInPage, test, type BrowserContext, type Page } from "./fixtures"

// WCAG 2.0, 2.1 and 2.2 success criteria at levels A and AA, as axe-core tags them (axe-core rule descriptions).
const WCAG_TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22a", "wcag22aa"]
const BLOCKING = new Set(["serious", "critical"])
let shop: TestShop
let driveId: string
let jobId: string

test.beforeAll(async () => {
  shop = await createTestShop("E2EA11y")
  const job = await insertJob(shop)
  jobId = job.jobId
  const drive = await insertScoredDrive(shop, {
    pattern: "short",
    seed: 811,
    job,
    finishedAt: new Date(Date.now() - 3_600_000),
  })
  driveId = drive.id
})

/** Serious and critical WCAG A/AA problems on the page as it stands, one line each with where they are. */
async function blockingViolations(page: Page) {
  const { violations } = await new AxeBuilder({ page }).withTags(WCAG_TAGS).analyze()
  return violations
    .filter((v) => BLOCKING.has(v.impact ?? ""))
    .map(
      (v) =>
        `${v.id} (${v.impact}): ${v.help} at ${v.nodes
          .map((n) => n.target.join(" "))
          .slice(0, 5)
          .join(" | ")}`,
    )
}

async function check(
  phone: () => Promise<BrowserContext>,
  user: TestUser | null,
  paths: Array<{ path: string; ready: (page: Page) => Promise<unknown> }>,
  scheme: "light" | "dark" = "light",
) {
  const page = await (await phone()).newPage()
  await page.emulateMedia({ colorScheme: scheme })
  if (user) await signInPage(page, user)
  const found: Record<string, string[]> = {}
  for (const { path, ready } of paths) {
    await page.goto(path)
    await ready(page)
    await page.waitForLoadState("networkidle")
    const problems = await blockingViolations(page)
    if (problems.length) found[`${path} (${scheme})`] = problems
  }
  return found
}

const heading = (name: string | RegExp) => (page: Page) => page.getByRole("heading", { level: 1, name }).waitFor()

test.describe("accessibility of the main pages (axe-core, WCAG 2 A and AA)", () => {
  test("sign-in has no serious or critical violations", async ({ phone }) => {
    expect(await check(phone, null, [{ path: "/sign-in", ready: heading("Straightaway") }])).toEqual({})
  })

  test("the shop lead's pages have none, light and dark", async ({ phone }) => {
    const paths = [
      { path: "/review", ready: heading("Review") },
      { path: `/drives/${driveId}`, ready: (page: Page) => page.getByTestId("speed-chart").waitFor() },
      { path: "/drives", ready: heading("Drives") },
      { path: "/jobs", ready: (page: Page) => page.getByTestId("job-row").first().waitFor() },
      { path: `/jobs/${jobId}`, ready: (page: Page) => page.getByTestId("task-card-0").waitFor() },
      { path: "/numbers", ready: heading("Numbers") },
    ]
    expect(await check(phone, shop.lead, paths, "light")).toEqual({})
    expect(await check(phone, shop.lead, paths, "dark")).toEqual({})
  })

  test("the admin's people page has none", async ({ phone }) => {
    expect(await check(phone, shop.admin, [{ path: "/admin/users", ready: heading("People") }])).toEqual({})
  })

  test("the technician's recorder start page, drives and jobs have none", async ({ phone }) => {
    const paths = [
      { path: "/record", ready: heading("Start a drive") },
      { path: "/drives", ready: heading("Drives") },
      { path: "/jobs", ready: (page: Page) => page.getByTestId("job-row").first().waitFor() },
    ]
    expect(await check(phone, shop.tech, paths)).toEqual({})
  })

  test("the co-driver's drives list has none", async ({ phone }) => {
    expect(await check(phone, shop.codriver, [{ path: "/drives", ready: heading("Drives") }])).toEqual({})
  })
})
