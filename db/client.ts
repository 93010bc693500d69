import { Kysely, PostgresDialect } from "kysely"
import pg from "pg"
import { isDatabaseUnavailable } from "@/lib/db-errors"
import type { Database } from "./types"

// bigint columns (sample and mark times in ms) fit a JS number exactly: parse them as numbers, not strings.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value))

export type Db = Kysely<Database>

const globalForDb = globalThis as unknown as {
  straightawayPool?: pg.Pool
  straightawayDb?: Db
  straightawayReadDb?: Db
  straightawayReadPool?: ReturnType<typeof readPool>
  straightawayExportDb?: Db
}

/** How the app's connections name themselves (pg_stat_activity.application_name). */
const APPLICATION_NAME = "straightaway"
export const READ_APPLICATION_NAME = "straightaway-replica-reads"
const EXPORT_APPLICATION_NAME = "straightaway-downloads"

function createPool(
  connectionString = process.env.DATABASE_URL,
  applicationName = APPLICATION_NAME,
  connectTimeoutMs = Number(process.env.DATABASE_CONNECT_TIMEOUT_MS ?? 5000),
  { max = Number(process.env.DATABASE_POOL_MAX ?? 10) } = {},
) {
  if (!connectionString) throw new Error("DATABASE_URL is not set")
  const pool = new pg.Pool({
    connectionString,
    application_name: applicationName,
    max,
    // A database that does not answer fails the request (a 503) instead of queueing it for ever.
    connectionTimeoutMillis: connectTimeoutMs,
  })
  // An idle connection the server dropped (restart, failover) emits "error" on the pool: without a listener that
  // is an uncaught exception. pg removes the broken client itself; later queries open fresh connections.
  pool.on("error", (error) => {
    console.error("[straightaway] an idle database connection was lost:", error.message)
  })
  // The same for a connection in use between two queries (a transaction waiting on its caller): the server ending
  // it is an "error" event on the client with no query to reject. Logged here; the next query on it fails, and
  // the pool drops the broken client when it comes back.
  pool.on("connect", (client) => {
    client.on("error", (error) => {
      console.error("[straightaway] a database connection in use was lost:", error.message)
    })
  })
  return pool
}

/** One pool per process (Next dev reloads modules; the pool survives on globalThis). */
export function getPool(): pg.Pool {
  globalForDb.straightawayPool ??= createPool()
  return globalForDb.straightawayPool
}

export function getDb(): Db {
  globalForDb.straightawayDb ??= new Kysely<Database>({ dialect: new PostgresDialect({ pool: getPool() }) })
  return globalForDb.straightawayDb
}

/**
 * Where analytics and list reads go (`dbRead`): the streaming replica named by DATABASE_REPLICA_URL, else the
 * primary. Only for reads that may be a moment behind: never inside a write, never for what a request reads back
 * after it writes, never for what decides a write (access checks before a change, claims, locks). Call sites:
 * the numbers, the review queue, drive and job lists, the Roads page (DEVELOPERS.md "Read replica").
 */
export function getReadDb(): Db {
  const replicaUrl = process.env.DATABASE_REPLICA_URL
  if (!replicaUrl) return getDb()
  globalForDb.straightawayReadDb ??= new Kysely<Database>({
    dialect: new PostgresDialect({ pool: replicaReadPool(replicaUrl) }),
  })
  return globalForDb.straightawayReadDb
}

/** getReadDb's pool when DATABASE_REPLICA_URL is set: one per process, shared with readConnections. */
function replicaReadPool(replicaUrl: string) {
  globalForDb.straightawayReadPool ??= readPool(replicaUrl, getPool)
  return globalForDb.straightawayReadPool
}

/** Where a raw pg connection comes from: a pool, or readPool's replica-or-primary. The taker must release it. */
export interface ConnectionSource {
  connect(): Promise<pg.PoolClient>
}

/**
 * Raw connections of getReadDb()'s pool, for what Kysely cannot say (COPY ... TO STDOUT: db/queries/numbers.ts
 * openNumbersCsv), with the same replica-or-primary choice. Release each with `release()`, or `release(error)`
 * when it may be broken (the pool then drops it).
 */
export const readConnections: ConnectionSource = {
  connect() {
    const replicaUrl = process.env.DATABASE_REPLICA_URL
    return replicaUrl ? replicaReadPool(replicaUrl).connect() : getPool().connect()
  },
}

/** How long reads stay on the primary after the replica could not be reached, before it is tried again. */
const REPLICA_RETRY_MS = Number(process.env.DATABASE_REPLICA_RETRY_MS ?? 30_000)

/**
 * A pool for reads that may lag: a connection from the replica while it can be reached; when it cannot (stopped,
 * promoted away, network), from the primary for REPLICA_RETRY_MS, then the replica is tried again. A lost replica
 * costs one short connect timeout, never a 503 while the primary is up.
 */
export function readPool(replicaUrl: string, primary: () => pg.Pool) {
  const replica = createPool(
    replicaUrl,
    READ_APPLICATION_NAME,
    Number(process.env.DATABASE_REPLICA_CONNECT_TIMEOUT_MS ?? 1000),
  )
  let replicaDownUntil = 0
  return {
    async connect(): Promise<pg.PoolClient> {
      if (Date.now() >= replicaDownUntil) {
        try {
          return await replica.connect()
        } catch (error) {
          if (!isDatabaseUnavailable(error)) throw error
          replicaDownUntil = Date.now() + REPLICA_RETRY_MS
          console.error("[straightaway] the read replica cannot be reached; reads go to the primary:", String(error))
        }
      }
      return primary().connect()
    },
    end: () => replica.end(),
  }
}

/**
 * Where streamed downloads (drive file, GPX, CSV) hold their snapshot: a pool of their own
 * (`DATABASE_EXPORT_POOL_MAX`, default 3), so however many people download, and however slowly their phones read,
 * the app's own pool stays free for everything else. Downloads past the limit wait for a connection up to the
 * connect timeout, then get the 503 with Retry-After any lost connection gets.
 */
export function getExportDb(): Db {
  globalForDb.straightawayExportDb ??= new Kysely<Database>({
    dialect: new PostgresDialect({
      pool: createPool(process.env.DATABASE_URL, EXPORT_APPLICATION_NAME, undefined, {
        max: Number(process.env.DATABASE_EXPORT_POOL_MAX ?? 3),
      }),
    }),
  })
  return globalForDb.straightawayExportDb
}

export function createDb(connectionString?: string): Db {
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool: createPool(connectionString) }) })
}
