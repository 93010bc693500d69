import type { BrowserContext, Page } from "playwright-core"
import { afterAll, beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb, type TestShop } from "../helpers/db"
import { launchBrowser, newPhoneContext, signInPage } from "../helpers/browser"
import { signedIn } from "../helpers/http"
import { testEnv } from "../helpers/env"

const testEnvBase = () => testEnv().baseUrl
import type { Browser } from "playwright-core"

// An invented route from lib/tracks at 4 fixes a second, stepped in real time so derived speeds are road speeds.
const ROUTE = generateDrive({ seed: 4242, hz: 4, minutes: 4, pattern: "never-cleared" }).samples
const STEP_MS = 250

/** Drives the driver's phone along ROUTE in the background until stopped. */
function drive(context: BrowserContext, from: number) {
  let i = from
  let running = true
  const done = (async () => {
    while (running && i < ROUTE.length) {
      const s = ROUTE[i++]!
      await context.setGeolocation({ latitude: s.lat, longitude: s.lon, accuracy: 5 })
      await new Promise((r) => setTimeout(r, STEP_MS))
    }
  })()
  return {
    async stop() {
      running = false
      await done
      // Parked: one more fix a centimetre on, so the phone's speed falls to about zero.
      const s = ROUTE[i - 1]!
      await new Promise((r) => setTimeout(r, 600))
      await context.setGeolocation({ latitude: s.lat + 1e-7, longitude: s.lon, accuracy: 5 })
      return i
    },
  }
}

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

