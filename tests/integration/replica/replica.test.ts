// Read replica (issue 10, README "Scaling out"): with DATABASE_REPLICA_URL set, the numbers, the review queue, the
// drive and job lists and the Roads reads come from a streaming standby; writes, and what a request reads back
// after it writes, stay on the primary. `npm test` starts the standby (pg_basebackup -R from the test cluster) and
// a second app that reads from it (TEST_REPLICA_BASE_URL); the suites' own app reads the primary only, and is the
// control here. Proof that a read came from the standby: with the standby's replay paused, a drive written
// meanwhile is missing from the second app's lists and present in the first app's; once replay resumes and the
// standby has caught up, both answer the same.
import { sql } from "kysely"
import { afterAll, beforeAll, describe, expect, it } from "vitest"
import { createDb, READ_APPLICATION_NAME, type Db } from "@/db/client"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { newJobBody } from "../../helpers/jobs"

const replicaBaseUrl = process.env.TEST_REPLICA_BASE_URL
const standbyUrl = process.env.TEST_REPLICA_DATABASE_URL

/** The list and analytics reads that go to the replica, as a shop lead asks for them. */
const READS = [
  "/api/review",
  "/api/numbers?days=730",
  "/api/numbers?days=730&format=csv",
  "/api/drives",
  "/api/drives?status=finished",
  "/api/jobs",
  "/api/roads",
]

let standby: Db
let shop: TestShop
let primaryApp: ApiClient
let replicaApp: ApiClient
let seed = 500

async function caughtUp() {
  const { rows } = await sql<{ lsn: string }>`select pg_current_wal_lsn()::text as lsn`.execute(testDb())
  const until = Date.now() + 20_000
  while (Date.now() < until) {
    const { rows: r } = await sql<{
      ok: boolean
    }>`select pg_last_wal_replay_lsn() >= ${rows[0]!.lsn}::pg_lsn as ok`.execute(standby)
    if (r[0]!.ok) return
    await new Promise((res) => setTimeout(res, 100))
  }
  throw new Error("the standby did not catch up within 20 s")
}

async function importHarshDrive(client: ApiClient) {
  // The generator's "harsh" pattern: a drive the review queue holds (harsh events).
  const res = await client.post("/api/drives/import", generateDrive({ seed: seed++, minutes: 16, pattern: "harsh" }))
  expect(res.status).toBe(201)
  return res.body.drive.id as string
}

beforeAll(async () => {
  if (!replicaBaseUrl || !standbyUrl) {
    throw new Error(
      "TEST_REPLICA_BASE_URL and TEST_REPLICA_DATABASE_URL are not set: run this suite through `npm test` (not with TEST_REPLICA=0), which starts the standby and the app that reads from it.",
    )
  }
  standby = createDb(standbyUrl)
  shop = await createTestShop("Replica")
  primaryApp = await signedIn(shop.lead)
  replicaApp = await signedIn(shop.lead, replicaBaseUrl)
  const tech = await signedIn(shop.tech)
  await importHarshDrive(tech)
  await importHarshDrive(tech)
  const job = await primaryApp.post("/api/jobs", newJobBody())
  expect(job.status).toBe(201)
  await caughtUp()
})

afterAll(async () => {
  if (standby) {
    await sql`select pg_wal_replay_resume()`.execute(standby).catch(() => {})
    await standby.destroy()
  }
})

