import { randomUUID } from "node:crypto"
import { describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { parseDriveFile, type DriveFile } from "@/lib/drive-file"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { withCheckDigit } from "@/lib/vin"
import { createTestProfile, createTestShop, insertDrives, testDb } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { setUpShopTeam } from "../../helpers/team"
import { sampleRun, startDrive } from "./helpers"

const SECONDS_TOLERANCE = 2 // drive-file.md: checks allow +-2 s

describe("POST /api/drives and GET /api/drives", () => {
  const team = setUpShopTeam("Drives")

  it("makes a drive once per client id: the same id again is a 200 with the same drive", async () => {
    const id = randomUUID()
    const first = await team.tech.post("/api/drives", { id, vehicleDescription: "Invented Tarrow hatchback" })
    expect(first.status).toBe(201)
    expect(first.body.drive).toMatchObject({ id, status: "recording", driverId: team.shop.tech.id, verdict: null })
    const again = await team.tech.post("/api/drives", { id, vehicleDescription: "something else" })
    expect(again.status).toBe(200)
    expect(again.body.drive.vehicleDescription).toBe("Invented Tarrow hatchback")
    const rows = await testDb().selectFrom("drive").select("id").where("public_id", "=", id).execute()
    expect(rows).toHaveLength(1)
  })

  it("starts an unplanned drive from a call with no body at all (every field is optional)", async () => {
    const res = await team.tech.request("POST", "/api/drives")
    expect(res.status).toBe(201)
    expect(res.body.drive).toMatchObject({
      status: "recording",
      jobId: null,
      taskId: null,
      driverId: team.shop.tech.id,
    })
  })

  it("lists a job's vehicle with its drives", async () => {
    const job = await team.tech.post("/api/jobs", {
      roNumber: `RO-${randomUUID().slice(0, 6)}`,
      customer: { name: "Invented Customer" },
      vehicle: { vin: "1J9RP1A36A1644345", year: 2010, make: "Invented", model: "Larkin" },
      tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "replaced" }],
    })
    expect(job.status).toBe(201)
    const id = randomUUID()
    expect(
      (await team.tech.post("/api/drives", { id, jobId: job.body.job.id, taskId: job.body.job.tasks[0].id })).status,
    ).toBe(201)
    const listed = (await team.tech.get("/api/drives")).body.drives.find((d: { id: string }) => d.id === id)
    expect(listed.vehicle).toEqual({ year: 2010, make: "Invented", model: "Larkin" })
  })

  // Drive ids are per shop (DEVELOPERS.md "Drive ids: public per shop, internal across the server").
  it("makes another shop's drive with an id this shop uses its own new drive, showing nothing of this one", async () => {
    const drive = await startDrive(team.tech, { vehicleDescription: "Secret description 4471" })
    const other = await createTestShop("Other")
    const res = await (await signedIn(other.tech)).post("/api/drives", { id: drive.id })
    expect(res.status).toBe(201)
    expect(res.body.drive).toMatchObject({ id: drive.id, driverId: other.tech.id, vehicleDescription: null })
    expect(res.text).not.toContain("Secret description 4471")
    expect(res.text).not.toContain(team.shop.tech.id)
    // this shop's drive is as it was
    expect((await team.tech.get(`/api/drives/${drive.id}`)).body.drive).toMatchObject({
      vehicleDescription: "Secret description 4471",
      driverId: team.shop.tech.id,
    })
  })

  it("freezes the default profile when none is named, and a shop profile by key", async () => {
    const plain = await startDrive(team.tech)
    expect(plain.profile).toMatchObject({ minSpeedMph: 35, leadGapFt: { min: 100, max: 165 }, maxSpeedMph: null })
    const { versionId } = await createTestProfile(team.shop.shopId, `slow-${randomUUID().slice(0, 6)}`, {
      minSpeedMph: 30,
    })
    const key = (
      await testDb()
        .selectFrom("condition_profile_version as v")
        .innerJoin("condition_profile as p", "p.id", "v.profile_id")
        .select("p.key")
        .where("v.id", "=", versionId)
        .executeTakeFirstOrThrow()
    ).key
    const keyed = await startDrive(team.tech, { profileKey: key })
    expect(keyed.profile).toMatchObject({ minSpeedMph: 30, minQualifyingMinutes: 10 })
    expect(keyed.profileVersionId).toBe(versionId)
    const bad = await team.tech.post("/api/drives", { id: randomUUID(), profileKey: "no-such-profile" })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty(["profileKey"])
  })

  it("answers 400 naming a job of another shop, and 403 to a co-driver starting a drive", async () => {
    const res = await team.tech.post("/api/drives", { id: randomUUID(), jobId: randomUUID() })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty(["jobId"])
    const co = await signedIn(team.shop.codriver)
    expect((await co.post("/api/drives", { id: randomUUID() })).status).toBe(403)
  })

  it("lists newest first with filters and a cursor; a co-driver sees only drives naming them", async () => {
    const s = await createTestShop("List")
    const t = await signedIn(s.tech)
    const made: string[] = []
    for (let i = 0; i < 3; i++) made.push((await startDrive(t, i === 1 ? { coDriverId: s.codriver.id } : {})).id)
    const all = await t.get("/api/drives")
    expect(all.status).toBe(200)
    expect(all.body.drives.map((d: { id: string }) => d.id)).toEqual([...made].reverse())
    const co = await signedIn(s.codriver)
    const mine = await co.get("/api/drives")
    expect(mine.body.drives.map((d: { id: string }) => d.id)).toEqual([made[1]])
    await t.post(`/api/drives/${made[0]}/finish`)
    const finished = await t.get("/api/drives?status=finished")
    expect(finished.body.drives.map((d: { id: string }) => d.id)).toEqual([made[0]])
    const notMet = await t.get("/api/drives?verdict=not_met")
    expect(notMet.body.drives.map((d: { id: string }) => d.id)).toEqual([made[0]])
    expect((await t.get("/api/drives?verdict=great")).status).toBe(400)
    expect((await t.get("/api/drives?cursor=nonsense")).status).toBe(400)
    const other = await signedIn((await createTestShop("Elsewhere")).lead)
    expect((await other.get("/api/drives")).body.drives).toEqual([])
  })

  it("pages with the cursor without skipping or repeating a drive", async () => {
    const s = await createTestShop("Paging")
    const ids = Array.from({ length: 55 }, () => randomUUID())
    await insertDrives(
      s,
      ids.map((id) => ({ public_id: id })),
    )
    const t = await signedIn(s.tech)
    const page1 = await t.get("/api/drives")
    expect(page1.body.drives).toHaveLength(50)
    expect(page1.body.nextCursor).toEqual(expect.any(String))
    const page2 = await t.get(`/api/drives?cursor=${encodeURIComponent(page1.body.nextCursor)}`)
    expect(page2.body.drives).toHaveLength(5)
    expect(page2.body.nextCursor).toBeNull()
    const seen = [...page1.body.drives, ...page2.body.drives].map((d: { id: string }) => d.id)
    expect(new Set(seen)).toEqual(new Set(ids))
  })

  it("answers 401 without a session", async () => {
    expect((await new ApiClient().get("/api/drives")).status).toBe(401)
  })
})

