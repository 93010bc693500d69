// The browser tests (tests/e2e) on Playwright's own runner. `npm test` starts the database, the fakes and a production
// build of the app, then runs this config against it with TEST_BASE_URL and DATABASE_URL set; it never downloads a
// browser: it drives Debian's Chromium (CHROMIUM_PATH, /usr/bin/chromium by default).
import { defineConfig } from "@playwright/test"

export default defineConfig({
  testDir: "tests/e2e",
  testMatch: "**/*.spec.ts",
  globalSetup: "./tests/e2e/global-setup.ts",
  outputDir: "test-results/e2e",
  // One worker: the specs share the app and its database with each other on a 2-core machine.
  workers: 1,
  fullyParallel: false,
  retries: 0,
  forbidOnly: true,
  // Each drive test steps its route on the page's clock; the bound is for the app's own work, generous for CI.
  timeout: 120_000,
  reporter: [["list"], ["./tests/e2e/summary-reporter.ts"]],
  use: {
    baseURL: process.env.TEST_BASE_URL,
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      // A closed network: no background calls home that would be refused and slow every start.
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--disable-dev-shm-usage",
      ],
    },
  },
})
