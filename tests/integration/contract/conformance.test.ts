// Route-by-route conformance with shared/specs/api.md (version 1): every path and method of its table
// answers with the status codes it names and the JSON fields it names; every 4xx is in the error shape.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { testDb } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { ALWAYS_CONDITIONS, SCORE_FIELDS } from "../../helpers/score"
import { createJob, newJobBody } from "../../helpers/jobs"
import { completeUpload, startUpload, TINY_PNG, uploadFile } from "../jobs/helpers"
import {
  buildWorld,
  countShopRows,
  onePagePdf,
  driveFile,
  expectErrorShape,
  importDrive,
  recordedDrive,
  samplesOf,
  startDrive,
  type World,
} from "./world"

let w: World

beforeAll(async () => {
  w = await buildWorld("Conformance")
})

// shared/specs/drive-file.md "Score": the fields a score always has.
function expectScore(score: any) {
  for (const f of SCORE_FIELDS) expect(score, `score.${f}`).toHaveProperty(f)
  expect(["met", "short", "not_met", "unverified"]).toContain(score.verdict)
  expect(Object.keys(score.harshEvents).sort()).toEqual(["accel", "decel"])
  const keys = score.conditions.map((c: { key: string }) => c.key)
  for (const k of ALWAYS_CONDITIONS) expect(keys).toContain(k)
}

const USER_FIELDS = ["id", "email", "name", "role", "shopId"]

describe("sessions", () => {
  it("POST /api/session: 200 {user} with an HttpOnly, SameSite=Lax cookie", async () => {
    const client = new ApiClient()
    const res = await client.post("/api/session", { email: w.shop.tech.email, password: w.shop.tech.password })
    expect(res.status).toBe(200)
    expect(Object.keys(res.body.user)).toEqual(expect.arrayContaining(USER_FIELDS))
    expect(res.body.user).toMatchObject({ id: w.shop.tech.id, role: "technician", shopId: w.shop.shopId })
    const cookie = res.headers.get("set-cookie") ?? ""
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
  })

  it("POST /api/session: one 401 message for an unknown e-mail and a wrong password, then 429", async () => {
    const client = new ApiClient()
    const unknown = await client.post("/api/session", {
      email: `nobody-${randomUUID().slice(0, 6)}@test.invalid`,
      password: "whatever-it-is-1",
    })
    const wrong = await client.post("/api/session", { email: w.shop.lead.email, password: "not-the-password-1" })
    expectErrorShape(unknown, 401)
    expectErrorShape(wrong, 401)
    expect(unknown.body.error.message).toBe(wrong.body.error.message)
    let last = wrong
    for (let i = 0; i < 10 && last.status !== 429; i++)
      last = await client.post("/api/session", { email: w.shop.lead.email, password: "not-the-password-1" })
    expectErrorShape(last, 429)
    expect(last.body.error.code).toBe("too_many_attempts")
  })

  it("GET /api/session: 200 {user:{id,email,name,role,shopId}}; DELETE: 204 and the session is gone", async () => {
    const client = await signedIn(w.shop.admin)
    const me = await client.get("/api/session")
    expect(me.status).toBe(200)
    expect(Object.keys(me.body.user)).toEqual(expect.arrayContaining(USER_FIELDS))
    const cookie = client.cookie
    const out = await client.delete("/api/session")
    expect(out.status).toBe(204)
    expect(out.text).toBe("")
    const stale = new ApiClient()
    stale.cookie = cookie
    expectErrorShape(await stale.get("/api/session"), 401)
  })
})

