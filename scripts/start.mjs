// `npm start`: everything from a fresh clone to a served app, idempotently.
import path from "node:path"
import { appSecret, fakeServiceEnv, startFakes } from "./lib/services.mjs"
import { resolveDataDir, startPostgres, stopPostgres } from "./lib/postgres.mjs"
import { ensureBuild, ensurePackages, log, npx, root, run, startChild, stopChild } from "./lib/shell.mjs"

const port = Number(process.env.PORT ?? 3000)
const host = process.env.HOST ?? "127.0.0.1"
const dataRoot = path.join(root, ".data")

ensurePackages()

let pgDataDir = null
let databaseUrl = process.env.DATABASE_URL
if (!databaseUrl) {
  pgDataDir = resolveDataDir(path.join(dataRoot, "pg"))
  databaseUrl = startPostgres({ dataDir: pgDataDir, port: Number(process.env.PGPORT ?? 54329), database: "straightaway" })
}

const s3Port = Number(process.env.S3_PORT ?? 4569)
const smtpPort = Number(process.env.SMTP_PORT ?? 2525)
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
  if (pgDataDir) stopPostgres({ dataDir: pgDataDir })
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

server = startChild(npx("next"), ["start", "-H", host, "-p", String(port)], { env, name: "next" })
server.on("exit", (code) => {
  if (!stopping) shutdown(code ?? 1)
})
log(`Straightaway is at ${env.APP_URL}`)
log("Demo accounts (demo data only; password drive-demo-2026):")
log("  admin@demo.test (admin), lead@demo.test (shop lead), tech@demo.test (technician), codriver@demo.test (co-driver)")
log("  lead@othershop.test (shop lead of a second shop)")
