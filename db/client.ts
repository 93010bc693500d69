import { Kysely, PostgresDialect } from "kysely"
import pg from "pg"
import type { Database } from "./types"

// bigint columns (sample and mark times in ms) fit a JS number exactly: parse them as numbers, not strings.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value))

export type Db = Kysely<Database>

const globalForDb = globalThis as unknown as { straightawayPool?: pg.Pool; straightawayDb?: Db }

export function createPool(connectionString = process.env.DATABASE_URL) {
  if (!connectionString) throw new Error("DATABASE_URL is not set")
  return new pg.Pool({ connectionString, max: Number(process.env.DATABASE_POOL_MAX ?? 10) })
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
