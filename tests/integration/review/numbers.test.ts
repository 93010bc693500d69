import { randomUUID } from "node:crypto"
import { sql } from "kysely"
import { describe, expect, it } from "vitest"
import { listDrivesForNumbers } from "@/db/queries/numbers"
import { numbersDriveFromRow, numbersToCsv } from "@/lib/numbers"
import { scoreDrive, type Score } from "@/lib/scoring"
import { generateDrive, PATTERN_MIN_MINUTES } from "@/lib/tracks"
import { createTestProfile, createTestShop, insertDrive, insertDrives, testDb } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { signedIn } from "../../helpers/http"
import { insertScoredDrive } from "./fixtures"

describe("GET /api/numbers", () => {
  it("counts the shop's finished drives only, and exports them as CSV", async () => {
    const shop = await createTestShop("Numbers")
    const other = await createTestShop("NumbersOther")
    const met = await insertScoredDrive(shop, { pattern: "met", seed: 501 })
    await insertScoredDrive(shop, { pattern: "short", seed: 502 })
    await insertScoredDrive(shop, { pattern: "never-cleared", seed: 503 })
    await insertScoredDrive(shop, { pattern: "short", seed: 504, status: "recording" })
    await insertScoredDrive(other, { pattern: "short", seed: 505 })

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/numbers?days=30")
    expect(res.status).toBe(200)
    expect(res.body.drives).toBe(3)
    const week = res.body.verdictMix.at(-1)
    expect(week.met + week.short + week.not_met + week.unverified).toBe(3)
    expect(res.body.perTechnician).toHaveLength(1)
    expect(res.body.perTechnician[0].drives).toBe(3)
    const reasons = Object.fromEntries(
      res.body.topReasons.map((r: { key: string; drives: number }) => [r.key, r.drives]),
    )
    expect(reasons.cleared).toBe(1)
    const ttc = res.body.timeToClear[0]
    expect(ttc.drives).toBe(3)
    expect(ttc.cleared).toBe(2)

    const csv = await lead.get("/api/numbers?format=csv&days=30")
    expect(csv.status).toBe(200)
    expect(csv.headers.get("content-type")).toContain("text/csv")
    const lines = csv.text.trim().split("\r\n")
    expect(lines).toHaveLength(4)
    expect(csv.text).toContain(met.id)
    // Durations are whole seconds rounded down (the figure formatDuration writes), headed as seconds.
    expect(lines[0]).toBe(
      "drive_id,finished_at,technician,profile,verdict,time_to_learn_complete_seconds,qualifying_time_before_learn_complete_seconds,following_time_before_learn_complete_seconds,drive_time_seconds,harsh_events,review,unmet_conditions",
    )
    expect(csv.text).toContain(`,met,${Math.floor(met.score.clearedAtSeconds! + 1e-6)},`)
  })

  it("groups weeks on the shop's calendar: a drive just before midnight Sunday, shop time, is in the week before", async () => {
    const shop = await createTestShop("NumbersZone")
    // IANA tz database: America/Regina keeps UTC-6 all year (no daylight saving), so shop midnight is 06:00 UTC.
    const admin = await signedIn(shop.admin)
    expect((await admin.patch("/api/shop/settings", { timeZone: "America/Regina" })).status).toBe(200)
    // The Monday 7 to 13 days ago on the shop's calendar (the drives stay inside the 30-day period).
    const today = new Date(Date.now() - 6 * 3_600_000) // the shop's wall clock, read as UTC
    const daysBack = 7 + ((today.getUTCDay() + 6) % 7) // days since this week's Monday, plus a week
    const monday = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate() - daysBack)
    const mondayIso = new Date(monday).toISOString().slice(0, 10)
    const weekBefore = new Date(monday - 7 * 86_400_000).toISOString().slice(0, 10)
    const sunday = new Date(monday - 86_400_000).toISOString().slice(0, 10)
    // Sunday 23:30 shop time = Monday 05:30 UTC (UTC would put it in the Monday's week); Monday 00:30 = 06:30 UTC.
    const lateSunday = await insertScoredDrive(shop, {
      pattern: "met",
      seed: 511,
      finishedAt: new Date(monday + 5.5 * 3_600_000),
    })
    await insertScoredDrive(shop, { pattern: "short", seed: 512, finishedAt: new Date(monday + 6.5 * 3_600_000) })

    const lead = await signedIn(shop.lead)
    const res = await lead.get("/api/numbers?days=30")
    expect(res.status).toBe(200)
    expect(res.body.verdictMix).toEqual([
      { weekStart: weekBefore, total: 1, met: 1, short: 0, not_met: 0, unverified: 0 },
      { weekStart: mondayIso, total: 1, met: 0, short: 1, not_met: 0, unverified: 0 },
    ])
    const csv = await lead.get("/api/numbers?format=csv&days=30")
    const line = csv.text.split("\r\n").find((l: string) => l.startsWith(lateSunday.id))
    expect(line).toContain(`,${sunday}T23:30:00-06:00,`)
  })

  it("is for leads, and refuses a bad period", async () => {
    const shop = await createTestShop("NumbersRoles")
    expect((await (await signedIn(shop.tech)).get("/api/numbers")).status).toBe(403)
    const bad = await (await signedIn(shop.lead)).get("/api/numbers?days=abc")
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.days).toBeDefined()
  })
})