describe("drives", () => {
  it("POST /api/drives: 201 {drive}; the same client id again is a 200 with the same drive; no job = unplanned", async () => {
    const id = randomUUID()
    const first = await w.c.technician.post("/api/drives", { id, vehicleDescription: "2018 Invented Orvel" })
    expect(first.status).toBe(201)
    expect(first.body.drive).toMatchObject({
      id,
      jobId: null,
      taskId: null,
      status: "recording",
      driverId: w.shop.tech.id,
    })
    const again = await w.c.technician.post("/api/drives", { id, vehicleDescription: "2018 Invented Orvel" })
    expect(again.status).toBe(200)
    expect(again.body.drive).toEqual(first.body.drive)
    expect(await testDb().selectFrom("drive").select("id").where("public_id", "=", id).execute()).toHaveLength(1)
  })

  it("POST /api/drives with a job and task: 201, the drive on that job", async () => {
    const job = await createJob(w.c.shop_lead)
    const res = await w.c.technician.post("/api/drives", {
      id: randomUUID(),
      jobId: job.id,
      taskId: job.tasks[0].id,
      coDriverId: w.shop.codriver.id,
    })
    expect(res.status).toBe(201)
    expect(res.body.drive).toMatchObject({ jobId: job.id, taskId: job.tasks[0].id, coDriverId: w.shop.codriver.id })
  })

  it("GET /api/drives: 200 {drives, nextCursor}, newest first", async () => {
    const res = await w.c.shop_lead.get("/api/drives")
    expect(res.status).toBe(200)
    expect(res.body).toHaveProperty("drives")
    expect(res.body).toHaveProperty("nextCursor")
    const times = res.body.drives.map((d: { createdAt: string }) => Date.parse(d.createdAt))
    expect(times.length).toBeGreaterThan(2)
    expect([...times].sort((a, b) => b - a)).toEqual(times)
    for (const d of res.body.drives) expect(d.id).toMatch(/^[0-9a-f-]{36}$/)
    const filtered = await w.c.shop_lead.get("/api/drives?status=finished")
    expect(filtered.status).toBe(200)
    expect(filtered.body.drives.length).toBeGreaterThan(0)
    for (const d of filtered.body.drives) expect(d.status).toBe("finished")
  })

  it("GET /api/drives/:id: 200 {drive, score}", async () => {
    const res = await w.c.technician.get(`/api/drives/${w.finished.id}`)
    expect(res.status).toBe(200)
    expect(res.body.drive.id).toBe(w.finished.id)
    expectScore(res.body.score)
    const recording = await w.c.technician.get(`/api/drives/${w.recording.id}`)
    expect(recording.status).toBe(200)
    expectScore(recording.body.score)
  })

  it("POST samples and marks: 200 {accepted, duplicates}", async () => {
    const id = await startDrive(w.c.technician)
    const samples = samplesOf(30)
    const s = await w.c.technician.post(`/api/drives/${id}/samples`, { batchId: "c-1", samples })
    expect(s.status).toBe(200)
    expect(s.body).toMatchObject({ accepted: 30, duplicates: 0 })
    const m = await w.c.technician.post(`/api/drives/${id}/marks`, {
      marks: [{ id: randomUUID(), t: samples[3]!.t, kind: "lead-on" }],
    })
    expect(m.status).toBe(200)
    expect(m.body).toMatchObject({ accepted: 1, duplicates: 0 })
  })

  it("POST finish: 200 {drive, score} and the score is stored", async () => {
    const { id } = await recordedDrive(w.c.technician, null)
    const res = await w.c.technician.post(`/api/drives/${id}/finish`)
    expect(res.status).toBe(200)
    expect(res.body.drive).toMatchObject({ id, status: "finished", verdict: res.body.score.verdict })
    expectScore(res.body.score)
    const stored = await testDb()
      .selectFrom("score")
      .select(["verdict", "result"])
      .where("drive_id", "=", internalDriveId(w.shop.shopId, id))
      .executeTakeFirstOrThrow()
    expect(stored.verdict).toBe(res.body.score.verdict)
    expect(stored.result).toEqual(res.body.score)
  })

  it("POST samples and marks: 409 once the drive is finished and reviewed", async () => {
    const id = await importDrive(w.c.technician, 21)
    expect((await w.c.shop_lead.post(`/api/drives/${id}/review`, { decision: "approve" })).status).toBe(200)
    const before = await countShopRows(w.shop.shopId)
    expectErrorShape(
      await w.c.shop_lead.post(`/api/drives/${id}/samples`, {
        batchId: "late",
        samples: samplesOf(3, 4, Date.UTC(2027, 0, 1)),
      }),
      409,
    )
    expectErrorShape(
      await w.c.shop_lead.post(`/api/drives/${id}/marks`, {
        marks: [{ id: randomUUID(), t: Date.UTC(2027, 0, 1), kind: "note", text: "late" }],
      }),
      409,
    )
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })

  it("GET score: 200, the score as drive-file.md defines it, the stored one once finished", async () => {
    const res = await w.c.co_driver.get(`/api/drives/${w.finished.id}/score`)
    expect(res.status).toBe(200)
    expectScore(res.body)
    const stored = await testDb()
      .selectFrom("score")
      .select("result")
      .where("drive_id", "=", internalDriveId(w.shop.shopId, w.finished.id))
      .executeTakeFirstOrThrow()
    expect(res.body).toEqual(stored.result)
  })

  it("GET file: the drive file by default, GPX 1.1 and CSV, each as a download", async () => {
    const drive = await w.c.technician.get(`/api/drives/${w.finished.id}/file`)
    expect(drive.status).toBe(200)
    expect(drive.headers.get("content-disposition")).toMatch(/^attachment; filename=".+\.drive\.json"$/)
    const file = JSON.parse(drive.text)
    expect(file.format).toBe("straightaway.drive/1")
    expect(file.samples.length).toBe(driveFile(9).samples.length)
    const gpx = await w.c.technician.get(`/api/drives/${w.finished.id}/file?format=gpx`)
    expect(gpx.status).toBe(200)
    expect(gpx.headers.get("content-type")).toContain("application/gpx+xml")
    expect(gpx.headers.get("content-disposition")).toMatch(/^attachment; filename=".+\.gpx"$/)
    // GPX 1.1 schema (topografix.com/GPX/1/1): the root element names the 1.1 namespace and version.
    expect(gpx.text).toContain('xmlns="http://www.topografix.com/GPX/1/1"')
    expect(gpx.text).toMatch(/<gpx[^>]*version="1.1"/)
    const csv = await w.c.technician.get(`/api/drives/${w.finished.id}/file?format=csv`)
    expect(csv.status).toBe(200)
    expect(csv.headers.get("content-type")).toContain("text/csv")
    expect(csv.headers.get("content-disposition")).toMatch(/^attachment; filename=".+\.csv"$/)
    expect(csv.text.trim().split(/\r?\n/).length).toBeGreaterThan(file.samples.length)
  })

  it("POST /api/drives/import: 201 {drive, score}, stored finished and scored; an invalid file is a 400 naming the path", async () => {
    const res = await w.c.technician.post(
      `/api/drives/import?jobId=${w.bareJob.id}&taskId=${w.bareJob.taskId}`,
      driveFile(13),
    )
    expect(res.status).toBe(201)
    expect(res.body.drive).toMatchObject({
      status: "finished",
      source: "import",
      jobId: w.bareJob.id,
      taskId: w.bareJob.taskId,
    })
    expectScore(res.body.score)
    expect(res.body.drive.verdict).toBe(res.body.score.verdict)
    const before = await countShopRows(w.shop.shopId)
    const bad = driveFile(13)
    ;(bad.samples[4] as { lat: number }).lat = 123
    const refused = await w.c.technician.post("/api/drives/import", bad)
    expectErrorShape(refused, 400)
    expect(refused.body.error.fields).toHaveProperty("samples.4.lat")
    expect(refused.body.error.message).toContain("samples")
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })

  it("POST /api/score: 200 score, nothing stored", async () => {
    const before = await countShopRows(w.shop.shopId)
    const res = await w.c.co_driver.post("/api/score", driveFile(17))
    expect(res.status).toBe(200)
    expectScore(res.body)
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })
})

