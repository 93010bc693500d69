// `npm start`: everything from a fresh clone to a served app, idempotently.
import path from "node:path"
import { appSecret, fakeServiceEnv, startFakes } from "./lib/services.mjs"
import { ensurePostgresInstalled, isRunning, resolveDataDir, startPostgres, stopPostgres } from "./lib/postgres.mjs"
import { firstBusyPort } from "./lib/ports.mjs"
import { ensureBuild, ensurePackages, log, npx, root, run, SERVER_ARGS, startChild, stopChild } from "./lib/shell.mjs"

const port = Number(process.env.PORT ?? 3000)
const host = process.env.HOST ?? "127.0.0.1"
const dataRoot = path.join(root, ".data")

ensurePackages()

const s3Port = Number(process.env.S3_PORT ?? 4569)
const smtpPort = Number(process.env.SMTP_PORT ?? 2525)
const pgPort = Number(process.env.PGPORT ?? 54329)

// Every port is checked before anything starts: a second `npm start` on the same ports says so in one line and
// leaves the running copy (its database included) alone. A cluster of ours already running is used, never stopped.
let pgDataDir = null
let startedPostgres = false
if (!process.env.DATABASE_URL) {
  pgDataDir = resolveDataDir(path.join(dataRoot, "pg"))
  startedPostgres = !isRunning(ensurePostgresInstalled(), pgDataDir)
}
const wanted = [["PORT", port, host]]
if (!process.env.S3_ENDPOINT)
  wanted.push(["S3_PORT", s3Port], ["SMTP_PORT", smtpPort], ["SMTP_PORT + 1 (captured mail list)", smtpPort + 1])
if (startedPostgres) wanted.push(["PGPORT", pgPort])
for (const [name, p, h] of wanted) {
  const busy = await firstBusyPort([[name, p]], h ?? "127.0.0.1")
  if (busy) {
    log(
      `Port ${busy.port} (${busy.name}) is already in use, perhaps by another copy of Straightaway; stop it or set ${busy.name.split(" ")[0]} to a free port.`,
    )
    process.exit(1)
  }
}

let databaseUrl = process.env.DATABASE_URL
if (!databaseUrl) databaseUrl = startPostgres({ dataDir: pgDataDir, port: pgPort, database: "straightaway" })
const env = {
  ...process.env,
  ...(process.env.S3_ENDPOINT ? {} : fakeServiceEnv({ s3Port, smtpPort })),
  DATABASE_URL: databaseUrl,
  APP_SECRET: appSecret(dataRoot),
  APP_URL: process.env.APP_URL ?? `http://${host === "0.0.0.0" ? "localhost" : host}:${port}`,
  NODE_ENV: "production",
}

let fakes = null
let server = null
let stopping = false
async function shutdown(code = 0) {
  if (stopping) return
  stopping = true
  log("Shutting down")
  await stopChild(server)
  await stopChild(fakes)
  if (pgDataDir && startedPostgres) stopPostgres({ dataDir: pgDataDir })
  process.exit(code)
}
process.on("SIGINT", () => shutdown(0))
process.on("SIGTERM", () => shutdown(0))

try {
  if (!process.env.S3_ENDPOINT) fakes = await startFakes({ s3Port, smtpPort, dir: path.join(dataRoot, "fakes") })
  run(npx("tsx"), ["db/migrate.ts"], { env })
  run(npx("tsx"), ["db/seed.ts"], { env })
  ensureBuild()
} catch (error) {
  log(`Set-up failed: ${error.message}`)
  await shutdown(1)
}

server = startChild(process.execPath, SERVER_ARGS, {
  env: { ...env, HOSTNAME: host, PORT: String(port) },
  name: "server",
})
server.on("exit", (code) => {
  if (!stopping) shutdown(code ?? 1)
})
log(`Straightaway is at ${env.APP_URL}`)
log("Demo accounts (demo data only; password drive-demo-2026):")
log(
  "  admin@demo.test (admin), lead@demo.test (shop lead), tech@demo.test (technician), codriver@demo.test (co-driver)",
)
log("  lead@othershop.test (shop lead of a second shop)")
