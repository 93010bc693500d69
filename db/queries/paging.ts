import { sql } from "kysely"

/**
 * A timestamp as a keyset cursor value, with PostgreSQL's microseconds: a JS Date keeps only
 * milliseconds, and a cursor rounded down would repeat the last row on the next page.
 */
export function cursorTimeSql(column: "drive.created_at" | "drive.finished_at") {
  return sql<string>`to_char(${sql.ref(column)} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`
}

/** A page from a query run with `limit(size + 1)`: the extra row only says that another page follows. */
export function keysetPage<R>(rows: R[], size: number, cursorOf: (last: R) => string | null) {
  const page = rows.slice(0, size)
  const last = page.at(-1)
  return { rows: page, nextCursor: rows.length > size && last !== undefined ? cursorOf(last) : null }
}