describe("review", () => {
  it("GET /api/review: 200 {drives}, finished, not met or harsh, unreviewed, oldest first", async () => {
    const res = await w.c.shop_lead.get("/api/review")
    expect(res.status).toBe(200)
    expect(Array.isArray(res.body.drives)).toBe(true)
    expect(res.body.drives.map((d: { id: string }) => d.id)).toContain(w.finished.id)
    const times = res.body.drives.map((d: { finishedAt: string }) => Date.parse(d.finishedAt))
    expect([...times].sort((a, b) => a - b)).toEqual(times)
    for (const d of res.body.drives)
      expect(d.verdict !== "met" || d.harshEvents.accel + d.harshEvents.decel > 0).toBe(true)
  })

  it("POST review: 200 {drive}; redo needs a note and reopens the job", async () => {
    const job = await createJob(w.c.shop_lead)
    const id = await importDrive(w.c.technician, 23, `?jobId=${job.id}&taskId=${job.tasks[0].id}`)
    const noNote = await w.c.shop_lead.post(`/api/drives/${id}/review`, { decision: "redo" })
    expectErrorShape(noNote, 400)
    expect(noNote.body.error.fields).toHaveProperty("note")
    const res = await w.c.shop_lead.post(`/api/drives/${id}/review`, {
      decision: "redo",
      note: "Hold 55 mph longer on the second stretch.",
    })
    expect(res.status).toBe(200)
    expect(res.body.drive).toMatchObject({ id, reviewStatus: "redo" })
    const jobNow = await w.c.shop_lead.get(`/api/jobs/${job.id}`)
    expect(jobNow.body.job.status).toBe("redo")
  })
})

