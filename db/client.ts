import { Kysely, PostgresDialect } from "kysely"
import pg from "pg"
import type { Database } from "./types"

// bigint columns (sample and mark times in ms) fit a JS number exactly: parse them as numbers, not strings.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value))

export type Db = Kysely<Database>

const globalForDb = globalThis as unknown as {
  straightawayPool?: pg.Pool
  straightawayDb?: Db
  straightawayReadDb?: Db
}

/** How the app's connections name themselves (pg_stat_activity.application_name). */
const APPLICATION_NAME = "straightaway"
export const READ_APPLICATION_NAME = "straightaway-replica-reads"

function createPool(connectionString = process.env.DATABASE_URL, applicationName = APPLICATION_NAME) {
  if (!connectionString) throw new Error("DATABASE_URL is not set")
  const pool = new pg.Pool({
    connectionString,
    application_name: applicationName,
    max: Number(process.env.DATABASE_POOL_MAX ?? 10),
    // A database that does not answer fails the request (a 503) instead of queueing it for ever.
    connectionTimeoutMillis: Number(process.env.DATABASE_CONNECT_TIMEOUT_MS ?? 5000),
  })
  // An idle connection the server dropped (restart, failover) emits "error" on the pool: without a listener that
  // is an uncaught exception. pg removes the broken client itself; later queries open fresh connections.
  pool.on("error", (error) => {
    console.error("[straightaway] an idle database connection was lost:", error.message)
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
    dialect: new PostgresDialect({ pool: createPool(replicaUrl, READ_APPLICATION_NAME) }),
  })
  return globalForDb.straightawayReadDb
}

export function createDb(connectionString?: string): Db {
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool: createPool(connectionString) }) })
}