describe("GET /api/drives/:id", () => {
  it("shows the drive to its shop, 404 to another shop and to a co-driver not named", async () => {
    const shop = await createTestShop("Get")
    const tech = await signedIn(shop.tech)
    const drive = await startDrive(tech)
    const mine = await tech.get(`/api/drives/${drive.id}`)
    expect(mine.status).toBe(200)
    expect(mine.body.drive.id).toBe(drive.id)
    expect(mine.body.score.verdict).toBe("not_met")
    expect((await (await signedIn(shop.lead)).get(`/api/drives/${drive.id}`)).status).toBe(200)
    expect((await (await signedIn(shop.codriver)).get(`/api/drives/${drive.id}`)).status).toBe(404)
    const other = await signedIn((await createTestShop("Nosy")).admin)
    const res = await other.get(`/api/drives/${drive.id}`)
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe("not_found")
    expect((await other.get(`/api/drives/${drive.id}/score`)).status).toBe(404)
    expect((await other.get(`/api/drives/${drive.id}/file`)).status).toBe(404)
    expect((await tech.get(`/api/drives/not-a-uuid`)).status).toBe(404)
  })
})

describe("marks", () => {
  it("stores each mark id once however often it is sent", async () => {
    const shop = await createTestShop("Marks")
    const tech = await signedIn(shop.tech)
    const drive = await startDrive(tech, { coDriverId: shop.codriver.id })
    const co = await signedIn(shop.codriver)
    const t0 = Date.UTC(2026, 0, 1, 10)
    const marks = [
      { id: randomUUID(), t: t0 + 1000, kind: "lead-on", gapFt: 130 },
      { id: randomUUID(), t: t0 + 2000, kind: "gap", gapFt: 140 },
      { id: randomUUID(), t: t0 + 2000, kind: "note", text: "Lead changed lanes" },
    ]
    const first = await co.post(`/api/drives/${drive.id}/marks`, { marks })
    expect(first.status).toBe(200)
    expect(first.body).toEqual({ accepted: 3, duplicates: 0 })
    const again = await co.post(`/api/drives/${drive.id}/marks`, {
      marks: [...marks, { id: randomUUID(), t: t0 + 3000, kind: "lead-off" }],
    })
    expect(again.body).toEqual({ accepted: 1, duplicates: 3 })
    const rows = await testDb()
      .selectFrom("mark")
      .selectAll()
      .where("drive_id", "=", internalDriveId(shop.shopId, drive.id))
      .orderBy("t")
      .orderBy("seq")
      .execute()
    expect(rows.map((r) => r.kind)).toEqual(["lead-on", "gap", "note", "lead-off"])
    expect(rows[1]!.gap_ft).toBe(140)
    const bad = await co.post(`/api/drives/${drive.id}/marks`, { marks: [{ id: randomUUID(), t: t0, kind: "gap" }] })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty(["marks.0.gapFt"])
    const undo = await co.delete(`/api/drives/${drive.id}/marks/${marks[2]!.id}`)
    expect(undo.status).toBe(204)
    expect(
      await testDb()
        .selectFrom("mark")
        .select("id")
        .where("drive_id", "=", internalDriveId(shop.shopId, drive.id))
        .execute(),
    ).toHaveLength(3)
  })
})

