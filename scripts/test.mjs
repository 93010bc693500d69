// `npm test`: installs what the suites need, starts a throwaway database, the local fakes and a production
// build of the app, then runs the unit and integration suites (Vitest) and the browser tests (Playwright's runner,
// playwright.config.ts). Exits non-zero on any failure.
// A full run (no arguments) first runs the static checks of scripts/check.mjs: both type checks, ESLint, Prettier's
// format check and knip; a violation fails the run. Extra arguments skip the static checks and pick what runs:
// `npm test -- --project unit`, `npm test -- tests/integration/drives`, `npm test -- --project e2e`,
// `npm test -- tests/e2e/recorder.spec.ts --repeat-each 20` (files under tests/e2e and --repeat-each go to Playwright,
// the rest to Vitest; `npm run check` runs the static checks alone).
import { spawn } from "node:child_process"
import fs from "node:fs"
import os from "node:os"
import path from "node:path"
import { runChecks } from "./check.mjs"
import { aptInstall } from "./lib/postgres.mjs"
import { ensurePackages, log, npx, root } from "./lib/shell.mjs"
import { startStack } from "./lib/stack.mjs"

const args = process.argv.slice(2)
if (args.length === 0) {
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
const filters = args.filter(
  (a, i) => !a.startsWith("-") && !takesValue.has(args[i - 1]) && args[i - 1] !== "--repeat-each",
)
const projects = args.flatMap((a, i) =>
  args[i - 1] === "--project" ? [a] : a.startsWith("--project=") ? [a.slice(10)] : [],
)
const isBrowserPath = (a) => a.replace(/^\.\//, "").startsWith("tests/e2e")
const browserFiles = filters.filter(isBrowserPath)
const repeatAt = args.indexOf("--repeat-each")
const runBrowser =
  args.length === 0 || projects.includes("e2e") || browserFiles.length > 0 || (repeatAt >= 0 && filters.length === 0)
const runVitest =
  args.length === 0 ||
  projects.some((p) => p !== "e2e") ||
  (filters.some((f) => !isBrowserPath(f)) && !projects.includes("e2e")) ||
  (filters.length === 0 && projects.length === 0 && repeatAt < 0)
// What Vitest gets: everything but the browser files, the e2e project and Playwright's --repeat-each.
const vitestArgs = args.filter(
  (a, i) =>
    !isBrowserPath(a) &&
    !(a === "e2e" && args[i - 1] === "--project") &&
    !(a === "--project" && args[i + 1] === "e2e") &&
    a !== "--project=e2e" &&
    !(repeatAt >= 0 && (i === repeatAt || i === repeatAt + 1)),
)
const playwrightArgs = [...browserFiles, ...(repeatAt >= 0 ? ["--repeat-each", args[repeatAt + 1]] : [])]
const wantsReplica =
  process.env.TEST_REPLICA === "1" ||
  (process.env.TEST_REPLICA !== "0" &&
    runVitest &&
    (projects.length === 0 || projects.includes("integration")) &&
    (filters.length === 0 || filters.some((f) => f.includes("replica"))))

const port = Number(process.env.TEST_PORT ?? 3100)
const pgPort = Number(process.env.TEST_PGPORT ?? 54339)
let code = 1
let stack = null
let runner = null
// Ctrl-C or a kill stops the runner and then the stack (database, fakes, app), as `npm start` does.
let stopping = false
for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, async () => {
    if (stopping) return
    stopping = true
    runner?.kill(signal)
    await stack?.stop()
    process.exit(130)
  })
}

/** Runs a test runner as a child this script can stop; its exit code. */
function runSuite(bin, args, env) {
  return new Promise((resolve) => {
    runner = spawn(npx(bin), args, { cwd: root, env, stdio: "inherit" })
    runner.on("exit", (status) => resolve(status ?? 1))
    runner.on("error", () => resolve(1))
  })
}

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
  // Each runner appends its counts here; the last line of the run adds them up.
  const summaryFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "straightaway-test-")), "summary.jsonl")
  env.TEST_SUMMARY_FILE = summaryFile
  code = 0
  if (runVitest) code = await runSuite("vitest", ["run", ...vitestArgs], env)
  if (runBrowser) {
    const browser = await runSuite("playwright", ["test", ...playwrightArgs], env)
    if (code === 0) code = browser
  }
  if (runVitest && runBrowser) {
    const total = { passed: 0, failed: 0, skipped: 0 }
    const lines = fs.existsSync(summaryFile) ? fs.readFileSync(summaryFile, "utf8").trim().split("\n") : []
    for (const line of lines.filter(Boolean)) {
      const counts = JSON.parse(line)
      for (const key of Object.keys(total)) total[key] += counts[key]
    }
    if (lines.length < 2 && total.failed === 0) total.failed = 1 // a runner that never reported
    process.stdout.write(`\nAll suites:\n${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped\n`)
  }
} catch (error) {
  log(`Test set-up failed: ${error.message}`)
} finally {
  await stack?.stop()
}
process.exit(code)
