// `npm test`: installs what the suites need, starts a throwaway database, the local fakes and a production
// build of the app, then runs the unit, integration and end-to-end suites. Exits non-zero on any failure.
// A full run (no arguments) first runs the static checks of scripts/check.mjs: both type checks, ESLint, Prettier's
// format check and knip; a violation fails the run. Extra arguments go to Vitest and skip the static checks:
// `npm test -- --project unit` (`npm run check` runs them alone).
import fs from "node:fs"
import { runChecks } from "./check.mjs"
import { aptInstall } from "./lib/postgres.mjs"
import { ensurePackages, log, npx, run } from "./lib/shell.mjs"
import { startStack } from "./lib/stack.mjs"

const vitestArgs = process.argv.slice(2)
if (vitestArgs.length === 0) {
  ensurePackages()
  if (!runChecks()) process.exit(1)
}

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium"
const missing = []
if (!fs.existsSync(chromium)) missing.push("chromium")
if (!fs.existsSync("/usr/bin/xmllint")) missing.push("libxml2-utils")
if (missing.length) {
  log(`Installing ${missing.join(", ")} from Debian's packages`)
  aptInstall(missing)
}

let code = 1
let stack = null
try {
  stack = await startStack({
    name: "test",
    port: Number(process.env.TEST_PORT ?? 3100),
    pgPort: Number(process.env.TEST_PGPORT ?? 54339),
    s3Port: Number(process.env.TEST_S3_PORT ?? 14569),
    smtpPort: Number(process.env.TEST_SMTP_PORT ?? 12525),
  })
  const env = { ...stack.env, TEST_BASE_URL: stack.baseUrl, CHROMIUM_PATH: chromium, NODE_ENV: "test" }
  code = run(npx("vitest"), ["run", ...vitestArgs], { env, check: false }).status ?? 1
} catch (error) {
  log(`Test set-up failed: ${error.message}`)
} finally {
  await stack?.stop()
}
process.exit(code)