describe("reads with a replica configured", () => {
  it("the standby is a streaming standby of the test cluster", async () => {
    const { rows } = await sql<{ recovery: boolean }>`select pg_is_in_recovery() as recovery`.execute(standby)
    expect(rows[0]!.recovery).toBe(true)
    const { rows: primary } = await sql<{ recovery: boolean; senders: number }>`
      select pg_is_in_recovery() as recovery, (select count(*)::int from pg_stat_replication where state = 'streaming') as senders`.execute(
      testDb(),
    )
    expect(primary[0]).toEqual({ recovery: false, senders: 1 })
  })

  it("answers the list and analytics reads exactly as the primary does once the standby has caught up", async () => {
    for (const path of READS) {
      const [fromPrimary, fromReplica] = [await primaryApp.get(path), await replicaApp.get(path)]
      expect(fromPrimary.status, path).toBe(200)
      expect(fromReplica.text, path).toBe(fromPrimary.text)
    }
    // Not an empty match: the queue holds the two harsh drives, the job list the job.
    expect((await replicaApp.get("/api/review")).body.drives).toHaveLength(2)
    expect((await replicaApp.get("/api/jobs")).body.jobs).toHaveLength(1)
  })

  it("reads the lists from the standby: with replay paused they miss a drive written meanwhile; writes and their read-back still go to the primary", async () => {
    await sql`select pg_wal_replay_pause()`.execute(standby)
    try {
      const until = Date.now() + 10_000
      for (;;) {
        const { rows } = await sql<{ state: string }>`select pg_get_wal_replay_pause_state() as state`.execute(standby)
        if (rows[0]!.state === "paused") break
        if (Date.now() > until) throw new Error("the standby's replay did not pause")
        await new Promise((res) => setTimeout(res, 50))
      }
      // A write through the app that reads from the standby: stored on the primary and read back from it.
      const id = await importHarshDrive(await signedIn(shop.tech, replicaBaseUrl))
      const detail = await replicaApp.get(`/api/drives/${id}`)
      expect(detail.status).toBe(200)
      expect(detail.body.drive.id).toBe(id)
      const job = await replicaApp.post("/api/jobs", newJobBody({ customer: { name: "Invented Paused Customer" } }))
      expect(job.status).toBe(201)
      expect(job.body.job.customer.name).toBe("Invented Paused Customer")

      const ids = (res: { body: { drives: { id: string }[] } }) => res.body.drives.map((d) => d.id)
      expect(ids(await primaryApp.get("/api/review"))).toContain(id)
      expect(ids(await replicaApp.get("/api/review"))).not.toContain(id)
      expect(ids(await primaryApp.get("/api/drives"))).toContain(id)
      expect(ids(await replicaApp.get("/api/drives"))).not.toContain(id)
      expect((await primaryApp.get("/api/jobs")).body.jobs).toHaveLength(2)
      expect((await replicaApp.get("/api/jobs")).body.jobs).toHaveLength(1)
      expect((await replicaApp.get("/api/numbers?days=730")).text).not.toBe(
        (await primaryApp.get("/api/numbers?days=730")).text,
      )
      // The CSV (a COPY on a raw connection of the read pool) too.
      expect((await primaryApp.get("/api/numbers?days=730&format=csv")).text).toContain(id)
      expect((await replicaApp.get("/api/numbers?days=730&format=csv")).text).not.toContain(id)
      // The pages read the same way: the review page of the app on the standby does not link the new drive yet.
      expect((await primaryApp.get("/review")).text).toContain(`/drives/${id}`)
      expect((await replicaApp.get("/review")).text).not.toContain(`/drives/${id}`)
    } finally {
      await sql`select pg_wal_replay_resume()`.execute(standby)
    }
    await caughtUp()
    for (const path of READS) expect((await replicaApp.get(path)).text, path).toBe((await primaryApp.get(path)).text)
    expect((await replicaApp.get("/api/review")).body.drives).toHaveLength(3)
  })

  it("the app's read connections are on the standby, and none of them on the primary", async () => {
    const names = async (db: Db) =>
      (
        await sql<{
          name: string
        }>`select application_name as name from pg_stat_activity where datname = current_database()`.execute(db)
      ).rows.map((r) => r.name)
    expect(await names(standby)).toContain(READ_APPLICATION_NAME)
    expect(await names(testDb())).not.toContain(READ_APPLICATION_NAME)
  })
})
