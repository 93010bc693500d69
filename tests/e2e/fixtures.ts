// Fixtures for the browser tests: phone-sized contexts (closed by the fixture, pass or fail), signed-in phone pages,
// a fresh shop per file, and a route the test steps on the page's clock instead of in real time.
import fs from "node:fs"
import os from "node:os"
import path from "node:path"
import { test as base, expect, type BrowserContext, type BrowserContextOptions, type Page } from "@playwright/test"
import type { Sample } from "@/lib/drive-file"
import { createTestShop, type TestShop, type TestUser } from "../helpers/db"

export { expect }
export type { BrowserContext, Page }

type Place = { latitude: number; longitude: number }
const HOME: Place = { latitude: 41.6, longitude: -93.6 }

let clientCounter = 0
/** About a 6.1" phone: touch, geolocation allowed, its own client address for sign-in throttling. */
export function phoneOptions(place: Place = HOME): BrowserContextOptions {
  clientCounter += 1
  return {
    viewport: { width: 390, height: 844 },
    deviceScaleFactor: 2,
    isMobile: true,
    hasTouch: true,
    permissions: ["geolocation"],
    geolocation: { ...place, accuracy: 5 },
    extraHTTPHeaders: { "x-forwarded-for": `203.0.113.${(process.pid + clientCounter) % 250}` },
  }
}

/** A desk-sized context, as the shop lead at a desk. */
export function deskOptions(): BrowserContextOptions {
  clientCounter += 1
  return {
    viewport: { width: 1280, height: 900 },
    extraHTTPHeaders: { "x-forwarded-for": `198.51.100.${(process.pid + clientCounter) % 250}` },
  }
}

export async function signInPage(page: Page, user: Pick<TestUser, "email" | "password">) {
  await page.goto("/sign-in")
  await page.getByLabel("E-mail").fill(user.email)
  await page.getByLabel("Password").fill(user.password)
  await page.getByRole("button", { name: "Sign in" }).click()
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"))
}

/** From the start screen through the gate (every check ticked) to the recording screen; the new drive's id. */
export async function startThroughGate(page: Page) {
  await page.getByTestId("to-gate").click()
  for (const key of ["codes", "tires", "load", "clean", "mount", "ready"]) await page.getByTestId(`gate-${key}`).check()
  await page.getByTestId("start-drive").click()
  await expect(page.getByTestId("recording-screen")).toBeVisible()
  return new URL(page.url()).searchParams.get("drive")!
}

/** The first fix a route starts from, as a place for a context's geolocation. */
export const startOf = (route: readonly Sample[]): Place => ({ latitude: route[0]!.lat, longitude: route[0]!.lon })

type Fixtures = {
  /** A new phone context; every one made in a test is closed when the test ends. */
  phone: (place?: Place) => Promise<BrowserContext>
  /** A new desk-sized context, closed when the test ends. */
  desk: () => Promise<BrowserContext>
  /** A phone context with an on-disk profile, like a real phone's browser (the offline tests). Closed at the end. */
  persistentPhone: (place?: Place) => Promise<BrowserContext>
  /** A page on a new phone context, signed in as the user. */
  phoneAs: (user: TestUser, place?: Place) => Promise<Page>
}

