import { spawn, spawnSync } from "node:child_process"
import crypto from "node:crypto"
import fs from "node:fs"
import path from "node:path"

export const root = path.resolve(import.meta.dirname, "..", "..")

const toStderr = () => process.env.STRAIGHTAWAY_LOG_STDERR === "1"

export function log(message) {
  ;(toStderr() ? process.stderr : process.stdout).write(`[straightaway] ${message}\n`)
}

/** Child output: inherited, or all of it on stderr when our stdout is reserved for a result (`stdout: true` keeps it). */
function childStdio(quiet, keepStdout = false) {
  if (quiet) return "pipe"
  return toStderr() && !keepStdout ? ["inherit", 2, 2] : "inherit"
}

/** Runs a command to completion, inheriting output unless quiet; throws on a non-zero exit when check. */
export function run(cmd, args, { quiet = false, check = true, env, cwd = root, stdout = false } = {}) {
  const res = spawnSync(cmd, args, { cwd, env: env ?? process.env, stdio: childStdio(quiet, stdout), encoding: "utf8" })
  if (check && res.status !== 0) {
    if (quiet) process.stderr.write(`${res.stdout ?? ""}${res.stderr ?? ""}`)
    throw new Error(`${cmd} ${args.join(" ")} exited with ${res.status ?? res.signal}`)
  }
  return res
}

/** Starts a long-running child that is stopped with us. */
export function startChild(cmd, args, { env, name } = {}) {
  const child = spawn(cmd, args, { cwd: root, env: env ?? process.env, stdio: childStdio(false) })
  child.on("exit", (code, signal) => {
    if (!child.expectedExit) log(`${name ?? cmd} exited (${code ?? signal})`)
  })
  return child
}

export function stopChild(child, signal = "SIGTERM") {
  if (!child || child.exitCode !== null) return Promise.resolve()
  child.expectedExit = true
  return new Promise((resolve) => {
    const timer = setTimeout(() => child.kill("SIGKILL"), 10_000)
    child.once("exit", () => {
      clearTimeout(timer)
      resolve()
    })
    child.kill(signal)
  })
}

function fingerprint(paths) {
  const hash = crypto.createHash("sha256")
  const walk = (p) => {
    if (!fs.existsSync(p)) return
    const st = fs.statSync(p)
    if (st.isDirectory()) {
      for (const name of fs.readdirSync(p).sort()) {
        if (name === "node_modules" || name === ".next" || name.startsWith(".data") || name === "sw.js") continue
        walk(path.join(p, name))
      }
    } else {
      hash.update(`${path.relative(root, p)}:${st.size}:${st.mtimeMs}\n`)
    }
  }
  for (const p of paths) walk(path.join(root, p))
  return hash.digest("hex")
}

/** npm ci when node_modules is missing or older than the lock file. */
export function ensurePackages() {
  const lock = path.join(root, "package-lock.json")
  const marker = path.join(root, "node_modules", ".package-lock.json")
  const stale = !fs.existsSync(marker) || fs.statSync(marker).mtimeMs < fs.statSync(lock).mtimeMs
  if (!stale) return
  log("Installing packages (npm ci)")
  run("npm", ["ci", "--no-audit", "--no-fund"])
}

const BUILD_INPUTS = [
  "app",
  "components",
  "lib",
  "db",
  "workers",
  "public",
  "proxy.ts",
  "instrumentation.ts",
  "scripts/build-sw.mjs",
  "scripts/build-early.mjs",
  "scripts/gen-api-routes.mjs",
  "next.config.mjs",
  "tailwind.config.ts",
  "postcss.config.mjs",
  "tsconfig.json",
  "package-lock.json",
]

/** next build (plus the service worker) when the build is missing or its inputs changed. */
export function ensureBuild() {
  const stamp = path.join(root, ".next", "straightaway-build-stamp")
  const want = fingerprint(BUILD_INPUTS)
  if (
    fs.existsSync(stamp) &&
    fs.readFileSync(stamp, "utf8") === want &&
    fs.existsSync(path.join(root, ".next", "BUILD_ID"))
  ) {
    log("Build is up to date")
    return
  }
  log("Building the app (next build)")
  run("npm", ["run", "--silent", "build"])
  fs.writeFileSync(stamp, want)
}

/**
 * How the app's server is started (`node ...SERVER_ARGS`). V8's own young generation (16 MB a half), and the old
 * generation collected once it has grown by half rather than by up to four times:
 * - With a smaller young generation (2 MB a half, as before) every request still in flight is copied at each minor
 *   collection and much of it promoted: 8 closed-loop sample batches cost 126 to 146 µs of scavenging a batch,
 *   against 43 here (`node --trace-gc`, the same load).
 * - Exports keep the old generation busy: a 360,000-sample export's rows and pieces build up there until a full
 *   collection, which by V8's default growth came at about 200 MB of heap (exportPeakRssMb360k 290 to 298 MB with
 *   2 MB halves, 321 MB with 16). Growing by half, it comes at about 75 MB: 186 MB peak.
 */
export const SERVER_ARGS = ["--max-semi-space-size=16", "--heap-growing-percent=50", "scripts/server.mjs"]

export function npx(bin) {
  return path.join(root, "node_modules", ".bin", bin)
}
