import { internalDriveId } from "@/lib/drive-id"
import { generateDrive } from "@/lib/tracks"
import { testDb } from "../helpers/db"
import { signedIn } from "../helpers/http"
import { ClockedRoute, expect, startThroughGate, shopForFile, signInPage, startOf, test, type Page } from "./fixtures"

// An invented route from lib/tracks at 4 fixes a second, stepped on the page's clock so derived speeds are road speeds.
const ROUTE = generateDrive({ seed: 2718, hz: 4, minutes: 2, pattern: "never-cleared" }).samples

async function waitForWorker(page: Page) {
  await page.waitForFunction(() => Boolean(navigator.serviceWorker?.controller), null, { timeout: 30_000 })
  // The app marks <html data-offline-ready> once the worker answered that /record is saved.
  await expect(page.locator("html")).toHaveAttribute("data-offline-ready", "1", { timeout: 30_000 })
  const saved = await page.evaluate(async () =>
    Boolean(await (await caches.open("straightaway-shell")).match("/record")),
  )
  expect(saved, "the recorder page is in the worker's cache").toBe(true)
}

async function startUnplanned(page: Page, vehicle: string) {
  await page.getByTestId("vehicle-description").fill(vehicle)
  return startThroughGate(page)
}

/** What this phone holds for the drive, read straight from IndexedDB. */
async function phoneRecord(page: Page, driveId: string) {
  return page.evaluate(async (id) => {
    const db: IDBDatabase = await new Promise((res, rej) => {
      const r = indexedDB.open("straightaway-recorder")
      r.onsuccess = () => res(r.result)
      r.onerror = () => rej(r.error)
    })
    const all = (store: string): Promise<Array<[string, unknown]>> =>
      new Promise((res) => {
        const out: Array<[string, unknown]> = []
        const cur = db.transaction(store).objectStore(store).openCursor()
        cur.onsuccess = () => {
          const c = cur.result
          if (!c) return res(out)
          out.push([String(c.key), c.value])
          c.continue()
        }
      })
    const rows = await all("kv")
    const samples = rows
      .filter(([k]) => k.startsWith(`samples:${id}:`))
      .sort(([a], [b]) => (a < b ? -1 : 1))
      .flatMap(([, v]) => v as any[])
    const marks = (rows.find(([k]) => k === `marks:${id}`)?.[1] ?? []) as any[]
    return { samples, marks }
  }, driveId)
}