describe("finish, score and file", () => {
  const team = setUpShopTeam("Finish")
  const file: DriveFile = generateDrive({ seed: 4242, minutes: 18, pattern: "met" })

  async function recordWholeDrive() {
    const drive = await startDrive(team.tech)
    for (let i = 0; i < file.samples.length; i += 300) {
      const res = await team.tech.post(`/api/drives/${drive.id}/samples`, {
        batchId: `b${i}`,
        samples: file.samples.slice(i, i + 300),
      })
      expect(res.status).toBe(200)
    }
    const res = await team.tech.post(`/api/drives/${drive.id}/marks`, {
      marks: file.marks.map((m) => ({ ...m, id: randomUUID() })),
    })
    expect(res.body.accepted).toBe(file.marks.length)
    return drive
  }

  it("scores on finish, stores the verdict, and the score equals scoreDrive of the exported file", async () => {
    const drive = await recordWholeDrive()
    const expected = scoreDrive(file)
    expect(expected.verdict).toBe("met") // the generator's "met" pattern
    const finished = await team.tech.post(`/api/drives/${drive.id}/finish`)
    expect(finished.status).toBe(200)
    expect(finished.body.drive).toMatchObject({ status: "finished", verdict: "met" })
    expect(finished.body.drive.finishedAt).toEqual(expect.any(String))
    const score = await team.tech.get(`/api/drives/${drive.id}/score`)
    const exported = await team.tech.get(`/api/drives/${drive.id}/file?format=drive`)
    expect(exported.headers.get("content-disposition")).toMatch(/^attachment; filename="straightaway-.*\.drive\.json"$/)
    const parsed = parseDriveFile(JSON.parse(exported.text))
    expect(parsed.ok).toBe(true)
    if (!parsed.ok) return
    expect(parsed.file.samples).toHaveLength(file.samples.length)
    expect(parsed.file.marks).toHaveLength(file.marks.length)
    expect(score.body).toEqual(JSON.parse(JSON.stringify(scoreDrive(parsed.file))))
    expect(score.body.verdict).toBe(expected.verdict)
    expect(Math.abs(score.body.qualifyingSeconds - expected.qualifyingSeconds)).toBeLessThanOrEqual(SECONDS_TOLERANCE)
    const stored = await testDb()
      .selectFrom("score")
      .selectAll()
      .where("drive_id", "=", internalDriveId(team.shop.shopId, drive.id))
      .executeTakeFirstOrThrow()
    expect(stored.verdict).toBe("met")
  })

  it("exports GPX 1.1 and CSV as downloads", async () => {
    const drive = await recordWholeDrive()
    const gpx = await team.tech.get(`/api/drives/${drive.id}/file?format=gpx`)
    expect(gpx.status).toBe(200)
    expect(gpx.headers.get("content-type")).toMatch(/application\/gpx\+xml/)
    expect(gpx.headers.get("content-disposition")).toMatch(/\.gpx"$/)
    expect(gpx.text).toContain('xmlns="http://www.topografix.com/GPX/1/1"') // GPX 1.1 schema namespace
    // GPX carries the kept samples (those within the accuracy limit)
    expect(gpx.text.match(/<trkpt /g)?.length).toBe(scoreDrive(file).samplesUsed)
    const csv = await team.tech.get(`/api/drives/${drive.id}/file?format=csv`)
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/)
    expect(csv.text.trim().split(/\r?\n/)).toHaveLength(file.samples.length + 1)
    expect((await team.tech.get(`/api/drives/${drive.id}/file?format=kml`)).status).toBe(400)
  })

  it("moves the job to drive on start and to complete on a met finish", async () => {
    const vehicle = await testDb()
      .insertInto("vehicle")
      .values({ shop_id: team.shop.shopId, vin: withCheckDigit("0ZT7B2C40TS018342") })
      .returning("id")
      .executeTakeFirstOrThrow()
    const job = await testDb()
      .insertInto("job")
      .values({
        shop_id: team.shop.shopId,
        ro_number: `RO-${randomUUID().slice(0, 6)}`,
        customer_name: "Invented Customer",
        vehicle_id: vehicle.id,
      })
      .returning("id")
      .executeTakeFirstOrThrow()
    const task = await testDb()
      .insertInto("job_task")
      .values({
        shop_id: team.shop.shopId,
        job_id: job.id,
        sensor: "forward_radar",
        method: "dynamic",
        reason: "replaced",
      })
      .returning("id")
      .executeTakeFirstOrThrow()
    const drive = await startDrive(team.tech, { taskId: task.id })
    expect(drive.jobId).toBe(job.id)
    const status = async () =>
      (await testDb().selectFrom("job").select("status").where("id", "=", job.id).executeTakeFirstOrThrow()).status
    expect(await status()).toBe("drive")
    await team.tech.post(`/api/drives/${drive.id}/samples`, { batchId: "all", samples: file.samples })
    await team.tech.post(`/api/drives/${drive.id}/marks`, {
      marks: file.marks.map((m) => ({ ...m, id: randomUUID() })),
    })
    await team.tech.post(`/api/drives/${drive.id}/finish`)
    expect(await status()).toBe("complete")
    const short = await startDrive(team.tech, { taskId: task.id })
    expect(await status()).toBe("drive")
    await team.tech.post(`/api/drives/${short.id}/samples`, { batchId: "few", samples: sampleRun(20) })
    await team.tech.post(`/api/drives/${short.id}/finish`)
    expect(await status()).toBe("review")
  })

  it("lets only the driver or a lead finish", async () => {
    const drive = await startDrive(team.tech, { coDriverId: team.shop.codriver.id })
    expect((await (await signedIn(team.shop.codriver)).post(`/api/drives/${drive.id}/finish`)).status).toBe(403)
    expect((await (await signedIn(team.shop.lead)).post(`/api/drives/${drive.id}/finish`)).status).toBe(200)
  })
})

