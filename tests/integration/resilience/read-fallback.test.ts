// Reads meant for the replica (db/client.ts readPool) fall back to the primary while the replica cannot be reached,
// then try the replica again. The "replica" here is a port nothing listens on: a refused connection, as after the
// standby stopped. The primary is the test cluster.
import net from "node:net"
import { Kysely, PostgresDialect, sql } from "kysely"
import pg from "pg"
import { afterAll, describe, expect, it } from "vitest"
import { readPool } from "@/db/client"
import type { Database } from "@/db/types"
import { testEnv } from "../../helpers/env"

/** A port that was free a moment ago: bound, read, released. */
async function closedPort(): Promise<number> {
  const server = net.createServer()
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve))
  const { port } = server.address() as net.AddressInfo
  await new Promise((resolve) => server.close(resolve))
  return port
}

const primary = new pg.Pool({ connectionString: testEnv().databaseUrl, max: 2 })
const pools: { end(): Promise<void> }[] = []

afterAll(async () => {
  await Promise.all(pools.map((p) => p.end()))
  await primary.end()
})

describe("reads while the replica is down", () => {
  it("answer from the primary, and a replica that cannot be reached is not asked again at once", async () => {
    const port = await closedPort()
    let primaryConnects = 0
    const pool = readPool(`postgres://postgres@127.0.0.1:${port}/postgres`, () => {
      primaryConnects++
      return primary
    })
    pools.push(pool)
    const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) })
    const first = await sql<{ port: number }>`select current_setting('port')::int as port`.execute(db)
    expect(first.rows[0]?.port).toBe(Number(new URL(testEnv().databaseUrl).port))
    expect(primaryConnects).toBe(1)
    await sql`select 1`.execute(db)
    expect(primaryConnects).toBe(2)
  })

  it("still fail a query with a real error (a bug is not hidden by the fallback)", async () => {
    const pool = readPool(testEnv().databaseUrl, () => primary)
    pools.push(pool)
    const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) })
    await expect(sql`select * from no_such_table`.execute(db)).rejects.toThrow(/no_such_table/)
  })
})
