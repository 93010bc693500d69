import { internalDriveId } from "@/lib/drive-id"
import { generateDrive } from "@/lib/tracks"
import { checklistBody } from "../helpers/checklist"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { createJob } from "../helpers/jobs"
import { ClockedRoute, expect, startThroughGate, signInPage, startOf, test } from "./fixtures"

// An invented route from lib/tracks (cruising at 50 to 62 mph) at 4 fixes a second, stepped on the page's clock so the
// speeds derived from the positions are road speeds.
const ROUTE = generateDrive({ seed: 4242, hz: 4, minutes: 3, pattern: "never-cleared" }).samples
/** Two seconds of the route: each mark falls inside a stretch at road speed. */
const TWO_SECONDS = 8

test.describe("the road test on a phone", () => {
  let shop: TestShop
  let job: { id: string; camera: string }
  test.beforeAll(async () => {
    shop = await createTestShop("Road test e2e")
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

  test("the co-driver logs camera and radar checks with big buttons; the finish screen shows the road-test verdict and every check", async ({
    phone,
  }) => {
    const page = await (await phone(startOf(ROUTE))).newPage()
    await signInPage(page, shop.tech)
    await page.goto(`/record?jobId=${job.id}&taskId=${job.camera}`)
    const route = await ClockedRoute.install(page, ROUTE)
    const driveId = await startThroughGate(page)
    await route.hold()
    await route.step(120)

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
    await route.step(TWO_SECONDS)
    for (const [key, result] of [
      ["acc-engages", "pass"],
      ["acc-follows-lead", "pass"],
      ["lane-keeping-engages", "pass"],
      ["lane-departure-warning", "fail"],
      ["sign-display", "not_equipped"],
    ] as const) {
      await page.getByTestId(`check-${key}-${result}`).click()
      await route.step(TWO_SECONDS)
    }
    await route.park()
    await expect(page.getByTestId("check-lane-departure-warning")).toHaveAttribute("data-result", "fail")
    await expect(page.getByTestId("mark-count")).toHaveAttribute("data-value", "5")
    if (process.env.SCREENSHOT_DIR)
      await page.screenshot({ path: `${process.env.SCREENSHOT_DIR}/roadtest-co-driver.png`, fullPage: true })

    await expect(page.getByTestId("recording-screen")).toHaveAttribute("data-moving", "false")
    await route.release()
    await page.getByTestId("finish-drive").click()
    await page.getByTestId("finish-confirm").click()
    await page.getByTestId("finish-screen").waitFor()
    const verdict = page.getByTestId("road-test-verdict")
    await verdict.waitFor({ timeout: 60_000 })
    if (process.env.SCREENSHOT_DIR)
      await page.screenshot({ path: `${process.env.SCREENSHOT_DIR}/roadtest-finish.png`, fullPage: true })
    // a failed required check: the road test is not met, and the reason names it
    await expect(verdict).toHaveAttribute("data-verdict", "not_met")
    await expect
      .poll(() => page.getByTestId("verdict-reasons").textContent())
      .toContain('Road test: "Lane-departure warning on a lane line" failed')
    await expect(page.getByTestId("result-lane-departure-warning")).toHaveAttribute("data-status", "failed")
    await expect(page.getByTestId("result-sign-display")).toHaveAttribute("data-status", "not_equipped")
    // the screen shows what the server scored: each check's status and its speed from the track
    const score = (await (await signedIn(shop.tech)).get(`/api/drives/${driveId}/score`)).body
    expect(score.roadTest.checks).toHaveLength(5)
    for (const c of score.roadTest.checks as Array<{ key: string; status: string; speedMph: number | null }>) {
      expect(await page.getByTestId(`result-${c.key}`).getAttribute("data-status")).toBe(c.status)
      if (c.speedMph !== null) await expect(page.getByTestId(`result-${c.key}`)).toContainText(`at ${c.speedMph} mph`)
    }
    // cruising at 50 to 62 mph, the adaptive-cruise passes count (25 mph or faster)
    await expect(page.getByTestId("result-acc-engages")).toHaveAttribute("data-status", "passed")
    await expect(page.getByTestId("result-acc-follows-lead")).toHaveAttribute("data-status", "passed")

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
    expect(route.index).toBeLessThanOrEqual(ROUTE.length)
  })
})
