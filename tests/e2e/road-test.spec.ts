import { afterAll, beforeAll, describe, expect, it } from "vitest"
import type { Browser, BrowserContext } from "playwright-core"
import { internalDriveId } from "@/lib/drive-id"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { launchBrowser, newPhoneContext, signInPage } from "../helpers/browser"
import { signedIn } from "../helpers/http"
import { checklistBody } from "../integration/contract/world"
import { createJob } from "../integration/jobs/helpers"

// An invented route from lib/tracks (cruising at 50 to 62 mph) at 4 fixes a second, stepped in real time so the
// speeds derived from the positions are road speeds.
const ROUTE = generateDrive({ seed: 4242, hz: 4, minutes: 3, pattern: "never-cleared" }).samples
const STEP_MS = 250

async function step(context: BrowserContext, from: number, count: number) {
  for (let i = from; i < from + count; i++) {
    const s = ROUTE[i]!
    await context.setGeolocation({ latitude: s.lat, longitude: s.lon, accuracy: 5 })
    await new Promise((r) => setTimeout(r, STEP_MS))
  }
  return from + count
}

/** Keeps the phone moving along the route while the co-driver taps, so each mark falls inside a stretch at road speed. */
function driveOn(context: BrowserContext, from: number) {
  let i = from
  let on = true
  const done = (async () => {
    while (on && i < ROUTE.length) {
      const s = ROUTE[i++]!
      await context.setGeolocation({ latitude: s.lat, longitude: s.lon, accuracy: 5 })
      await new Promise((r) => setTimeout(r, STEP_MS))
    }
  })()
  return {
    stop: async () => {
      on = false
      await done
      // Parked: one more fix a centimetre on, so the phone's speed falls to about zero (Finish shows only when stopped).
      const s = ROUTE[i - 1]!
      await pause(600)
      await context.setGeolocation({ latitude: s.lat + 1e-7, longitude: s.lon, accuracy: 5 })
      return i
    },
  }
}

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms))

