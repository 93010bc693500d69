// The whole running product for the test and benchmark runs: a throwaway PostgreSQL cluster, the local fakes,
// migrations, a production build and `next start`, all on loopback. `stop()` takes it all down again.
import fs from "node:fs"
import path from "node:path"
import { appSecret, fakeServiceEnv, startFakes } from "./services.mjs"
import { resolveDataDir, startPostgres, startStandby, stopPostgres } from "./postgres.mjs"
import { ensureBuild, ensurePackages, log, npx, root, run, SERVER_ARGS, startChild, stopChild } from "./shell.mjs"

/**
 * `replica: { pgPort, port }` also starts a streaming standby of the cluster and a second `next start` on `port`
 * with DATABASE_REPLICA_URL naming the standby (returned as `replica: { baseUrl, databaseUrl }`); the first app
 * reads only the primary.
 */
export async function startStack({ name, port, pgPort, s3Port, smtpPort, extraEnv = {}, replica = null }) {
  ensurePackages()
  const dataRoot = path.join(root, `.${name}-data`)
  const pgDataDir = resolveDataDir(path.join(dataRoot, "pg"))
  const databaseUrl = startPostgres({ dataDir: pgDataDir, port: pgPort, database: `straightaway_${name}`, fresh: true })
  fs.rmSync(path.join(dataRoot, "fakes"), { recursive: true, force: true })
  const env = {
    ...process.env,
    ...fakeServiceEnv({ s3Port, smtpPort }),
    DATABASE_URL: databaseUrl,
    APP_SECRET: appSecret(dataRoot),
    APP_URL: `http://127.0.0.1:${port}`,
    TRUST_PROXY: "1",
    NODE_ENV: "production",
    ...extraEnv,
  }
  let fakes = null
  let server = null
  let replicaServer = null
  let replicaInfo = null
  const standbyDataDir = replica ? resolveDataDir(path.join(dataRoot, "pg-standby")) : null
  const stop = async () => {
    await stopChild(replicaServer)
    await stopChild(server)
    await stopChild(fakes)
    if (standbyDataDir) stopPostgres({ dataDir: standbyDataDir })
    stopPostgres({ dataDir: pgDataDir })
  }
  try {
    fakes = await startFakes({ s3Port, smtpPort, dir: path.join(dataRoot, "fakes") })
    run(npx("tsx"), ["db/migrate.ts"], { env })
    ensureBuild()
    server = startChild(process.execPath, SERVER_ARGS, {
      env: { ...env, HOSTNAME: "127.0.0.1", PORT: String(port) },
      name: "server",
    })
    if (replica) {
      const standbyUrl = startStandby({
        primaryPort: pgPort,
        dataDir: standbyDataDir,
        port: replica.pgPort,
        database: `straightaway_${name}`,
      })
      replicaServer = startChild(process.execPath, SERVER_ARGS, {
        env: {
          ...env,
          DATABASE_REPLICA_URL: standbyUrl,
          APP_URL: `http://127.0.0.1:${replica.port}`,
          HOSTNAME: "127.0.0.1",
          PORT: String(replica.port),
        },
        name: "server (reads from the standby)",
      })
      replicaInfo = { baseUrl: `http://127.0.0.1:${replica.port}`, databaseUrl: standbyUrl }
    }
    await waitForHttp(`http://127.0.0.1:${port}/api/health`, 60_000)
    if (replicaInfo) await waitForHttp(`${replicaInfo.baseUrl}/api/health`, 60_000)
  } catch (error) {
    log(`Set-up failed: ${error.message}`)
    await stop()
    throw error
  }
  return { env, baseUrl: `http://127.0.0.1:${port}`, replica: replicaInfo, server, stop }
}

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
