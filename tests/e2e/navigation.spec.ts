import { AxeBuilder } from "@axe-core/playwright"
import { createTestShop, type TestShop } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { insertJob, insertScoredDrive } from "../integration/review/fixtures"
import { expect, test, type Page } from "./fixtures"
let shop: TestShop

test.beforeAll(async () => {
  shop = await createTestShop("E2ENav")
  const job = await insertJob(shop)
  await insertScoredDrive(shop, { pattern: "short", seed: 911, job, finishedAt: new Date(Date.now() - 3_600_000) })
})

/** Taps the entry in the phone's bottom bar, or in its "More" sheet when the bar has no room for it. */
async function tapNav(page: Page, label: string) {
  const bar = page.getByRole("navigation", { name: "Main" }).locator("visible=true")
  const direct = bar.getByRole("link", { name: label, exact: true })
  if (await direct.count()) {
    await direct.click()
    return
  }
  await bar.getByRole("button", { name: "More" }).click()
  await page.getByRole("dialog", { name: "More pages" }).getByRole("link", { name: label, exact: true }).click()
}

/** Walks every page of the role from the phone's navigation only: each tap lands on the page with its heading. */
async function walk(page: Page, pages: Array<{ label: string; path: string; heading: RegExp }>) {
  const reached: string[] = []
  for (const p of pages) {
    await tapNav(page, p.label)
    await page.waitForURL((url) => url.pathname === p.path)
    await page.getByRole("heading", { level: 1, name: p.heading }).waitFor()
    reached.push(p.path)
    // The recorder is full screen, without the bar: its own way back returns to the app.
    if (p.path === "/record") {
      await page.getByTestId("leave-recorder").click()
      await page.waitForURL((url) => !url.pathname.startsWith("/record"))
    }
  }
  return reached
}

// The pages each role may open (app/(shop)/**/page.tsx requirePageRole), as the phone's bar and "More" sheet name them.
const TECH = [
  { label: "Drives", path: "/drives", heading: /Drives/ },
  { label: "Record", path: "/record", heading: /Start a drive/ },
  { label: "Jobs", path: "/jobs", heading: /Jobs/ },
  { label: "Roads", path: "/roads", heading: /Roads/ },
  { label: "Profiles", path: "/profiles", heading: /Condition profiles/ },
]
const LEAD = [
  { label: "Review", path: "/review", heading: /Review/ },
  ...TECH,
  { label: "Numbers", path: "/numbers", heading: /Numbers/ },
  { label: "Settings", path: "/settings", heading: /Settings/ },
]
const ADMIN = [
  ...LEAD,
  { label: "People", path: "/admin/users", heading: /People/ },
  { label: "Mail", path: "/admin/mail", heading: /Mail/ },
  // and back to People after leaving it
  { label: "Numbers", path: "/numbers", heading: /Numbers/ },
  { label: "People", path: "/admin/users", heading: /People/ },
]

test.describe("phone navigation: every page a role may open is a tap or two away", () => {
  test("the technician reaches drives, the recorder, jobs, roads and profiles", async ({ phoneAs }) => {
    expect(await walk(await phoneAs(shop.tech), TECH)).toEqual(TECH.map((p) => p.path))
  })

  test("the co-driver reaches the drives that name them", async ({ phoneAs }) => {
    const co = [{ label: "Drives", path: "/drives", heading: /Drives/ }]
    expect(await walk(await phoneAs(shop.codriver), co)).toEqual(["/drives"])
  })

  test("the shop lead reaches review, numbers, profiles and settings, through More where the bar is full", async ({
    phoneAs,
  }) => {
    expect(await walk(await phoneAs(shop.lead), LEAD)).toEqual(LEAD.map((p) => p.path))
  })

  test("the admin reaches People, Mail and Profiles on a phone, and gets back to People", async ({ phoneAs }) => {
    expect(await walk(await phoneAs(shop.admin), ADMIN)).toEqual(ADMIN.map((p) => p.path))
  })

  test("goes deeper by taps: a job from the list, a new job, a drive and its job", async ({ phoneAs }) => {
    const page = await phoneAs(shop.lead)
    await tapNav(page, "Jobs")
    await page.getByRole("link", { name: /New job/ }).click()
    await page.waitForURL("**/jobs/new")
    await tapNav(page, "Drives")
    await page.getByTestId("drive-list").getByRole("link").first().click()
    await page.waitForURL(/\/drives\/[0-9a-f-]{36}$/)
    await page.getByTestId("drive-job-link").click()
    await page.waitForURL(/\/jobs\/[0-9a-f-]{36}$/)
    await tapNav(page, "Profiles")
    await page.getByRole("heading", { level: 1, name: /Condition profiles/ }).waitFor()
  })

  test("a page that refuses or does not exist has a way back", async ({ phoneAs }) => {
    const page = await phoneAs(shop.codriver)
    await page.goto("/drives/00000000-0000-4000-8000-000000000000")
    await page.getByTestId("way-back").click()
    await page.waitForURL("**/drives")
  })
})