export const test = base.extend<Fixtures>({
  phone: async ({ browser, baseURL }, use) => {
    const made: BrowserContext[] = []
    await use(async (place) => {
      const context = await browser.newContext({ baseURL, ...phoneOptions(place) })
      made.push(context)
      return context
    })
    await Promise.all(made.map((c) => c.close()))
  },
  desk: async ({ browser, baseURL }, use) => {
    const made: BrowserContext[] = []
    await use(async () => {
      const context = await browser.newContext({ baseURL, ...deskOptions() })
      made.push(context)
      return context
    })
    await Promise.all(made.map((c) => c.close()))
  },
  // The runner traces this context like its own (trace: "retain-on-failure" in playwright.config.ts).
  persistentPhone: async ({ playwright, launchOptions, baseURL }, use) => {
    const made: Array<{ context: BrowserContext; profile: string }> = []
    await use(async (place) => {
      const profile = fs.mkdtempSync(path.join(os.tmpdir(), "straightaway-phone-"))
      const context = await playwright.chromium.launchPersistentContext(profile, {
        ...launchOptions,
        headless: true,
        baseURL,
        ...phoneOptions(place),
      })
      made.push({ context, profile })
      return context
    })
    for (const { context, profile } of made) {
      await context.close()
      // Chromium may still be writing as it closes: never fail a test over the clean-up.
      await fs.promises.rm(profile, { recursive: true, force: true, maxRetries: 5, retryDelay: 200 }).catch(() => {})
    }
  },
  phoneAs: async ({ phone }, use) => {
    await use(async (user, place) => {
      const page = await (await phone(place)).newPage()
      await signInPage(page, user)
      return page
    })
  },
})

/** A fresh shop for the file (createTestShop), made before its first test. */
export function shopForFile(label: string) {
  const holder = {} as { shop: TestShop }
  test.beforeAll(async () => {
    holder.shop = await createTestShop(label)
  })
  return holder
}

/** How long Chromium may take to hand the page a fix (a bound on a wait, not a pause). */
const FIX_WITHIN_MS = 10_000

type FixWatch = { __fixSeen: (key: string) => Promise<void> }

/**
 * In the page: wraps watchPosition so each fix Chromium gives is stamped by the page's clock (Chromium stamps by the
 * wall clock), and lets the test wait until a given fix has come in (`__fixSeen`).
 */
function stampFixes() {
  const w = window as unknown as FixWatch & { __fixStamping?: boolean }
  if (w.__fixStamping) return
  w.__fixStamping = true
  let last = ""
  const waiting = new Map<string, () => void>()
  w.__fixSeen = (key) => (key === last ? Promise.resolve() : new Promise((resolve) => waiting.set(key, resolve)))
  const geo = navigator.geolocation
  const watch = geo.watchPosition.bind(geo)
  geo.watchPosition = (ok, err, options) =>
    watch(
      (p) => {
        last = `${p.coords.latitude},${p.coords.longitude},${p.coords.accuracy}`
        ok({ coords: p.coords, timestamp: Date.now(), toJSON: () => ({}) })
        waiting.get(last)?.()
        waiting.delete(last)
      },
      err,
      options,
    )
}

/**
 * Drives a phone along a route on the page's clock: each fix goes in through Chromium's own geolocation, reaches the
 * page stamped by the page's clock, and then the clock moves on by the route's interval. The page's timers (the
 * recorder's 5-second send, the no-fix watch) run as the clock passes them, so speeds derived from the fixes are road
 * speeds without the test waiting in real time.
 */
export class ClockedRoute {
  private i = 0
  /** How far the route's clock has moved since it was held. */
  private movedMs = 0
  /** Other phones whose clocks move with this one (a co-driver's: its marks share the drive's time). */
  private readonly crew: Page[] = []
  private readonly joining: Page[] = []
  constructor(
    private readonly page: Page,
    private readonly route: readonly Sample[],
    private readonly stepMs: number,
  ) {}

  /**
   * Installs the page's clock and the fix stamping, on the page as it is and on every page it loads from here (call it
   * once the page is up: the worker's first start and its messages run on the real clock, as on a phone).
   */
  static async install(page: Page, route: readonly Sample[]) {
    // The clock moves on by the route's own interval between fixes.
    const stepMs = route[1]!.t - route[0]!.t
    await page.clock.install()
    await page.addInitScript(stampFixes)
    await page.evaluate(stampFixes)
    return new ClockedRoute(page, route, stepMs)
  }

  get index() {
    return this.i
  }

