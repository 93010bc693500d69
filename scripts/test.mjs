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

// The read-replica suite (tests/integration/replica/) needs a streaming standby and a second app that reads from
// it; both are started only when the run can include that suite: no file named, or one naming "replica", or
// TEST_REPLICA=1 (TEST_REPLICA=0: never). Every other suite talks to the first app, which reads the primary only.
const takesValue = new Set([
  "--project",
  "-t",
  "--testNamePattern",
  "--reporter",
  "--shard",
  "--config",
  "-c",
  "--root",
  "-r",
  "--dir",
  "--exclude",
])
const filters = vitestArgs.filter((a, i) => !a.startsWith("-") && !takesValue.has(vitestArgs[i - 1]))
const projects = vitestArgs.flatMap((a, i) =>
  vitestArgs[i - 1] === "--project" ? [a] : a.startsWith("--project=") ? [a.slice(10)] : [],
)
const wantsReplica =
  process.env.TEST_REPLICA === "1" ||
  (process.env.TEST_REPLICA !== "0" &&
    (projects.length === 0 || projects.includes("integration")) &&
    (filters.length === 0 || filters.some((f) => f.includes("replica"))))

const port = Number(process.env.TEST_PORT ?? 3100)
const pgPort = Number(process.env.TEST_PGPORT ?? 54339)
let code = 1
let stack = null
try {
  stack = await startStack({
    name: "test",
    port,
    pgPort,
    s3Port: Number(process.env.TEST_S3_PORT ?? 14569),
    smtpPort: Number(process.env.TEST_SMTP_PORT ?? 12525),
    replica: wantsReplica
      ? {
          port: Number(process.env.TEST_REPLICA_APP_PORT ?? port + 1000),
          pgPort: Number(process.env.TEST_PG_REPLICA_PORT ?? pgPort + 1000),
        }
      : null,
  })
  const env = {
    ...stack.env,
    TEST_BASE_URL: stack.baseUrl,
    CHROMIUM_PATH: chromium,
    NODE_ENV: "test",
    ...(stack.replica
      ? { TEST_REPLICA_BASE_URL: stack.replica.baseUrl, TEST_REPLICA_DATABASE_URL: stack.replica.databaseUrl }
      : {}),
  }
  code = run(npx("vitest"), ["run", ...vitestArgs], { env, check: false }).status ?? 1
} catch (error) {
  log(`Test set-up failed: ${error.message}`)
} finally {
  await stack?.stop()
}
process.exit(code)