describe("VIN", () => {
  // NHTSA, Outline for New Manufacturer Information p.18: 1J9RP1A36A1644345 has check digit 6 (sum 314, mod 11);
  // 49 CFR 565.15(b): position 7 alphabetic, so year code A is 2010 (not 1980).
  it("GET /api/vin/:vin: 200 with the check digit and model year of NHTSA's worked example", async () => {
    const vin = "1J9RP1A36A1644345"
    const res = await w.c.co_driver.get(`/api/vin/${vin}`)
    expect(res.status).toBe(200)
    expect(Object.keys(res.body)).toEqual(
      expect.arrayContaining(["vin", "valid", "checkDigit", "expectedCheckDigit", "modelYear", "problems"]),
    )
    expect(res.body).toMatchObject({
      vin,
      valid: true,
      checkDigit: "6",
      expectedCheckDigit: "6",
      modelYear: 2010,
      problems: [],
    })
    const wrong = await w.c.co_driver.get("/api/vin/1J9RP1A37A1644345")
    expect(wrong.status).toBe(200)
    expect(wrong.body).toMatchObject({ valid: false, checkDigit: "7", expectedCheckDigit: "6" })
  })

  it("GET /api/vin/:vin: a malformed VIN is still a 200, valid false, problems named", async () => {
    for (const bad of ["SHORT", "1ZT4R8AB0RW12345O", "%F0%9F%9A%97", "x".repeat(300)]) {
      const res = await w.c.technician.get(`/api/vin/${bad}`)
      expect(res.status, bad).toBe(200)
      expect(res.body.valid).toBe(false)
      expect(res.body.problems.length).toBeGreaterThan(0)
    }
  })
})

