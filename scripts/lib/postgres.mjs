// Local PostgreSQL for `npm start` and `npm test`: Debian's server binaries, a cluster in a git-ignored
// folder inside the project, run as the `postgres` user when we are root, listening on 127.0.0.1 only.
import { execFileSync, spawnSync } from "node:child_process"
import fs from "node:fs"
import os from "node:os"
import path from "node:path"
import { log, run } from "./shell.mjs"

const isRoot = process.getuid?.() === 0

export function findPgBin() {
  const base = "/usr/lib/postgresql"
  if (fs.existsSync(base)) {
    const versions = fs
      .readdirSync(base)
      .filter((v) => fs.existsSync(path.join(base, v, "bin", "initdb")))
      .sort((a, b) => Number(a) - Number(b))
    if (versions.length) return path.join(base, versions.at(-1), "bin")
  }
  const onPath = spawnSync("sh", ["-c", "command -v initdb"], { encoding: "utf8" }).stdout.trim()
  return onPath ? path.dirname(onPath) : null
}

export function ensurePostgresInstalled() {
  let bin = findPgBin()
  if (!bin) {
    if (!isRoot) throw new Error("PostgreSQL server binaries not found. Install PostgreSQL or set DATABASE_URL.")
    log("Installing PostgreSQL from Debian's packages (one time)...")
    aptInstall(["postgresql"])
    bin = findPgBin()
    if (!bin) throw new Error("PostgreSQL was installed but initdb was not found.")
  }
  ensurePartman(bin)
  return bin
}

// pg_partman makes the monthly partitions of `sample` ahead of time (migration 2026_12_02_1540); Debian
// packages it per server version as postgresql-<major>-partman. Only its SQL functions are used (the app
// calls partman.run_maintenance itself), so no shared_preload_libraries.
function ensurePartman(bin) {
  const major = path.basename(path.dirname(bin))
  if (!/^\d+$/.test(major)) return // not Debian's layout: the migration says so when the extension is missing
  if (fs.existsSync(`/usr/share/postgresql/${major}/extension/pg_partman.control`)) return
  log(`Installing pg_partman from Debian's packages (postgresql-${major}-partman, one time)...`)
  aptInstall([`postgresql-${major}-partman`])
}

let aptUpdated = false
export function aptInstall(packages) {
  if (!isRoot) throw new Error(`Missing Debian packages: ${packages.join(", ")}. Install them with apt-get.`)
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" }
  if (!aptUpdated) {
    run("apt-get", ["update", "-qq"], { env })
    aptUpdated = true
  }
  run("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...packages], { env })
}

function asPostgres(cmd, args, opts = {}) {
  if (isRoot) return run("runuser", ["-u", "postgres", "--", cmd, ...args], opts)
  return run(cmd, args, opts)
}

// postgres must be able to reach the data folder; a clone under a private folder cannot host it.
function traversableByPostgres(dir) {
  if (!isRoot) return true
  return spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", dir]).status === 0
}

export function resolveDataDir(preferred) {
  fs.mkdirSync(path.dirname(preferred), { recursive: true })
  if (traversableByPostgres(path.dirname(preferred))) return preferred
  const hash = Buffer.from(preferred).toString("base64url").slice(-16)
  const fallback = path.join(os.tmpdir(), `straightaway-pg-${hash}`)
  log(`NOTE: postgres cannot enter ${path.dirname(preferred)}; using ${fallback} for the cluster instead.`)
  return fallback
}

export function isRunning(bin, dataDir) {
  if (!fs.existsSync(path.join(dataDir, "postmaster.pid"))) return false
  const args = ["-D", dataDir, "status"]
  const res = isRoot
    ? spawnSync("runuser", ["-u", "postgres", "--", path.join(bin, "pg_ctl"), ...args])
    : spawnSync(path.join(bin, "pg_ctl"), args)
  return res.status === 0
}

/** Starts (creating when needed) a cluster and database; returns its connection URL. */
export function startPostgres({ dataDir, port, database, fresh = false }) {
  const bin = ensurePostgresInstalled()
  if (fresh && fs.existsSync(dataDir)) {
    if (isRunning(bin, dataDir)) stopPostgres({ dataDir })
    fs.rmSync(dataDir, { recursive: true, force: true })
  }
  if (!fs.existsSync(path.join(dataDir, "PG_VERSION"))) {
    fs.mkdirSync(dataDir, { recursive: true })
    if (isRoot) execFileSync("chown", ["postgres:postgres", dataDir])
    fs.chmodSync(dataDir, 0o700)
    log(`Creating a PostgreSQL cluster in ${dataDir}`)
    asPostgres(
      path.join(bin, "initdb"),
      ["-D", dataDir, "-U", "postgres", "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"],
      {
        quiet: true,
      },
    )
  }
  allowReplication(dataDir)
  if (!isRunning(bin, dataDir)) {
    log(`Starting PostgreSQL on 127.0.0.1:${port}`)
    pgCtlStart(bin, dataDir, `-p ${port} -c fsync=${fresh ? "off" : "on"} ${REPLICATION_SETTINGS}`)
  }
  const exists = spawnSync(
    path.join(bin, "psql"),
    [
      "-h",
      "127.0.0.1",
      "-p",
      String(port),
      "-U",
      "postgres",
      "-tAc",
      `SELECT 1 FROM pg_database WHERE datname='${database}'`,
    ],
    { encoding: "utf8" },
  )
  if (exists.status !== 0) throw new Error(`Cannot reach PostgreSQL on port ${port}: ${exists.stderr}`)
  if (exists.stdout.trim() !== "1") {
    run(path.join(bin, "createdb"), ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", database], {
      quiet: true,
    })
  }
  return `postgres://postgres@127.0.0.1:${port}/${database}`
}

