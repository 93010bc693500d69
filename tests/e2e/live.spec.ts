import { randomUUID } from "node:crypto"
import { internalDriveId } from "@/lib/drive-id"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { ClockedRoute, expect, startThroughGate, signInPage, startOf, test, type Page } from "./fixtures"

// An invented route from lib/tracks at a fix a second, stepped on the driver's page clock so derived speeds are road
// speeds. Long enough that the phone is still on the road when the test is done with it.
const ROUTE = generateDrive({ seed: 4242, hz: 1, minutes: 20, pattern: "never-cleared" }).samples

const num = async (page: Page, testId: string, attr = "data-value") =>
  Number(await page.getByTestId(testId).getAttribute(attr))

/** Marks the phone holds from other phones, read straight from IndexedDB. */
async function remoteMarkIds(page: Page, driveId: string): Promise<string[]> {
  return page.evaluate(async (id) => {
    const db: IDBDatabase = await new Promise((res, rej) => {
      const r = indexedDB.open("straightaway-recorder")
      r.onsuccess = () => res(r.result)
      r.onerror = () => rej(r.error)
    })
    const value: { marks: Array<{ id: string }> } | undefined = await new Promise((res) => {
      const req = db.transaction("kv").objectStore("kv").get(`remote:${id}`)
      req.onsuccess = () => res(req.result)
      req.onerror = () => res(undefined)
    })
    return (value?.marks ?? []).map((m) => m.id)
  }, driveId)
}