describe("one live picture of the drive on two phones", () => {
  let shop: TestShop
  let browser: Browser
  beforeAll(async () => {
    shop = await createTestShop("Live crew")
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
  })

  it(
    "shows the co-driver's marks on the driver's meters, reconciles offline marks once, and agrees at the finish",
    { timeout: 300_000 },
    async () => {
      // The driver's phone: starts the drive naming the co-driver, who logs on their own phone.
      const driverCtx = await newPhoneContext(browser, { latitude: ROUTE[0]!.lat, longitude: ROUTE[0]!.lon })
      const driver = await driverCtx.newPage()
      await signInPage(driver, shop.tech.email, shop.tech.password)
      await driver.goto("/record")
      await driver.getByTestId("vehicle-description").fill("Invented Corvan 2.0, silver")
      await driver.getByLabel("Co-driver").selectOption(shop.codriver.id)
      await driver.getByTestId("to-gate").click()
      for (const key of ["codes", "tires", "load", "clean", "mount", "ready"])
        await driver.getByTestId(`gate-${key}`).check()
      await driver.getByTestId("start-drive").click()
      await driver.getByTestId("recording-screen").waitFor()
      const driveId = new URL(driver.url()).searchParams.get("drive")!
      const route = drive(driverCtx, 1)
      await expect
        .poll(
          async () =>
            (await testDb().selectFrom("sample_decoded").select("t").where("drive_id", "=", driveId).execute()).length,
          { timeout: 20_000 },
        )
        .toBeGreaterThan(4)

      // The co-driver's own phone.
      const coCtx = await newPhoneContext(browser, { latitude: ROUTE[0]!.lat, longitude: ROUTE[0]!.lon })
      const co = await coCtx.newPage()
      await signInPage(co, shop.codriver.email, shop.codriver.password)
      await co.goto(`/record/${driveId}/co-driver`)
      await co.getByTestId("co-driver-panel").waitFor()
      await expect.poll(() => co.getByTestId("crew-job").textContent()).toContain("Invented Corvan 2.0, silver")
      await expect.poll(() => co.getByTestId("crew-sync").getAttribute("data-state"), { timeout: 10_000 }).toBe("live")
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
      const leadCtx = await browser.newContext({
        baseURL: testEnvBase(),
        viewport: { width: 1280, height: 900 },
        extraHTTPHeaders: { "x-forwarded-for": "198.51.100.77" },
      })
      const lead = await leadCtx.newPage()
      await signInPage(lead, shop.lead.email, shop.lead.password)
      await lead.goto(`/drives/${driveId}`)
      await expect
        .poll(() => lead.getByTestId("live-drive-connection").getAttribute("data-state"), { timeout: 15_000 })
        .toBe("live")

      // Lead on with a gap: the driver's meters count following time within 5 s, and the button follows the shared state.
      await co.getByTestId("mark-lead-on").click()
      await co.getByTestId("gap-typed").fill("150")
      await co.getByTestId("gap-use").click()
      await expect.poll(() => co.getByTestId("mark-lead-on").isDisabled()).toBe(true)
      await expect.poll(() => num(driver, "meter-following"), { timeout: 5000, interval: 200 }).toBeGreaterThan(0)
      const firstFollowing = await num(driver, "meter-following")
      await expect
        .poll(() => num(driver, "meter-following"), { timeout: 5000, interval: 200 })
        .toBeGreaterThan(firstFollowing)
      // The co-driver's phone shows the server's live minutes.
      await expect.poll(() => num(co, "crew-following"), { timeout: 8000 }).toBeGreaterThan(0)

      // Learn complete, then verified: the driver's phone shows the learn as complete within 5 s.
      await co.getByTestId("mark-cleared").click()
      await expect
        .poll(() => driver.getByTestId("meter-learn").getAttribute("data-cleared"), { timeout: 5000, interval: 200 })
        .toBe("true")
      await expect.poll(() => co.getByTestId("crew-learn").getAttribute("data-cleared"), { timeout: 8000 }).toBe("true")
      await new Promise((r) => setTimeout(r, 1500))
      await co.getByTestId("mark-verified").click()
      await expect.poll(() => num(driver, "live-score", "data-marks"), { timeout: 5000, interval: 200 }).toBe(3)
      await expect.poll(() => num(lead, "live-drive", "data-marks"), { timeout: 5000, interval: 200 }).toBe(3)
      expect(await num(lead, "live-drive", "data-following")).toBeGreaterThan(0)
      if (process.env.SCREENSHOT_DIR)
        await lead.screenshot({ path: `${process.env.SCREENSHOT_DIR}/lead-drive-page.png` })
      if (process.env.SCREENSHOT_DIR) {
        await driver.screenshot({ path: `${process.env.SCREENSHOT_DIR}/driver-phone.png`, fullPage: true })
        await co.screenshot({ path: `${process.env.SCREENSHOT_DIR}/co-driver-phone-marks.png` })
      }

      // The co-driver's phone goes offline for a minute and logs two marks; the driver's phone gets each once.
      await coCtx.setOffline(true)
      await expect
        .poll(() => co.getByTestId("crew-sync").getAttribute("data-state"), { timeout: 30_000 })
        .toBe("offline")
      await co.getByTestId("mark-gap").click()
      await co.getByTestId("gap-typed").fill("120")
      await co.getByTestId("gap-use").click()
      await co.getByTestId("mark-note").click()
      await co.getByTestId("note-text").fill("Lead changed lanes")
      await co.getByTestId("note-save").click()
      await expect.poll(() => co.getByTestId("mark-count").getAttribute("data-value")).toBe("5")
      await new Promise((r) => setTimeout(r, 60_000))
      expect(await num(driver, "live-score", "data-marks")).toBe(3)
      await coCtx.setOffline(false)
      await expect.poll(() => num(driver, "live-score", "data-marks"), { timeout: 20_000, interval: 250 }).toBe(5)
      await expect
        .poll(() => co.getByTestId("crew-sync").getAttribute("data-state"), { timeout: 20_000 })
        .not.toBe("offline")
      await new Promise((r) => setTimeout(r, 3000)) // any repeat would have come by now
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
      await expect
        .poll(() => driver.getByTestId("recording-screen").getAttribute("data-moving"), { timeout: 10_000 })
        .toBe("false")
      await expect
        .poll(
          async () =>
            (await driver.getByTestId("sync-status").getAttribute("data-waiting")) === "0" &&
            (await driver.getByTestId("sync-status").getAttribute("data-state")) === "idle",
          { timeout: 30_000, interval: 500 },
        )
        .toBe(true)
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
      expect(Math.abs((await num(co, "crew-qualifying")) - server.score.qualifyingSeconds) / 60).toBeLessThanOrEqual(
        0.1,
      )
      expect(Math.abs((await num(co, "crew-following")) - server.score.followingSeconds) / 60).toBeLessThanOrEqual(0.1)
      expect(await co.getByTestId("mark-lead-on").count()).toBe(0) // no more marks invited
      // The lead's page turns into the finished drive's record.
      await expect.poll(() => lead.getByTestId("live-drive").count(), { timeout: 15_000 }).toBe(0)
      await driverCtx.close()
      await coCtx.close()
      await leadCtx.close()
    },
  )
})