// Every cluster we start can feed a streaming standby (startStandby): WAL detailed enough for one, senders for it,
// and some WAL kept back so a standby that falls behind for a moment can catch up without a slot.
const REPLICATION_SETTINGS = "-c wal_level=replica -c max_wal_senders=5 -c wal_keep_size=256MB"
const REPLICATION_HBA = "host replication postgres 127.0.0.1/32 trust"

/** pg_hba.conf lets postgres on 127.0.0.1 connect for replication (initdb --auth=trust writes such a line; we make sure). */
function allowReplication(dataDir) {
  const hba = path.join(dataDir, "pg_hba.conf")
  if (!fs.existsSync(hba)) return
  const lines = fs
    .readFileSync(hba, "utf8")
    .split("\n")
    .map((l) => l.replace(/#.*/, "").trim().split(/\s+/))
  const allowed = lines.some(
    ([type, db, user, address]) =>
      type === "host" && db === "replication" && (user === "all" || user === "postgres") && address === "127.0.0.1/32",
  )
  if (!allowed)
    fs.appendFileSync(hba, `\n# streaming standby for the tests (scripts/lib/postgres.mjs)\n${REPLICATION_HBA}\n`)
}

/**
 * A hot standby of the cluster on `primaryPort`: pg_basebackup (-R writes standby.signal and primary_conninfo;
 * -X stream copies the WAL written meanwhile) as the postgres user over 127.0.0.1, then started on `port`. It
 * follows the primary by streaming replication and answers reads only. Returns its connection URL.
 */
export function startStandby({ primaryPort, dataDir, port, database }) {
  const bin = ensurePostgresInstalled()
  if (fs.existsSync(dataDir)) {
    if (isRunning(bin, dataDir)) stopPostgres({ dataDir })
    fs.rmSync(dataDir, { recursive: true, force: true })
  }
  fs.mkdirSync(dataDir, { recursive: true })
  if (isRoot) execFileSync("chown", ["postgres:postgres", dataDir])
  fs.chmodSync(dataDir, 0o700)
  log(`Copying the cluster on port ${primaryPort} to a streaming standby in ${dataDir} (pg_basebackup)`)
  asPostgres(
    path.join(bin, "pg_basebackup"),
    ["-h", "127.0.0.1", "-p", String(primaryPort), "-U", "postgres", "-D", dataDir, "-R", "-X", "stream", "-c", "fast"],
    { quiet: true },
  )
  log(`Starting the standby on 127.0.0.1:${port}`)
  pgCtlStart(bin, dataDir, `-p ${port} -c fsync=off -c hot_standby=on`)
  return `postgres://postgres@127.0.0.1:${port}/${database}`
}

export function stopPostgres({ dataDir }) {
  const bin = findPgBin()
  if (!bin || !isRunning(bin, dataDir)) return
  log("Stopping PostgreSQL")
  asPostgres(path.join(bin, "pg_ctl"), ["-D", dataDir, "-m", "fast", "-w", "stop"], { quiet: true, check: false })
}

/** `pg_ctl start` on 127.0.0.1 with the socket in the data folder, the log in server.log, waiting up to 60 s. */
function pgCtlStart(bin, dataDir, options) {
  const listen = `-c listen_addresses=127.0.0.1 -c unix_socket_directories=${dataDir}`
  const args = ["-D", dataDir, "-l", path.join(dataDir, "server.log"), "-w", "-t", "60", "-o", `${options} ${listen}`]
  asPostgres(path.join(bin, "pg_ctl"), [...args, "start"], { quiet: true })
}