test.describe("one live picture of the drive on two phones", () => {
  let shop: TestShop
  test.beforeAll(async () => {
    shop = await createTestShop("Live crew")
  })

  test("shows the co-driver's marks on the driver's meters, reconciles offline marks once, and agrees at the finish", async ({
    phone,
    desk,
  }) => {
    test.setTimeout(240_000)
    // The driver's phone: starts the drive naming the co-driver, who logs on their own phone.
    const driver = await (await phone(startOf(ROUTE))).newPage()
    await signInPage(driver, shop.tech)
    await driver.goto("/record")
    const clocked = await ClockedRoute.install(driver, ROUTE)
    await driver.getByTestId("vehicle-description").fill("Invented Corvan 2.0, silver")
    await driver.getByLabel("Co-driver").selectOption(shop.codriver.id)
    const driveId = await startThroughGate(driver)
    await clocked.hold()
    const route = clocked.driveOn()
    await expect
      .poll(
        async () =>
          (await testDb().selectFrom("sample_decoded").select("t").where("drive_id", "=", driveId).execute()).length,
        { timeout: 20_000 },
      )
      .toBeGreaterThan(4)

    // The co-driver's own phone.
    const coCtx = await phone(startOf(ROUTE))
    const co = await coCtx.newPage()
    // The co-driver's clock joins the drive's once the phone is up: the marks share the samples' time.
    await clocked.crewClockFor(co)
    await signInPage(co, shop.codriver)
    await co.goto(`/record/${driveId}/co-driver`)
    await co.getByTestId("co-driver-panel").waitFor()
    await expect.poll(() => co.getByTestId("crew-job").textContent()).toContain("Invented Corvan 2.0, silver")
    await expect(co.getByTestId("crew-sync")).toHaveAttribute("data-state", "live", { timeout: 10_000 })
    clocked.join(co)
    // Everything above the buttons, and the buttons on screen at 390x844, big and far apart.
    for (const id of ["crew-summary", "mark-lead-on", "mark-cleared", "mark-verified", "mark-verify-failed"]) {
      const box = (await co.getByTestId(id).boundingBox())!
      expect(box.y + box.height, `${id} is above the fold`).toBeLessThanOrEqual(844)
      if (id.startsWith("mark-")) expect(box.height).toBeGreaterThanOrEqual(64)
    }
    const summaryBox = (await co.getByTestId("crew-summary").boundingBox())!
    expect(summaryBox.y).toBeLessThan((await co.getByTestId("mark-lead-on").boundingBox())!.y)
    const verified = (await co.getByTestId("mark-verified").boundingBox())!
    const failed = (await co.getByTestId("mark-verify-failed").boundingBox())!
    expect(failed.x - (verified.x + verified.width)).toBeGreaterThanOrEqual(64)
    await expect.poll(() => co.getByTestId("verify-caution").textContent()).toContain("traffic law")
    await expect.poll(() => co.getByTestId("crew-elapsed").getAttribute("data-value")).not.toBe("0")
    if (process.env.SCREENSHOT_DIR) await co.screenshot({ path: `${process.env.SCREENSHOT_DIR}/co-driver-phone.png` })

    // The shop lead watches from the drive page.
    const lead = await (await desk()).newPage()
    await signInPage(lead, shop.lead)
    await lead.goto(`/drives/${driveId}`)
    await expect
      .poll(() => lead.getByTestId("live-drive-connection").getAttribute("data-state"), { timeout: 15_000 })
      .toBe("live")

    // Lead on with a gap: the driver's meters count following time within 5 s, and the button follows the shared state.
    await co.getByTestId("mark-lead-on").click()
    await co.getByTestId("gap-typed").fill("150")
    await co.getByTestId("gap-use").click()
    await expect.poll(() => co.getByTestId("mark-lead-on").isDisabled()).toBe(true)
    await expect.poll(() => num(driver, "meter-following"), { timeout: 5000 }).toBeGreaterThan(0)
    const firstFollowing = await num(driver, "meter-following")
    await expect.poll(() => num(driver, "meter-following"), { timeout: 5000 }).toBeGreaterThan(firstFollowing)
    // The co-driver's phone shows the server's live minutes.
    await expect.poll(() => num(co, "crew-following"), { timeout: 8000 }).toBeGreaterThan(0)

    // Learn complete, then verified: the driver's phone shows the learn as complete within 5 s.
    await co.getByTestId("mark-cleared").click()
    await expect(driver.getByTestId("meter-learn")).toHaveAttribute("data-cleared", "true", { timeout: 5000 })
    await expect.poll(() => co.getByTestId("crew-learn").getAttribute("data-cleared"), { timeout: 8000 }).toBe("true")
    await clocked.passes(1500)
    await co.getByTestId("mark-verified").click()
    await expect.poll(() => num(driver, "live-score", "data-marks"), { timeout: 5000 }).toBe(3)
    await expect.poll(() => num(lead, "live-drive", "data-marks"), { timeout: 5000 }).toBe(3)
    expect(await num(lead, "live-drive", "data-following")).toBeGreaterThan(0)
    if (process.env.SCREENSHOT_DIR) await lead.screenshot({ path: `${process.env.SCREENSHOT_DIR}/lead-drive-page.png` })
    if (process.env.SCREENSHOT_DIR) {
      await driver.screenshot({ path: `${process.env.SCREENSHOT_DIR}/driver-phone.png`, fullPage: true })
      await co.screenshot({ path: `${process.env.SCREENSHOT_DIR}/co-driver-phone-marks.png` })
    }

    // The co-driver's phone goes offline for a minute and logs two marks; the driver's phone gets each once.
    await coCtx.setOffline(true)
    await expect.poll(() => co.getByTestId("crew-sync").getAttribute("data-state"), { timeout: 30_000 }).toBe("offline")
    await co.getByTestId("mark-gap").click()
    await co.getByTestId("gap-typed").fill("120")
    await co.getByTestId("gap-use").click()
    await co.getByTestId("mark-note").click()
    await co.getByTestId("note-text").fill("Lead changed lanes")
    await co.getByTestId("note-save").click()
    await expect.poll(() => co.getByTestId("mark-count").getAttribute("data-value")).toBe("5")
    // A minute offline on the crew's clock: every retry the co-driver's phone would make in that minute runs, and none
    // gets out.
    await clocked.passes(60_000)
    expect(await num(driver, "live-score", "data-marks")).toBe(3)
    await coCtx.setOffline(false)
    await expect.poll(() => num(driver, "live-score", "data-marks"), { timeout: 20_000 }).toBe(5)
    await expect
      .poll(() => co.getByTestId("crew-sync").getAttribute("data-state"), { timeout: 20_000 })
      .not.toBe("offline")
    await clocked.passes(3000) // any repeat the co-driver's phone would send, it sends in these seconds
    expect(await num(driver, "live-score", "data-marks")).toBe(5)
    await expect.poll(() => num(lead, "live-drive", "data-marks"), { timeout: 5000 }).toBe(5)
    const remote = await remoteMarkIds(driver, driveId)
    expect(remote).toHaveLength(5)
    expect(new Set(remote).size).toBe(5)
    const stored = await testDb()
      .selectFrom("mark")
      .select(["id", "kind"])
      .where("drive_id", "=", internalDriveId(shop.shopId, driveId))
      .orderBy("t")
      .orderBy("seq")
      .execute()
    expect(stored.map((m) => m.kind)).toEqual(["lead-on", "cleared", "verified", "gap", "note"])
    expect(new Set(stored.map((m) => m.id))).toEqual(new Set(remote))

    // Parked: everything sent, the driver's meters and the server's score agree.
    await route.stop()
    await expect(driver.getByTestId("recording-screen")).toHaveAttribute("data-moving", "false")
    // Parked: the driver's clock runs in real time again while the phone sends what it holds.
    await clocked.release()
    const sync = driver.getByTestId("sync-status")
    await expect(sync).toHaveAttribute("data-waiting", "0", { timeout: 30_000 })
    await expect(sync).toHaveAttribute("data-state", "idle", { timeout: 30_000 })
    const api = await signedIn(shop.lead)
    const before = (await api.get(`/api/drives/${driveId}`)).body.score
    expect(await driver.getByTestId("live-score").getAttribute("data-verdict")).toBe(before.verdict)
    expect(Math.abs((await num(driver, "meter-qualifying")) - before.qualifyingSeconds) / 60).toBeLessThanOrEqual(0.1)
    expect(Math.abs((await num(driver, "meter-following")) - before.followingSeconds) / 60).toBeLessThanOrEqual(0.1)

    // The finish: the driver's phone, the co-driver's phone and the server agree on verdict and minutes.
    await driver.getByTestId("finish-drive").click()
    await driver.getByTestId("finish-confirm").click()
    await expect
      .poll(() => driver.getByTestId("score-source").textContent(), { timeout: 30_000 })
      .toBe("Scored by the server")
    const server = (await api.get(`/api/drives/${driveId}`)).body
    expect(server.drive.status).toBe("finished")
    const finish = driver.getByTestId("finish-score")
    expect(await finish.getAttribute("data-verdict")).toBe(server.score.verdict)
    expect(
      Math.abs(Number(await finish.getAttribute("data-qualifying")) - server.score.qualifyingSeconds) / 60,
    ).toBeLessThanOrEqual(0.1)
    expect(
      Math.abs(Number(await finish.getAttribute("data-following")) - server.score.followingSeconds) / 60,
    ).toBeLessThanOrEqual(0.1)
    await co.getByTestId("marks-closed").waitFor({ timeout: 15_000 })
    await expect
      .poll(() => co.getByTestId("crew-summary").getAttribute("data-verdict"), { timeout: 10_000 })
      .toBe(server.score.verdict)
    expect(Math.abs((await num(co, "crew-qualifying")) - server.score.qualifyingSeconds) / 60).toBeLessThanOrEqual(0.1)
    expect(Math.abs((await num(co, "crew-following")) - server.score.followingSeconds) / 60).toBeLessThanOrEqual(0.1)
    expect(await co.getByTestId("mark-lead-on").count()).toBe(0) // no more marks invited
    // The lead's page turns into the finished drive's record.
    await expect.poll(() => lead.getByTestId("live-drive").count(), { timeout: 15_000 }).toBe(0)
  })

  test("a co-driver who opens the drive before the driver's phone has sent it waits, then joins it", async ({
    phoneAs,
  }) => {
    const co = await phoneAs(shop.codriver)
    await co.clock.install()
    const driveId = randomUUID()
    await co.goto(`/record/${driveId}/co-driver`)
    await expect(co.getByTestId("looking-for-drive")).toBeVisible()
    // The driver's phone gets through: the drive reaches the server, naming this co-driver.
    const created = await (
      await signedIn(shop.tech)
    ).post("/api/drives", {
      id: driveId,
      vehicleDescription: "Invented Brellan 1.6, grey",
      coDriverId: shop.codriver.id,
    })
    expect(created.status).toBe(201)
    await expect(co.getByTestId("co-driver-panel")).toHaveCount(0)
    await co.clock.runFor(5_000)
    await expect(co.getByTestId("co-driver-panel")).toBeVisible()
    await expect(co.getByTestId("crew-job")).toContainText("Invented Brellan 1.6, grey")
  })
})