describe("jobs", () => {
  it("GET /api/jobs: 200 {jobs, nextCursor}; a cursor pages on", async () => {
    const res = await w.c.technician.get("/api/jobs?limit=1")
    expect(res.status).toBe(200)
    expect(res.body.jobs).toHaveLength(1)
    expect(typeof res.body.nextCursor).toBe("string")
    const next = await w.c.technician.get(`/api/jobs?limit=1&cursor=${encodeURIComponent(res.body.nextCursor)}`)
    expect(next.status).toBe(200)
    expect(next.body.jobs[0].id).not.toBe(res.body.jobs[0].id)
    for (const sort of ["updatedAt", "roNumber", "customer", "status"]) {
      const page = await w.c.technician.get(`/api/jobs?limit=1&sort=${sort}`)
      const more = await w.c.technician.get(
        `/api/jobs?limit=1&sort=${sort}&cursor=${encodeURIComponent(page.body.nextCursor)}`,
      )
      expect(more.status, `${sort}: ${more.text.slice(0, 200)}`).toBe(200)
      expect(more.body.jobs[0].id).not.toBe(page.body.jobs[0].id)
    }
  })

  it("POST /api/jobs: 201 {job}; a VIN failing its check digit is a 400 with fields[vehicle.vin]", async () => {
    const res = await w.c.technician.post("/api/jobs", newJobBody())
    expect(res.status).toBe(201)
    expect(res.body.job).toMatchObject({ status: "open" })
    const body = newJobBody()
    const vin = body.vehicle.vin as string
    const wrongDigit = vin.slice(0, 8) + (vin[8] === "0" ? "1" : "0") + vin.slice(9)
    const before = await countShopRows(w.shop.shopId)
    const bad = await w.c.technician.post("/api/jobs", { ...body, vehicle: { ...body.vehicle, vin: wrongDigit } })
    expectErrorShape(bad, 400)
    expect(bad.body.error.fields).toHaveProperty(["vehicle.vin"])
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })

  it("GET /api/jobs/:id: 200 {job} with its tasks, checklist, attachments and drives", async () => {
    const res = await w.c.technician.get(`/api/jobs/${w.job.id}`)
    expect(res.status).toBe(200)
    const { job } = res.body
    for (const f of ["id", "roNumber", "status", "customer", "vehicle", "tasks", "attachments", "drives"])
      expect(job, f).toHaveProperty(f)
    expect(job.tasks[0].checklist).toMatchObject({ fuelLevel: "3/4" })
    expect(job.attachments.map((a: { id: string }) => a.id)).toContain(w.attachmentId)
    expect(job.drives.map((d: { id: string }) => d.id)).toContain(w.recording.id)
  })
})