/** A drive of the shop's technician, on a new job, still being recorded. */
async function recordingDrive(pattern: "met" | "short", seed: number) {
  const job = await insertJob(shop)
  return { job, drive: await insertScoredDrive(shop, { pattern, seed, job, status: "recording" }) }
}

test.describe("the co-driver's way in", () => {
  test("leads with a Join as co-driver card for a drive being recorded that names them, and it opens the logging screen", async ({
    phoneAs,
  }) => {
    const { job, drive: live } = await recordingDrive("met", 912)
    const page = await phoneAs(shop.codriver)
    const card = page.locator(`[data-testid="join-card"][data-drive-id="${live.id}"]`)
    await card.waitFor()
    await expect(card).toContainText("Join as co-driver")
    await expect(card).toContainText(job.roNumber)
    await expect(card).toContainText(shop.tech.name)
    await card.click()
    await page.waitForURL(`**/record/${live.id}/co-driver`)
    // It says why it asks for the location before the logging buttons.
    await expect(page.getByTestId("location-why")).toContainText("speed")
    await page.getByTestId("mark-cleared").waitFor()
    await expect(page.getByTestId("mark-cleared")).toContainText("Learn complete")
  })
})

test.describe("notices for the lead", () => {
  test("a drive that finishes short puts a notice under the lead's bell, which opens the drive", async ({
    phoneAs,
  }) => {
    const { job, drive } = await recordingDrive("short", 913)
    const finish = await (await signedIn(shop.tech)).post(`/api/drives/${drive.id}/finish`, {})
    expect(finish.status).toBe(200)
    expect(finish.body.drive.verdict).toBe("short")
    const page = await phoneAs(shop.lead)
    await page.getByTestId("notification-bell").click()
    const notice = page
      .getByTestId("notification-panel")
      .getByRole("link", { name: /waits for your review/ })
      .filter({ hasText: job.roNumber })
    await notice.waitFor()
    await expect(notice).toContainText("Short")
    await notice.click()
    await page.waitForURL(`**/drives/${drive.id}`)
  })
})

test.describe("the recorder's sun mode", () => {
  test("passes the axe check, with small text at 7:1 (WCAG 2.2 A/AA rules plus color-contrast-enhanced, SC 1.4.6)", async ({
    phoneAs,
  }) => {
    const page = await phoneAs(shop.tech)
    await page.goto("/record")
    await page.getByRole("heading", { level: 1, name: "Start a drive" }).waitFor()
    await page.getByTestId("sun-toggle").click()
    await page.locator('[data-theme="sun"]').waitFor()
    await page.waitForLoadState("networkidle")
    // It is a light theme in fact: the recorder's surfaces turn white and its text black (app/(cab)/sun.css).
    const look = await page
      .getByTestId("cab-root")
      .evaluate((el) => ({ bg: getComputedStyle(el).backgroundColor, fg: getComputedStyle(el).color }))
    expect(look).toEqual({ bg: "rgb(255, 255, 255)", fg: "rgb(0, 0, 0)" })
    const aa = await new AxeBuilder({ page })
      .withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22a", "wcag22aa"])
      .analyze()
    const aaa = await new AxeBuilder({ page }).withRules(["color-contrast-enhanced"]).analyze()
    const problems = [
      ...aa.violations.filter((v) => v.impact === "serious" || v.impact === "critical"),
      ...aaa.violations,
    ].map(
      (v) =>
        `${v.id}: ${v.nodes
          .map((n) => n.target.join(" "))
          .slice(0, 5)
          .join(" | ")}`,
    )
    expect(problems).toEqual([])
    // The choice stays on the phone.
    await page.reload()
    await page.locator('[data-theme="sun"]').waitFor()
  })
})

test.describe("the settings page's clock", () => {
  test("hydrates without a mismatch when the phone's clock is not the server's, then shows the phone's time", async ({
    phoneAs,
  }) => {
    const page = await phoneAs(shop.admin)
    const problems: string[] = []
    page.on("pageerror", (e) => problems.push(e.message))
    page.on("console", (m) => {
      if (m.type() === "error") problems.push(m.text())
    })
    // The phone's clock years behind the server's: a first render from it would not be the server's text.
    await page.clock.setFixedTime(new Date("2023-03-15T18:07:00Z"))
    await page.goto("/settings")
    await page.getByRole("heading", { level: 1, name: "Settings" }).waitFor()
    // The shop's zone is the product default, America/Chicago (UTC-5 in March 2023 after the 12th: CDT).
    await expect.poll(async () => page.getByText(/^Now: /).textContent()).toBe("Now: Mar 15, 2023, 1:07 PM CDT")
    expect(problems.filter((p) => /hydrat|#418|#423|#425/i.test(p))).toEqual([])
  })
})
