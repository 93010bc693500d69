// `npm test`: installs what the suites need, starts a throwaway database, the local fakes and a production
// build of the app, then runs the unit, integration and end-to-end suites. Exits non-zero on any failure.
import fs from "node:fs"
import path from "node:path"
import { appSecret, fakeServiceEnv, startFakes } from "./lib/services.mjs"
import { aptInstall, resolveDataDir, startPostgres, stopPostgres } from "./lib/postgres.mjs"
import { ensureBuild, ensurePackages, log, npx, root, run, startChild, stopChild } from "./lib/shell.mjs"

const port = Number(process.env.TEST_PORT ?? 3100)
const testRoot = path.join(root, ".test-data")
const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium"

ensurePackages()
const missing = []
if (!fs.existsSync(chromium)) missing.push("chromium")
if (!fs.existsSync("/usr/bin/xmllint")) missing.push("libxml2-utils")
if (missing.length) {
  log(`Installing ${missing.join(", ")} from Debian's packages`)
  aptInstall(missing)
}

const pgDataDir = resolveDataDir(path.join(testRoot, "pg"))
const databaseUrl = startPostgres({
  dataDir: pgDataDir,
  port: Number(process.env.TEST_PGPORT ?? 54339),
  database: "straightaway_test",
  fresh: true,
})
const s3Port = Number(process.env.TEST_S3_PORT ?? 14569)
const smtpPort = Number(process.env.TEST_SMTP_PORT ?? 12525)
fs.rmSync(path.join(testRoot, "fakes"), { recursive: true, force: true })
const env = {
  ...process.env,
  ...fakeServiceEnv({ s3Port, smtpPort }),
  DATABASE_URL: databaseUrl,
  APP_SECRET: appSecret(testRoot),
  APP_URL: `http://127.0.0.1:${port}`,
  TEST_BASE_URL: `http://127.0.0.1:${port}`,
  CHROMIUM_PATH: chromium,
  TRUST_PROXY: "1",
  NODE_ENV: "production",
}

let fakes = null
let server = null
let code = 1
try {
  fakes = await startFakes({ s3Port, smtpPort, dir: path.join(testRoot, "fakes") })
  run(npx("tsx"), ["db/migrate.ts"], { env })
  ensureBuild()
  server = startChild(npx("next"), ["start", "-H", "127.0.0.1", "-p", String(port)], { env, name: "next" })
  await waitForHttp(`${env.TEST_BASE_URL}/api/health`, 60_000)
  const args = ["run", ...process.argv.slice(2)]
  const res = run(npx("vitest"), args, { env: { ...env, NODE_ENV: "test" }, check: false })
  code = res.status ?? 1
} catch (error) {
  log(`Test set-up failed: ${error.message}`)
  code = 1
} finally {
  await stopChild(server)
  await stopChild(fakes)
  stopPostgres({ dataDir: pgDataDir })
}
process.exit(code)

async function waitForHttp(url, timeoutMs) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    try {
      const res = await fetch(url)
      if (res.ok) return
    } catch {}
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`)
}
