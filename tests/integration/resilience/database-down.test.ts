// Issue 15: the database stopped and started again while a drive streams its samples. While it is down every
// answer is a 503 with Retry-After (never a 500), /api/health names the part that is down, the app recovers
// without a restart, and the drive ends up holding exactly its samples (retried batches are not doubled).
import { sql } from "kysely"
import { afterAll, describe, expect, it } from "vitest"
import { testDb } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"
// @ts-expect-error: the project's PostgreSQL helper is plain .mjs without types
import { startPostgres, stopPostgres } from "../../../scripts/lib/postgres.mjs"
import { createTestShop } from "../../helpers/db"
import { samplesOf, startDrive } from "../contract/world"

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

let cluster: { dataDir: string; port: number; database: string } | null = null
let stopped = false

async function health() {
  const res = await fetch(`${testEnv().baseUrl}/api/health`, { signal: AbortSignal.timeout(5000) })
  return { status: res.status, retryAfter: res.headers.get("retry-after"), body: await res.json() }
}

afterAll(async () => {
  // Whatever happened above, the cluster is left running for the suites after this one.
  if (cluster && stopped) startPostgres({ ...cluster, fresh: false })
})

describe("the database stopped and started mid-stream", () => {
  it("503 with Retry-After while down, recovery without a restart, every sample stored once", async () => {
    const db = testDb()
    const dataDir = (await sql<{ d: string }>`select current_setting('data_directory') as d`.execute(db)).rows[0]!.d
    const url = new URL(testEnv().databaseUrl)
    cluster = { dataDir, port: Number(url.port), database: url.pathname.slice(1) }

    const shop = await createTestShop("Database down")
    const tech = await signedIn(shop.tech)
    const driveId = await startDrive(tech)
    const samples = samplesOf(900, 31)
    const batches = Array.from({ length: 45 }, (_, i) => ({
      batchId: `down-${i}`,
      samples: samples.slice(i * 20, i * 20 + 20),
    }))

    const seen: Array<{ status: number; retryAfter: string | null; code?: string }> = []
    let acknowledged = 0
    const sender = (async () => {
      for (const batch of batches) {
        // The recorder's outbox: a 5xx or a network error is retried, the same batch id each time.
        for (let attempt = 0; ; attempt++) {
          const res = await tech.post(`/api/drives/${driveId}/samples`, batch).catch(() => null)
          if (res)
            seen.push({ status: res.status, retryAfter: res.headers.get("retry-after"), code: res.body?.error?.code })
          if (res?.status === 200) break
          if (attempt > 400) throw new Error("the batch was never taken")
          await sleep(100)
        }
        acknowledged++
        await sleep(30)
      }
    })()

    while (acknowledged < 10) await sleep(20)
    stopPostgres({ dataDir })
    stopped = true
    await sleep(1500)
    const down = await health()
    expect(down.status).toBe(503)
    expect(Number(down.retryAfter)).toBeGreaterThan(0)
    expect(down.body.error.code).toBe("service_unavailable")
    expect(down.body.error.fields.database).toBe("is not answering")
    expect(down.body.error.fields.storage).toBeUndefined()
    const whileDown = await tech.get(`/api/drives/${driveId}`)
    expect(whileDown.status).toBe(503)
    expect(whileDown.headers.get("retry-after")).toBeTruthy()
    // Pages too: the calm page with a 503 and Retry-After (proxy.ts), signed in or not, never a 500.
    for (const [who, path] of [
      [tech, `/drives/${driveId}`],
      [tech, "/drives"],
      [tech, "/record"],
      [new ApiClient(), "/sign-in"],
    ] as const) {
      const pageDown = await who.get(path)
      expect(pageDown.status, path).toBe(503)
      expect(Number(pageDown.headers.get("retry-after")), path).toBeGreaterThan(0)
      expect(pageDown.headers.get("content-type"), path).toContain("text/html")
      expect(pageDown.text, path).toContain('data-testid="service-unavailable"')
    }
    await sleep(1500)
    startPostgres({ ...cluster, fresh: false })
    stopped = false

    await sender
    const up = await health()
    expect(up.status).toBe(200)
    expect(up.body.parts).toEqual({ database: "up", storage: "up" })
    for (const [who, path] of [
      [tech, "/record"],
      [new ApiClient(), "/sign-in"],
    ] as const) {
      const pageUp = await who.get(path)
      expect(pageUp.status, path).toBe(200)
      expect(pageUp.text, path).not.toContain('data-testid="service-unavailable"')
    }

    const failures = seen.filter(
      (s) => s.status !== 200 && !(s.status === 503 && Number(s.retryAfter) > 0 && s.code === "service_unavailable"),
    )
    expect(failures).toEqual([])
    expect(seen.filter((s) => s.status === 503).length).toBeGreaterThan(0)

    const stored = await testDb()
      .selectFrom("sample_decoded")
      .select(["t"])
      .where("drive_id", "=", driveId)
      .orderBy("t")
      .execute()
    expect(stored.map((r) => Number(r.t))).toEqual(samples.map((s) => s.t))
  }, 180_000)
})