describe("the road test on a phone", () => {
  let shop: TestShop
  let browser: Browser
  let job: { id: string; camera: string }
  beforeAll(async () => {
    shop = await createTestShop("Road test e2e")
    browser = await launchBrowser()
    const lead = await signedIn(shop.lead)
    const row = await createJob(lead, {
      tasks: [
        { sensor: "forward_camera", method: "static", reason: "windshield_replaced" },
        { sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" },
      ],
    })
    job = { id: row.id, camera: row.tasks[0].id }
    const tech = await signedIn(shop.tech)
    expect(
      (await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/checklist`, checklistBody())).status,
    ).toBe(200)
    const setup = await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, {
      measurements: [{ key: "target_distance", value: 1502, specified: 1500, tolerance: 10, unit: "mm" }],
      scanResult: "pass",
    })
    expect(setup.status).toBe(200)
  })
  afterAll(async () => {
    await browser?.close()
  })

  it("the co-driver logs camera and radar checks with big buttons; the finish screen shows the road-test verdict and every check", async () => {
    const context = await newPhoneContext(browser, { latitude: ROUTE[0]!.lat, longitude: ROUTE[0]!.lon })
    const page = await context.newPage()
    await signInPage(page, shop.tech.email, shop.tech.password)
    await page.goto(`/record?jobId=${job.id}&taskId=${job.camera}`)
    await page.getByTestId("to-gate").click()
    for (const key of ["codes", "tires", "load", "clean", "mount", "ready"])
      await page.getByTestId(`gate-${key}`).check()
    await page.getByTestId("start-drive").click()
    await page.getByTestId("recording-screen").waitFor()
    const driveId = new URL(page.url()).searchParams.get("drive")!
    const moving = driveOn(context, await step(context, 1, 120))

    await page.getByTestId("co-driver-mode").click()
    const panel = page.getByTestId("road-test-checks")
    await panel.waitFor({ timeout: 30_000 })
    // the checks of both systems of the job, each with three buttons of at least 64 px (DESIGN.md: co-driver mode)
    for (const key of [
      "lane-keeping-engages",
      "lane-departure-warning",
      "sign-display",
      "acc-engages",
      "acc-follows-lead",
    ]) {
      await page.getByTestId(`check-${key}`).waitFor()
      for (const result of ["pass", "fail", "not_equipped"]) {
        const box = await page.getByTestId(`check-${key}-${result}`).boundingBox()
        expect(box!.height).toBeGreaterThanOrEqual(64)
      }
    }
    await pause(2000)
    for (const [key, result] of [
      ["acc-engages", "pass"],
      ["acc-follows-lead", "pass"],
      ["lane-keeping-engages", "pass"],
      ["lane-departure-warning", "fail"],
      ["sign-display", "not_equipped"],
    ] as const) {
      await page.getByTestId(`check-${key}-${result}`).click()
      await pause(2000)
    }
    const i = await moving.stop()
    await expect.poll(() => page.getByTestId("check-lane-departure-warning").getAttribute("data-result")).toBe("fail")
    await expect.poll(() => page.getByTestId("mark-count").getAttribute("data-value")).toBe("5")
    await page.screenshot({ path: "/tmp/roadtest-co-driver.png", fullPage: true })

    await expect
      .poll(() => page.getByTestId("recording-screen").getAttribute("data-moving"), { timeout: 10_000 })
      .toBe("false")
    await page.getByTestId("finish-drive").click()
    await page.getByTestId("finish-confirm").click()
    await page.getByTestId("finish-screen").waitFor()
    const verdict = page.getByTestId("road-test-verdict")
    await verdict.waitFor({ timeout: 60_000 })
    await page.screenshot({ path: "/tmp/roadtest-finish.png", fullPage: true })
    // a failed required check: the road test is not met, and the reason names it
    expect(await verdict.getAttribute("data-verdict")).toBe("not_met")
    await expect
      .poll(() => page.getByTestId("verdict-reasons").textContent())
      .toContain('Road test: "Lane-departure warning on a lane line" failed')
    expect(await page.getByTestId("result-lane-departure-warning").getAttribute("data-status")).toBe("failed")
    expect(await page.getByTestId("result-sign-display").getAttribute("data-status")).toBe("not_equipped")
    // the screen shows what the server scored: each check's status and its speed from the track
    const score = (await (await signedIn(shop.tech)).get(`/api/drives/${driveId}/score`)).body
    expect(score.roadTest.checks).toHaveLength(5)
    for (const c of score.roadTest.checks as Array<{ key: string; status: string; speedMph: number | null }>) {
      expect(await page.getByTestId(`result-${c.key}`).getAttribute("data-status")).toBe(c.status)
      if (c.speedMph !== null)
        expect(await page.getByTestId(`result-${c.key}`).textContent()).toContain(`at ${c.speedMph} mph`)
    }
    // cruising at 50 to 62 mph, the adaptive-cruise passes count (25 mph or faster)
    expect(await page.getByTestId("result-acc-engages").getAttribute("data-status")).toBe("passed")
    expect(await page.getByTestId("result-acc-follows-lead").getAttribute("data-status")).toBe("passed")

    // what the phone logged is what the server stored: five check marks with their keys and results
    const marks = await testDb()
      .selectFrom("mark")
      .select(["kind", "check_key", "result"])
      .where("drive_id", "=", internalDriveId(shop.shopId, driveId))
      .orderBy("t")
      .execute()
    expect(marks.map((m) => [m.kind, m.check_key, m.result])).toEqual([
      ["check", "acc-engages", "pass"],
      ["check", "acc-follows-lead", "pass"],
      ["check", "lane-keeping-engages", "pass"],
      ["check", "lane-departure-warning", "fail"],
      ["check", "sign-display", "not_equipped"],
    ])
    expect(i).toBeLessThanOrEqual(ROUTE.length)
    await context.close()
  })
})
