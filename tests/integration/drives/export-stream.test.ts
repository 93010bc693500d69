// GET /api/drives/:id/file streams from a database cursor (db/queries/drive-export.ts): what it sends must be
// byte for byte what the whole-file functions make of the same drive (lib/export toGpx, toCsv; JSON.stringify),
// refusals must still come before the first byte in the error shape, and every download must give its
// connection back, finished or not.
import { randomUUID } from "node:crypto"
import { internalDriveId } from "@/lib/drive-id"
import { sql } from "kysely"
import { beforeAll, describe, expect, it } from "vitest"
import { loadDriveFile } from "@/db/queries/drive-file"
import type { DriveFile } from "@/lib/drive-file"
import { toCsv, toGpx } from "@/lib/export"
import { EXPORT_FETCH_ROWS } from "@/db/queries/drive-export"
import { generateDrive } from "@/lib/tracks"
import { testEnv } from "../../helpers/env"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { startDrive } from "./helpers"

function expectErrorShape(res: { status: number; body: any }, status: number) {
  expect(res.status).toBe(status)
  expect(res.body).toEqual({
    error: expect.objectContaining({ code: expect.any(String), message: expect.any(String) }),
  })
}

/** 20 min at 10 Hz (12,000 samples: several FETCHes), every 23rd sample beyond the 30 m accuracy limit, two data gaps. */
function bigFile(): DriveFile {
  const file = generateDrive({ seed: 1010, minutes: 20, hz: 10, pattern: "met", dataGaps: 2, speedMissingShare: 0.05 })
  return {
    ...file,
    samples: file.samples.map((s, i) => (i % 23 === 0 ? { ...s, accuracy: 64 } : s)),
    marks: [
      ...file.marks,
      { t: file.samples[0]!.t - 2000, kind: "note", text: 'before the start, "quoted" & <angled>' },
    ],
  }
}

describe("GET /api/drives/:id/file streamed", () => {
  const team = setUpShopTeam("Export stream")
  let other: TestShop
  let imported: string
  let recorded: string
  beforeAll(async () => {
    other = await createTestShop("Export stream other")
    const file = bigFile()
    expect(file.samples.length).toBeGreaterThan(2 * EXPORT_FETCH_ROWS)
    const res = await team.tech.post("/api/drives/import", file)
    expect(res.status).toBe(201)
    imported = res.body.drive.id
    // A drive recorded through the API, still recording (its file is read while nothing is finished).
    const small = generateDrive({ seed: 77, minutes: 3, pattern: "never-cleared" })
    const drive = await startDrive(team.tech)
    recorded = drive.id
    for (let i = 0; i < small.samples.length; i += 50) {
      expect(
        (
          await team.tech.post(`/api/drives/${drive.id}/samples`, {
            batchId: `b${i}`,
            samples: small.samples.slice(i, i + 50),
          })
        ).status,
      ).toBe(200)
    }
    const marks = [
      { id: randomUUID(), t: small.samples[10]!.t + 500, kind: "lead-on", gapFt: 135 },
      { id: randomUUID(), t: small.samples[90]!.t, kind: "note", text: "mid\u2011drive" },
    ]
    expect((await team.tech.post(`/api/drives/${drive.id}/marks`, { marks })).status).toBe(200)
  })

  for (const which of ["imported", "recorded"] as const) {
    it(`sends the ${which} drive's GPX, CSV and drive file exactly as the whole-file functions write them`, async () => {
      const id = which === "imported" ? imported : recorded
      const file = await loadDriveFile(testDb(), internalDriveId(team.shop.shopId, id), team.shop.shopId)
      const { vehicle_description } = await testDb()
        .selectFrom("drive")
        .select("vehicle_description")
        .where("public_id", "=", id)
        .executeTakeFirstOrThrow()
      const gpx = await team.tech.get(`/api/drives/${id}/file?format=gpx`)
      expect(gpx.status).toBe(200)
      expect(gpx.text).toBe(
        toGpx(file, { name: vehicle_description ?? `Drive ${id.slice(0, 8)}`, creator: "Straightaway" }),
      )
      const csv = await team.tech.get(`/api/drives/${id}/file?format=csv`)
      expect(csv.status).toBe(200)
      expect(csv.text).toBe(toCsv(file))
      const whole = await team.tech.get(`/api/drives/${id}/file`)
      expect(whole.status).toBe(200)
      expect(whole.text).toBe(JSON.stringify(file))
      if (which === "imported") {
        expect(csv.text).toContain(",false,accuracy\r\n") // the inaccurate samples are there, marked as left out
        expect(gpx.text.match(/<trkseg>/g)!.length).toBeGreaterThanOrEqual(3) // the two data gaps split the track
      }
    })
  }

  it("refuses before the first byte in the error shape: another shop's drive, no drive, a bad format, no session", async () => {
    const stranger = await signedIn(other.tech)
    for (const format of ["gpx", "csv", "drive"]) {
      expectErrorShape(await stranger.get(`/api/drives/${imported}/file?format=${format}`), 404)
      expectErrorShape(await team.tech.get(`/api/drives/${randomUUID()}/file?format=${format}`), 404)
      expectErrorShape(await new ApiClient().get(`/api/drives/${imported}/file?format=${format}`), 401)
    }
    expectErrorShape(await team.tech.get(`/api/drives/${imported}/file?format=kml`), 400)
  })

  it("gives the connection back when the reader goes away part-way, and when it reads to the end", async () => {
    // More downloads than the app's pool has connections (DATABASE_POOL_MAX, 10 by default): one kept per
    // download would leave the last ones waiting for a connection that never comes (a 503 after 5 s).
    for (let i = 0; i < 12; i++) {
      const abort = new AbortController()
      const res = await fetch(`${testEnv().baseUrl}/api/drives/${imported}/file?format=gpx`, {
        headers: { cookie: team.tech.cookie!, "x-forwarded-for": team.tech.address },
        signal: abort.signal,
      })
      expect(res.status).toBe(200)
      const reader = res.body!.getReader()
      const first = await reader.read()
      expect(first.done).toBe(false)
      abort.abort()
      await reader.cancel().catch(() => {})
    }
    const after = await team.tech.get(`/api/drives/${imported}/file?format=csv`)
    expect(after.status).toBe(200)
    // No export transaction is left open on the server.
    const until = Date.now() + 10_000
    let open = -1
    while (Date.now() < until) {
      const { rows } = await sql<{ n: number }>`
        select count(*)::int as n from pg_stat_activity where state = 'idle in transaction' and query ilike 'fetch forward%'`.execute(
        testDb(),
      )
      open = rows[0]!.n
      if (open === 0) break
      await new Promise((r) => setTimeout(r, 200))
    }
    expect(open).toBe(0)
  })

  it("holds its snapshot on a pool of its own, not on the app's", async () => {
    expect((await team.tech.get(`/api/drives/${imported}/file?format=csv`)).status).toBe(200)
    // The download's connection stays idle in its pool for a while (pg's idleTimeoutMillis, 10 s).
    const { rows } = await sql<{ n: number }>`
      select count(*)::int as n from pg_stat_activity where application_name = 'straightaway-downloads'`.execute(
      testDb(),
    )
    expect(rows[0]!.n).toBeGreaterThan(0)
  })
})