  /** The page's time now. */
  now() {
    return this.page.evaluate(() => Date.now())
  }

  /**
   * Another phone's page, whose clock moves with the route's from the next fix on. Install its clock before it loads
   * (`crewClockFor`), behind the route's, so it can be brought forward to the route's time.
   */
  join(other: Page) {
    this.joining.push(other)
  }

  /** Installs another phone's clock half a minute behind the route's, to `join` the route later. */
  async crewClockFor(other: Page) {
    await other.clock.install({ time: (await this.now()) - 30_000 })
  }

  /** Waits until the route's clock has moved on by `ms` (the background drive keeps it moving). */
  async passes(ms: number) {
    const until = this.movedMs + ms
    await expect.poll(() => this.movedMs, { timeout: 60_000 }).toBeGreaterThanOrEqual(until)
  }

  /** Stops the clock where it is: from here it moves only as the route is stepped. */
  async hold() {
    // The clock is the context's: every page's frames stop at once, a little ahead of the latest of them (their time
    // runs on while this call travels; on a busy machine the call can take longer than the first margin).
    for (const margin of [250, 1000, 5000]) {
      const times = await Promise.all(
        this.page
          .context()
          .pages()
          .flatMap((p) => p.frames().map((f) => f.evaluate(() => Date.now()).catch(() => 0))),
      )
      try {
        await this.page.clock.pauseAt(Math.max(...times) + margin)
        return
      } catch (error) {
        if (!/to the past/.test(String(error))) throw error
      }
    }
    throw new Error("the page's clock ran past every margin while being held")
  }

  /** Lets the page's clock, and the crew's, run in real time again (waiting on the network, the worker, the server). */
  async release() {
    await this.page.clock.resume()
    for (const other of this.crew) await other.clock.resume()
  }

  /** The next `count` fixes, each seen by the page before its clock moves on by one interval. */
  async step(count: number) {
    for (let n = 0; n < count && this.i < this.route.length; n++) await this.fix(this.route[this.i++]!)
    return this.i
  }

  /** Keeps stepping in the background (the phone on the road while the test does other things) until stopped. */
  driveOn() {
    let on = true
    const done = (async () => {
      while (on && this.i < this.route.length) await this.step(1)
    })()
    return {
      /** Stops stepping and parks. */
      stop: async () => {
        on = false
        await done
        await this.park()
      },
    }
  }

  /** Parked: one more fix a centimetre on after a pause, so the phone's speed falls to about zero. */
  async park() {
    const last = this.route[Math.max(0, this.i - 1)]!
    await this.run(600)
    await this.fix({ ...last, lat: last.lat + 1e-7 })
  }

  private sent = 0

  private async run(ms: number) {
    await this.page.clock.runFor(ms)
    for (const other of this.crew) await other.clock.runFor(ms)
    this.movedMs += ms
  }

  private async fix(s: Sample) {
    for (let other = this.joining.shift(); other; other = this.joining.shift()) {
      await other.clock.pauseAt(await this.now())
      this.crew.push(other)
    }
    // The accuracy varies by a millimetre from one fix to the next, so two fixes at one place still tell apart.
    const accuracy = 5 + (this.sent++ % 10) / 1000
    await this.page.context().setGeolocation({ latitude: s.lat, longitude: s.lon, accuracy })
    const seen = this.page.evaluate(
      (want) => (window as unknown as FixWatch).__fixSeen(want),
      `${s.lat},${s.lon},${accuracy}`,
    )
    let bound: ReturnType<typeof setTimeout> | undefined
    const late = new Promise<never>((_, reject) => {
      bound = setTimeout(
        () => reject(new Error(`the page did not get fix ${this.i} within ${FIX_WITHIN_MS} ms`)),
        FIX_WITHIN_MS,
      )
    })
    await Promise.race([seen, late]).finally(() => clearTimeout(bound))
    await this.run(this.stepMs)
  }
}