describe("uploads", () => {
  it("POST /api/uploads: 201 {attachmentId, uploadUrl}; 413 over the limit; 400 for a type not allowed", async () => {
    const ok = await w.c.technician.post("/api/uploads", {
      jobId: w.job.id,
      filename: "a.png",
      contentType: "image/png",
      size: TINY_PNG.length,
    })
    expect(ok.status).toBe(201)
    expect(ok.body.attachmentId).toMatch(/^[0-9a-f-]{36}$/)
    expect(ok.body.uploadUrl).toMatch(/^https?:\/\//)
    expectErrorShape(
      await w.c.technician.post("/api/uploads", {
        jobId: w.job.id,
        filename: "a.png",
        contentType: "image/png",
        size: 500 * 1024 * 1024,
      }),
      413,
    )
    expectErrorShape(
      await w.c.technician.post("/api/uploads", {
        jobId: w.job.id,
        filename: "a.exe",
        contentType: "application/x-msdownload",
        size: 10,
      }),
      400,
    )
  })

  it("POST /api/uploads/:id/complete: 200 {attachment} when the bytes match; 400 otherwise", async () => {
    const pdf = await onePagePdf()
    const tech = w.c.technician
    const ok = await uploadFile(tech, {
      jobId: w.job.id,
      filename: "b.pdf",
      contentType: "application/pdf",
      bytes: pdf,
    })
    expect(ok.done.status).toBe(200)
    expect(ok.done.body.attachment).toMatchObject({ id: ok.id, contentType: "application/pdf" })
    const liar = await uploadFile(tech, {
      jobId: w.job.id,
      filename: "c.pdf",
      contentType: "application/pdf",
      bytes: TINY_PNG,
    })
    expectErrorShape(liar.done, 400)
    // Nothing was put at the address yet.
    const missing = await startUpload(tech, {
      jobId: w.job.id,
      filename: "d.png",
      contentType: "image/png",
      bytes: new Uint8Array(10),
    })
    expectErrorShape(await completeUpload(tech, missing.id), 400)
  })
})

describe("drive record and mail", () => {
  it("GET record: the record as application/pdf", async () => {
    const res = await w.c.co_driver.request("GET", `/api/drives/${w.finished.id}/record`)
    expect(res.status).toBe(200)
    expect(res.headers.get("content-type")).toBe("application/pdf")
    expect(res.text.startsWith("%PDF-")).toBe(true)
  })

  it("POST record/email: 202, and GET /api/dev/mail lists it newest first with the PDF attached", async () => {
    const to = `owner-${randomUUID().slice(0, 6)}@customer.invalid`
    const res = await w.c.shop_lead.post(`/api/drives/${w.finished.id}/record/email`, { to })
    expect(res.status).toBe(202)
    const mail = await w.c.admin.get("/api/dev/mail")
    expect(mail.status).toBe(200)
    expect(Array.isArray(mail.body.messages)).toBe(true)
    const first = mail.body.messages[0]
    for (const f of ["to", "subject", "attachments"]) expect(first, f).toHaveProperty(f)
    expect(JSON.stringify(first.to)).toContain(to)
    expect(first.attachments[0]).toMatchObject({ contentType: "application/pdf" })
    expect(Object.keys(first.attachments[0])).toEqual(expect.arrayContaining(["filename", "contentType", "size"]))
    expect(first.attachments[0].size).toBeGreaterThan(1000)
  })
})

describe("record revisions and verification (DEVELOPERS.md)", () => {
  it("GET /api/drives/:id/revisions: 200 {revisions: [{revision, cause, verdict, createdAt, digest, code, score}]}, newest first", async () => {
    const res = await w.c.technician.get(`/api/drives/${w.finished.id}/revisions`)
    expect(res.status).toBe(200)
    expect(res.body.revisions.length).toBeGreaterThan(0)
    const [latest] = res.body.revisions
    for (const f of [
      "revision",
      "cause",
      "causeText",
      "verdict",
      "reviewDecision",
      "createdAt",
      "createdBy",
      "digest",
      "code",
      "score",
    ])
      expect(latest).toHaveProperty(f)
    expect(latest.digest).toMatch(/^[0-9a-f]{64}$/)
    expectScore(latest.score)
    const numbers = res.body.revisions.map((r: { revision: number }) => r.revision)
    expect(numbers).toEqual([...numbers].sort((a, b) => b - a))
    expect(latest.score).toEqual((await w.c.technician.get(`/api/drives/${w.finished.id}/score`)).body)
  })

  it("POST /api/verify (no sign-in): 200 {result, message} for a code; 400 in the error shape for a bad one", async () => {
    const { code } = (await w.c.technician.get(`/api/drives/${w.finished.id}/revisions`)).body.revisions[0]
    const ok = await new ApiClient().post("/api/verify", { code })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({
      result: "matches",
      revision: expect.any(Number),
      latestRevision: expect.any(Number),
      message: expect.any(String),
    })
    expectErrorShape(await new ApiClient().post("/api/verify", { code: "x" }), 400)
  })
})

describe('errors (api.md "Errors")', () => {
  it("an /api path no route serves is a 404 in the error shape, for any method", async () => {
    for (const [method, path] of [
      ["GET", "/api/nope"],
      ["POST", "/api/nope"],
      ["GET", `/api/drives/${w.finished.id}/nope`],
      ["DELETE", "/api/jobs/x/y/z"],
    ] as const) {
      expectErrorShape(await w.c.admin.request(method, path, method === "POST" ? {} : undefined), 404)
    }
  })

  it("a write from another site is a 403 and stores nothing", async () => {
    const before = await countShopRows(w.shop.shopId)
    const res = await w.c.technician.request(
      "POST",
      "/api/drives",
      { id: randomUUID() },
      { headers: { origin: "http://elsewhere.invalid" } },
    )
    expectErrorShape(res, 403)
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })

  it("a body over the size limit is a 413 and stores nothing", async () => {
    const id = await startDrive(w.c.technician)
    const before = await countShopRows(w.shop.shopId)
    const res = await w.c.technician.post(`/api/drives/${id}/samples`, {
      batchId: "big",
      samples: samplesOf(5),
      padding: "x".repeat(9 * 1024 * 1024),
    })
    expectErrorShape(res, 413)
    expect(res.body.error.code).toBe("too_large")
    expect(await countShopRows(w.shop.shopId)).toEqual(before)
  })
})
