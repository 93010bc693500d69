import fs from "node:fs"
import os from "node:os"
import path from "node:path"
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core"
import { testEnv } from "./env"

const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium"

// Flags for a closed network: no background calls home that would be refused and slow every start.
const ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
]

export async function launchBrowser(): Promise<Browser> {
  if (!fs.existsSync(CHROMIUM))
    throw new Error(`Chromium not found at ${CHROMIUM}; npm test installs Debian's chromium.`)
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS })
}

/** About a 6.1" phone: touch, geolocation allowed, its own client address for sign-in throttling. */
function phoneOptions(geolocation: { latitude: number; longitude: number }) {
  return {
    baseURL: testEnv().baseUrl,
    viewport: { width: 390, height: 844 },
    deviceScaleFactor: 2,
    isMobile: true,
    hasTouch: true,
    permissions: ["geolocation"],
    geolocation: { ...geolocation, accuracy: 5 },
    extraHTTPHeaders: { "x-forwarded-for": `203.0.113.${Math.floor(Math.random() * 250)}` },
  }
}

/** A phone-sized context (about a 6.1" phone), touch, geolocation allowed. */
export async function newPhoneContext(
  browser: Browser,
  geolocation = { latitude: 41.6, longitude: -93.6 },
): Promise<BrowserContext> {
  return browser.newContext(phoneOptions(geolocation))
}

/**
 * A phone-sized context with an on-disk profile, like a real phone's browser, for the offline tests.
 */
export async function newPersistentPhoneContext(
  geolocation = { latitude: 41.6, longitude: -93.6 },
): Promise<BrowserContext> {
  if (!fs.existsSync(CHROMIUM))
    throw new Error(`Chromium not found at ${CHROMIUM}; npm test installs Debian's chromium.`)
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), "straightaway-phone-"))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: ARGS,
    ...phoneOptions(geolocation),
  })
  // Chromium may still be writing as it closes: clean up in the background and never fail a test over it.
  context.on(
    "close",
    () =>
      void fs.promises.rm(profile, { recursive: true, force: true, maxRetries: 5, retryDelay: 200 }).catch(() => {}),
  )
  return context
}

export async function signInPage(page: Page, email: string, password: string) {
  await page.goto("/sign-in")
  await page.getByLabel("E-mail").fill(email)
  await page.getByLabel("Password").fill(password)
  await page.getByRole("button", { name: "Sign in" }).click()
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"))
}