test.describe("the recorder on a phone", () => {
  const file = shopForFile("Recorder")
  // The drive test starts the worker, records, reloads offline and waits for the sync: bounded waits inside (worker
  // 30 s, sync 60 s), on a shared 2-core machine.
  test.describe.configure({ timeout: 240_000 })

  test("records through an offline reload, logs marks as co-driver, and syncs every sample and mark exactly once", async ({
    persistentPhone,
  }) => {
    const { shop } = file
    const context = await persistentPhone(startOf(ROUTE))
    const page = await context.newPage()
    await signInPage(page, shop.tech)
    await page.goto("/record")
    await waitForWorker(page)
    const route = await ClockedRoute.install(page, ROUTE)
    const driveId = await startUnplanned(page, "Invented Corvan 2.0, silver")
    await route.hold()
    await route.step(60)

    await context.setOffline(true)
    await route.step(20)
    // The page loads again from the worker's cache, offline, with its clock running; then the route goes on.
    await route.release()
    await page.reload()
    await expect(page.getByTestId("recording-screen")).toBeVisible()
    await route.hold()
    await route.step(60)

    await page.getByTestId("co-driver-mode").click()
    await page.getByTestId("mark-lead-on").click()
    await page.getByTestId("gap-typed").fill("130")
    await page.getByTestId("gap-use").click()
    await route.step(20)
    await page.getByTestId("mark-gap").click()
    await page.getByTestId("gap-lead-passed").click()
    await page.clock.runFor(1200)
    await page.getByTestId("gap-we-passed").click()
    await expect(page.getByTestId("gap-result")).toHaveText(/s ≈ \d+ ft/)
    await page.getByTestId("gap-use").click()
    await page.getByTestId("mark-note").click()
    await page.getByTestId("note-text").fill("Logged by mistake")
    await page.getByTestId("note-save").click()
    await page.getByTestId("mark-undo").click()
    await page.getByTestId("mark-cleared").click()
    await route.step(20)
    await page.getByTestId("mark-verified").click()
    await expect(page.getByTestId("mark-count")).toHaveAttribute("data-value", "4")
    await expect(page.getByTestId("sync-status")).not.toHaveAttribute("data-waiting", "0")

    // Back online, the clock runs in real time again while the phone sends what it kept.
    await route.release()
    await context.setOffline(false)
    const sync = page.getByTestId("sync-status")
    await expect(sync).toHaveAttribute("data-waiting", "0", { timeout: 60_000 })
    await expect(sync).toHaveAttribute("data-state", "idle", { timeout: 60_000 })

    const phone = await phoneRecord(page, driveId)
    expect(phone.samples.length).toBeGreaterThan(100)
    const rows = await testDb()
      .selectFrom("sample_decoded")
      .select(["t", "lat", "lon", "speed", "accuracy"])
      .where("drive_id", "=", driveId)
      .orderBy("t")
      .execute()
    expect(rows).toHaveLength(phone.samples.length)
    // The phone rounds each fix as the server stores it (lib/recorder/position.ts): the same numbers both sides.
    expect(rows.map((r) => [r.t, r.lat, r.lon])).toEqual(phone.samples.map((s) => [s.t, s.lat, s.lon]))
    const marks = await testDb()
      .selectFrom("mark")
      .select(["id", "t", "kind", "gap_ft", "text"])
      .where("drive_id", "=", internalDriveId(shop.shopId, driveId))
      .orderBy("t")
      .orderBy("seq")
      .execute()
    expect(marks.map((m) => m.kind)).toEqual(["lead-on", "gap", "cleared", "verified"])
    expect(marks.map((m) => [m.id, m.t])).toEqual(phone.marks.map((m) => [m.id, m.t]))
    expect(marks[0]!.gap_ft).toBe(130)
    expect(marks[1]!.gap_ft).toBeGreaterThan(0)

    // The live meters and the server score the same data the same way.
    await page.getByRole("button", { name: "Back to the driver's meters" }).click()
    const api = await signedIn(shop.tech)
    const score = (await api.get(`/api/drives/${driveId}/score`)).body
    const live = page.getByTestId("live-score")
    await expect(live).toHaveAttribute("data-samples-used", String(score.samplesUsed))
    expect(Number(await page.getByTestId("meter-qualifying").getAttribute("data-value"))).toBeCloseTo(
      score.qualifyingSeconds,
      6,
    )
    expect(Number(await page.getByTestId("meter-following").getAttribute("data-value"))).toBeCloseTo(
      score.followingSeconds,
      6,
    )
    await expect(live).toHaveAttribute("data-verdict", score.verdict)
  })

  test("opens and starts recording with the network off after one online visit", async ({ persistentPhone }) => {
    const context = await persistentPhone(startOf(ROUTE))
    const page = await context.newPage()
    await signInPage(page, file.shop.lead)
    await page.goto("/record")
    await waitForWorker(page)
    const route = await ClockedRoute.install(page, ROUTE)
    await context.setOffline(true)
    await page.goto("/record")
    const driveId = await startUnplanned(page, "Invented Tarrow estate, blue")
    await route.hold()
    await route.step(12)
    await expect.poll(async () => (await phoneRecord(page, driveId)).samples.length).toBeGreaterThan(5)
    await route.release()
    await page.getByTestId("co-driver-mode").click()
    await expect(page.getByTestId("sync-status")).toHaveAttribute("data-state", "waiting", { timeout: 15_000 })
  })
})
