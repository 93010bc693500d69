import { Kysely, PostgresDialect } from "kysely"
import pg from "pg"
import type { Database } from "./types"

// bigint columns (sample and mark times in ms) fit a JS number exactly: parse them as numbers, not strings.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value))

export type Db = Kysely<Database>

const globalForDb = globalThis as unknown as { straightawayPool?: pg.Pool; straightawayDb?: Db }

function createPool(connectionString = process.env.DATABASE_URL) {
  if (!connectionString) throw new Error("DATABASE_URL is not set")
  const pool = new pg.Pool({
    connectionString,
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

export function createDb(connectionString?: string): Db {
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool: createPool(connectionString) }) })
}