// ---- the CSV, streamed out of PostgreSQL (db/queries/numbers.ts openNumbersCsv) ------------------------------

/**
 * US daylight saving time of `year`, as instants: it starts on the second Sunday of March at 2:00 local standard
 * time and ends on the first Sunday of November at 2:00 local daylight time (15 U.S.C. 260a, as amended by the
 * Energy Policy Act of 2005). For US Central time (UTC-6 standard, UTC-5 daylight) that is 08:00 and 07:00 UTC.
 */
function centralDst(year: number) {
  const sunday = (month: number, nth: number) => {
    const first = new Date(Date.UTC(year, month, 1)).getUTCDay()
    return 1 + ((7 - first) % 7) + 7 * (nth - 1)
  }
  return {
    starts: Date.UTC(year, 2, sunday(2, 2), 8),
    ends: Date.UTC(year, 10, sunday(10, 1), 7),
  }
}

/** A score's JSON as the trigger copies it onto the drive (migration 2026_12_02_1330), from a real score. */
function scoreJson(base: Score, over: Partial<Record<string, unknown>>) {
  return JSON.stringify({ ...base, ...over })
}

describe("GET /api/numbers?format=csv, streamed out of PostgreSQL", () => {
  it("is byte for byte numbersToCsv over listDrivesForNumbers: awkward names, missing times, both ends of daylight saving", async () => {
    const shop = await createTestShop("NumbersCsvCopy")
    const other = await createTestShop("NumbersCsvCopyOther")
    const admin = await signedIn(shop.admin)
    expect((await admin.patch("/api/shop/settings", { timeZone: "America/Chicago" })).status).toBe(200)
    const db = testDb()
    // Names that need quoting (comma, quote, line breaks), that a spreadsheet would run (= - @), that are not
    // ASCII, and that are empty.
    const names = [
      'Ana, "Bo" Díaz',
      "Line one\nLine two",
      "Carriage\r\nreturn",
      "=2+3 Zoë",
      "-dash, and comma",
      "Søren 山田",
      "",
    ]
    const drivers = names.map((name, i) => ({
      id: randomUUID(),
      shop_id: shop.shopId,
      email: `csv-${i}-${randomUUID().slice(0, 8)}@test.invalid`,
      name,
      role: "technician" as const,
      password_hash: "x",
    }))
    await db.insertInto("app_user").values(drivers).execute()
    const versions: string[] = []
    for (const [i, name] of ['Radar, "front"', "Cam\nera", "@home", "Ünïcode profile"].entries()) {
      const { profileId, versionId } = await createTestProfile(shop.shopId, `csv-${i}`)
      await db.updateTable("condition_profile").set({ name }).where("id", "=", profileId).execute()
      versions.push(versionId)
    }

    const { starts, ends } = centralDst(new Date().getUTCFullYear() - 1)
    const finishedAt = [
      starts - 1, // 01:59:59.999 CST: the last whole second before the clocks go forward
      starts + 500, // 03:00:00.500 CDT
      ends - 30 * 60_000 + 250, // 01:30:00.250 CDT (-05:00)
      ends + 30 * 60_000 + 999, // 01:30:00.999 CST (-06:00): the same wall time an hour later
      Date.UTC(new Date().getUTCFullYear(), 0, 1, 3), // 21:00 on 31 December, shop time
      ...Array.from({ length: 9 }, (_, i) => Date.now() - (i + 1) * 3 * 3_600_000 - 123),
    ]
    const base = scoreDrive(generateDrive({ seed: 611, pattern: "met", minutes: PATTERN_MIN_MINUTES.met }))
    const figures: Array<Record<string, unknown>> = [
      { clearedAtSeconds: null, conditions: [{ key: "cleared", met: false }] },
      { clearedAtSeconds: 629.9999995, durationSeconds: 1199.9999999, followingSecondsBeforeClear: 59.5 },
      { clearedAtSeconds: 630.96, qualifyingSecondsBeforeClear: 0.0000001, harshEvents: { accel: 2, decel: 1 } },
      {
        clearedAtSeconds: null,
        conditions: [
          { key: "time-limit", met: false },
          { key: "verified", met: true },
          { key: "data-gaps", met: false },
        ],
      },
      { conditions: [{ key: "=formula-like", met: false }] },
      { conditions: [{ key: "with, comma", met: false }, { met: false }, { key: "harsh-events", met: false }] },
      { clearedAtSeconds: 0 },
    ]
    const rows = finishedAt.map((at, i) => ({
      finished_at: new Date(at),
      status: "finished" as const,
      verdict: i === 3 ? null : (["met", "short", "not_met", "unverified"] as const)[i % 4],
      review_status: ([null, "approved", "redo"] as const)[i % 3],
      // the shop's people, and one from another shop (no name in this shop: "Former staff")
      driver_id: i === 6 ? other.tech.id : drivers[i % drivers.length]!.id,
      profile_version_id: i % 5 === 4 ? null : versions[i % versions.length]!,
    }))
    const inserted = await insertDrives(shop, rows)
    await db
      .insertInto("score")
      .values(
        inserted.map((d, i) => ({
          drive_id: d.internalId,
          shop_id: shop.shopId,
          verdict: "met" as const,
          result: scoreJson(base, figures[i % figures.length]!),
        })),
      )
      .execute()
    // Not in the CSV: a drive still recording, a finished one never scored, one before the period, another shop's.
    await insertDrives(shop, [{ status: "recording" }, { status: "finished", verdict: "met", finished_at: new Date() }])
    const old = await insertDrive(shop, {
      status: "finished",
      verdict: "met",
      finished_at: new Date(Date.now() - 800 * 86_400_000),
    })
    const stranger = await insertDrive(other, { status: "finished", verdict: "met", finished_at: new Date() })
    await db
      .insertInto("score")
      .values(
        [
          [old.internalId, shop.shopId],
          [stranger.internalId, other.shopId],
        ].map(([drive_id, shop_id]) => ({
          drive_id: drive_id!,
          shop_id: shop_id!,
          verdict: "met" as const,
          result: scoreJson(base, {}),
        })),
      )
      .execute()

    const lead = await signedIn(shop.lead)
    const res = await lead.getBytes("/api/numbers?format=csv&days=730")
    expect(res.status).toBe(200)
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8")
    const listed = await listDrivesForNumbers(db, shop.shopId, new Date(Date.now() - 730 * 86_400_000))
    expect(listed.map((r) => r.public_id).sort()).toEqual(inserted.map((d) => d.id).sort())
    const expected = numbersToCsv(listed.map(numbersDriveFromRow), "America/Chicago")
    expect(res.bytes.toString("utf8")).toBe(expected)
    expect(res.bytes.equals(Buffer.from(expected, "utf8"))).toBe(true)

    // What the reference (so the stream) holds: not an empty match.
    const text = res.bytes.toString("utf8")
    const line = (id: string) => text.slice(text.indexOf(id)).split("\r\n")[0]!
    const day = (ms: number) => new Date(ms - 6 * 3_600_000).toISOString().slice(0, 10)
    expect(line(inserted[0]!.id)).toContain(`,${day(starts)}T01:59:59-06:00,`)
    expect(line(inserted[1]!.id)).toContain(`,${day(starts)}T03:00:00-05:00,`)
    expect(line(inserted[2]!.id)).toContain(`,${day(ends)}T01:30:00-05:00,`)
    expect(line(inserted[3]!.id)).toContain(`,${day(ends)}T01:30:00-06:00,`)
    expect(text).toContain(`"Ana, ""Bo"" Díaz"`)
    expect(text).toContain(`"Line one\nLine two"`)
    expect(text).toContain(`"Carriage\r\nreturn"`)
    expect(text).toContain(`,'=2+3 Zoë,`)
    expect(text).toContain(`,"'-dash, and comma",`)
    expect(text).toContain(`,Former staff,`)
    expect(text).toContain(`,Profile set on the drive,`)
    expect(text).toContain(`"Radar, ""front"""`)
    expect(line(inserted[0]!.id)).toMatch(/,,\d+,\d+,\d+,\d+,,cleared$/) // no learn-complete time: an empty cell
    expect(line(inserted[1]!.id)).toContain(",630,")
    expect(text).toContain(`,time-limit data-gaps`)
    expect(text).toContain(`,"with, comma  harsh-events"`)
    expect(text).toContain(`,'=formula-like`)
    expect(text).not.toContain(old.id)
    expect(text).not.toContain(stranger.id)
  })
})

