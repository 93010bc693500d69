import fs from "node:fs"
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
  if (!fs.existsSync(CHROMIUM)) throw new Error(`Chromium not found at ${CHROMIUM}; npm test installs Debian's chromium.`)
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS })
}

/** A phone-sized context (about a 6.1" phone), touch, geolocation allowed. */
export async function newPhoneContext(browser: Browser, geolocation = { latitude: 41.6, longitude: -93.6 }): Promise<BrowserContext> {
  return browser.newContext({
    baseURL: testEnv().baseUrl,
    viewport: { width: 390, height: 844 },
    deviceScaleFactor: 2,
    isMobile: true,
    hasTouch: true,
    permissions: ["geolocation"],
    geolocation: { ...geolocation, accuracy: 5 },
    extraHTTPHeaders: { "x-forwarded-for": `203.0.113.${Math.floor(Math.random() * 250)}` },
  })
}

export async function signInPage(page: Page, email: string, password: string) {
  await page.goto("/sign-in")
  await page.getByLabel("E-mail").fill(email)
  await page.getByLabel("Password").fill(password)
  await page.getByRole("button", { name: "Sign in" }).click()
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"))
}