describe("POST /api/drives/import and POST /api/score", () => {
  it("imports a drive file as a finished, scored drive", async () => {
    const shop = await createTestShop("Import")
    const tech = await signedIn(shop.tech)
    const file = generateDrive({ seed: 99, minutes: 17, pattern: "unverified", profile: { minSpeedMph: 33 } })
    const res = await tech.post("/api/drives/import", file)
    expect(res.status).toBe(201)
    expect(res.body.drive).toMatchObject({ status: "finished", source: "import", verdict: "unverified" })
    expect(res.body.score).toEqual(JSON.parse(JSON.stringify(scoreDrive(file))))
    expect(res.body.drive.profile.minSpeedMph).toBe(33)
    const count = await testDb()
      .selectFrom("sample_decoded")
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .where("drive_id", "=", res.body.drive.id)
      .executeTakeFirstOrThrow()
    expect(Number(count.n)).toBe(file.samples.length)
  })

  it("answers 400 naming the path and problem of an invalid file, and stores nothing", async () => {
    const shop = await createTestShop("BadImport")
    const tech = await signedIn(shop.tech)
    const file = generateDrive({ seed: 5, minutes: 2, pattern: "never-cleared" }) as unknown as {
      samples: Array<Record<string, unknown>>
    }
    file.samples[3]!.lat = -91
    const res = await tech.post("/api/drives/import", file)
    expect(res.status).toBe(400)
    // drive-file.md: the API answers 400 with the CLI's message, e.g. `samples[3].lat: must be between -90 and 90`
    expect(res.body.error.message).toBe("samples[3].lat: must be between -90 and 90")
    expect(res.body.error.fields).toEqual({ "samples.3.lat": "must be between -90 and 90" })
    const drives = await testDb().selectFrom("drive").select("id").where("shop_id", "=", shop.shopId).execute()
    expect(drives).toHaveLength(0)
    const wrongFormat = await tech.post("/api/score", { format: "other/1", samples: [], marks: [] })
    expect(wrongFormat.status).toBe(400)
    expect(wrongFormat.body.error.fields).toHaveProperty(["format"])
  })

  it("scores a posted file without storing it", async () => {
    const shop = await createTestShop("Score")
    const co = await signedIn(shop.codriver)
    const file = generateDrive({ seed: 12, minutes: 16, pattern: "short" })
    const res = await co.post("/api/score", file)
    expect(res.status).toBe(200)
    expect(res.body).toEqual(JSON.parse(JSON.stringify(scoreDrive(file))))
    expect(res.body.verdict).toBe("short")
    expect(await testDb().selectFrom("drive").select("id").where("shop_id", "=", shop.shopId).execute()).toHaveLength(0)
  })
})