describe("the streamed CSV's connection", () => {
  it("leaves the app its connections, and no COPY running, however many readers stall or go away part-way", async () => {
    const shop = await createTestShop("NumbersCsvAbort")
    // 20,000 drives, the CSV's limit: 2.6 MB.
    await sql`
      insert into drive (id, public_id, shop_id, profile, driver_id, status, verdict, finished_at, scored_at)
      select drive_internal_id(${shop.shopId}::uuid, g.pid), g.pid, ${shop.shopId}::uuid, '{}'::jsonb, ${shop.tech.id},
             'finished', 'met', now() - make_interval(secs => g.i * 60), now()
      from (select i, gen_random_uuid() as pid from generate_series(1, 20000) i) g`.execute(testDb())
    const lead = await signedIn(shop.lead)
    const download = (signal?: AbortSignal) =>
      fetch(`${testEnv().baseUrl}/api/numbers?format=csv&days=730`, {
        headers: { cookie: lead.cookie!, "x-forwarded-for": lead.address },
        signal,
      })
    const copiesRunning = async () => {
      const { rows } = await sql<{ n: number }>`
        select count(*)::int as n from pg_stat_activity where state <> 'idle' and query ilike 'copy (%'`.execute(
        testDb(),
      )
      return rows[0]!.n
    }
    const noCopyRunning = async () => {
      const until = Date.now() + 10_000
      let running = await copiesRunning()
      while (running > 0 && Date.now() < until) {
        await new Promise((r) => setTimeout(r, 200))
        running = await copiesRunning()
      }
      return running === 0
    }

    // More downloads than the app's pool has connections (DATABASE_POOL_MAX, 10 by default), each read one chunk
    // and then left waiting: a connection kept by each would leave the app without one (the numbers' JSON would
    // get a 503 after 5 s). (The connection goes back once PostgreSQL has sent the CSV into Node's buffer, but on
    // loopback the sockets alone hold 2.6 MB, so this does not tell that apart from a connection held to the end.)
    const slow = []
    for (let i = 0; i < 12; i++) {
      const res = await download()
      expect(res.status).toBe(200)
      const reader = res.body!.getReader()
      const first = await reader.read()
      expect(first.done).toBe(false)
      slow.push({ reader, parts: [first.value!] })
    }
    expect(await noCopyRunning()).toBe(true)
    expect((await lead.get("/api/numbers?days=30")).status).toBe(200)
    // The slow readers still get the whole CSV: the header, 20,000 drives, the last line end.
    for (const { reader, parts } of slow) {
      for (let r = await reader.read(); !r.done; r = await reader.read()) parts.push(r.value)
      const text = Buffer.concat(parts).toString("utf8")
      expect(text.split("\r\n")).toHaveLength(20_000 + 2)
    }

    // Readers that go away part-way: the rest of each COPY is read and dropped, and the connection goes back whole.
    for (let i = 0; i < 12; i++) {
      const abort = new AbortController()
      const res = await download(abort.signal)
      expect(res.status).toBe(200)
      const reader = res.body!.getReader()
      expect((await reader.read()).done).toBe(false)
      abort.abort()
      await reader.cancel().catch(() => {})
    }
    expect(await noCopyRunning()).toBe(true)
    expect((await lead.get("/api/numbers?days=30")).status).toBe(200)
    const whole = await lead.get("/api/numbers?format=csv&days=730")
    expect(whole.status).toBe(200)
    expect(whole.text.split("\r\n")).toHaveLength(20_000 + 2)
  })
})
