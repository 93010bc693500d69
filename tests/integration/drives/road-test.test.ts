// Issue 13 end to end over HTTP: a job with a forward camera (static) and a forward radar (dynamic). The
// camera's set-up holds the road test while a figure is out of tolerance; a lead's override needs a note;
// the record lists the set-up, both drives and every check with its speed.
import { randomUUID } from "node:crypto"
import { PDFParse } from "pdf-parse"
import { beforeAll, describe, expect, it } from "vitest"
import type { Sample } from "@/lib/drive-file"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { signedIn, type ApiClient } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"

let shop: TestShop
let tech: ApiClient
let lead: ApiClient

const T0 = Date.UTC(2026, 11, 2, 9, 0, 0)

/** 1 Hz samples heading north: 8 m/s (17.9 mph) for 20 s, then 20 m/s (44.7 mph; NIST: 1 mph = 0.44704 m/s) to 120 s. */
function roadSamples(): Sample[] {
  let lat = 44.02
  return Array.from({ length: 121 }, (_, i) => {
    const speed = i <= 20 ? 8 : 20
    const s = { t: T0 + i * 1000, lat, lon: -92.47, speed, accuracy: 5 }
    lat += speed / 111_000
    return s
  })
}

const measurement = (key: string, value: number, specified: number, tolerance: number, unit = "mm") => ({
  key,
  value,
  specified,
  tolerance,
  unit,
})
const setupBody = (distance: number) => ({
  measurements: [
    measurement("target_distance", distance, 1500, 10),
    measurement("target_height", 1203, 1200, 5),
    measurement("lateral_offset", 2, 0, 5),
    measurement("floor_level", 1.5, 0, 3),
    measurement("thrust_angle", 0.05, 0, 0.1, "°"),
  ],
  scanResult: "pass",
  scanNotes: "Calibration reported complete, no codes",
})

async function newJob() {
  const row = await createJob(lead, {
    tasks: [
      { sensor: "forward_camera", method: "static", reason: "windshield_replaced" },
      { sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" },
    ],
  })
  return { id: row.id as string, camera: row.tasks[0].id as string, radar: row.tasks[1].id as string }
}

const startRoadTest = (job: { id: string; camera: string }, id = randomUUID()) =>
  tech.post("/api/drives", { id, jobId: job.id, taskId: job.camera, coDriverId: shop.codriver.id })

async function pdfText(path: string, client: ApiClient) {
  const res = await fetch(`${testEnv().baseUrl}${path}`, {
    headers: { cookie: client.cookie!, "x-forwarded-for": client.address },
  })
  expect(res.status).toBe(200)
  const parser = new PDFParse({ data: Buffer.from(await res.arrayBuffer()) })
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ")
  } finally {
    await parser.destroy()
  }
}

beforeAll(async () => {
  shop = await createTestShop("Road test")
  ;[tech, lead] = await Promise.all([signedIn(shop.tech), signedIn(shop.lead)])
})

describe("static set-up and the road test", () => {
  it("an out-of-tolerance figure blocks the road test with a 409 until it is corrected", async () => {
    const job = await newJob()
    const saved = await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1530))
    expect(saved.status).toBe(200)
    expect(saved.body.setup).toMatchObject({ outOfTolerance: 1, blocksRoadTest: true })
    const id = randomUUID()
    const blocked = await startRoadTest(job, id)
    expect(blocked.status).toBe(409)
    expect(blocked.body.error.code).toBe("conflict")
    expect(blocked.body.error.message).toContain("Forward camera: Target distance 1530 mm (specified 1500 ± 10 mm)")
    expect(blocked.body.error.message).toMatch(/Correct the set-up .* or ask a shop lead to override with a note/)
    expect(await testDb().selectFrom("drive").select("id").where("public_id", "=", id).execute()).toHaveLength(0)
    // the learn drive of the radar task is not a road test and is not held
    expect((await tech.post("/api/drives", { id: randomUUID(), jobId: job.id, taskId: job.radar })).status).toBe(201)
    await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1504))
    const started = await startRoadTest(job, id)
    expect(started.status).toBe(201)
    expect(started.body.drive.kind).toBe("road_test")
  })

  it("a lead's override needs a note, and lets the road test start", async () => {
    const job = await newJob()
    await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1480))
    const byTech = await tech.post(`/api/jobs/${job.id}/tasks/${job.camera}/setup/override`, {
      note: "Looks fine to me",
    })
    expect(byTech.status).toBe(403)
    const noNote = await lead.post(`/api/jobs/${job.id}/tasks/${job.camera}/setup/override`, { note: "" })
    expect(noNote.status).toBe(400)
    expect(noNote.body.error.fields.note).toMatch(/is required/)
    expect((await startRoadTest(job)).status).toBe(409)
    const note = "Floor re-levelled; distance re-measured from the axle line per the service procedure"
    const ok = await lead.post(`/api/jobs/${job.id}/tasks/${job.camera}/setup/override`, { note })
    expect(ok.status).toBe(200)
    expect(ok.body.setup).toMatchObject({ blocksRoadTest: false, override: { note, by: shop.lead.name } })
    expect((await startRoadTest(job)).status).toBe(201)
    // new figures withdraw the override: a lead looks again
    await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1470))
    expect((await startRoadTest(job)).status).toBe(409)
  })
})

describe("a job with a learn drive and a road test", () => {
  it("scores the road test per check at the track's speed; the record holds the measurements, both drives and every check with its speed", async () => {
    const job = await newJob()
    await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1504))

    // the radar's learn drive (invented track, lib/tracks)
    const learnId = randomUUID()
    expect((await tech.post("/api/drives", { id: learnId, jobId: job.id, taskId: job.radar })).status).toBe(201)
    const learn = generateDrive({ seed: 21, minutes: 16, pattern: "met", startMs: T0 - 3_600_000 })
    expect((await tech.post(`/api/drives/${learnId}/samples`, { batchId: "l1", samples: learn.samples })).status).toBe(
      200,
    )
    expect(
      (await tech.post(`/api/drives/${learnId}/marks`, { marks: learn.marks.map((m) => ({ ...m, id: randomUUID() })) }))
        .status,
    ).toBe(200)
    const learnDone = await tech.post(`/api/drives/${learnId}/finish`)
    expect(learnDone.body.score.verdict).toBe("met")

    // the road test of both systems
    const roadId = randomUUID()
    const started = await startRoadTest(job, roadId)
    expect(started.status).toBe(201)
    const checks: Array<{ key: string; label: string; system: string; minSpeedMph: number | null }> =
      started.body.drive.roadTestChecks
    expect(checks.map((c) => c.key)).toEqual([
      "lane-keeping-engages",
      "lane-departure-warning",
      "sign-display",
      "acc-engages",
      "acc-follows-lead",
    ])
    const co = await signedIn(shop.codriver)
    expect((await co.post(`/api/drives/${roadId}/samples`, { batchId: "r1", samples: roadSamples() })).status).toBe(200)
    const at = (s: number) => T0 + s * 1000
    const marks = [
      { id: randomUUID(), t: at(10), kind: "check", checkKey: "lane-keeping-engages", result: "pass" }, // 17.9 mph: not counted
      { id: randomUUID(), t: at(30), kind: "check", checkKey: "acc-engages", result: "pass" },
      { id: randomUUID(), t: at(40), kind: "check", checkKey: "acc-follows-lead", result: "pass" },
      { id: randomUUID(), t: at(50), kind: "check", checkKey: "lane-keeping-engages", result: "pass" },
      { id: randomUUID(), t: at(60), kind: "check", checkKey: "lane-departure-warning", result: "pass" },
      { id: randomUUID(), t: at(70), kind: "check", checkKey: "sign-display", result: "not_equipped" },
    ]
    expect((await co.post(`/api/drives/${roadId}/marks`, { marks })).status).toBe(200)
    const done = await tech.post(`/api/drives/${roadId}/finish`)
    expect(done.status).toBe(200)
    const score = done.body.score
    expect(score.verdict).toBe("met")
    expect(score.kind).toBe("road_test")
    expect(
      score.roadTest.checks.map((c: { key: string; status: string; speedMph: number }) => [
        c.key,
        c.status,
        c.speedMph,
      ]),
    ).toEqual([
      ["lane-keeping-engages", "passed", 44.7],
      ["lane-departure-warning", "passed", 44.7],
      ["sign-display", "not_equipped", 44.7],
      ["acc-engages", "passed", 44.7],
      ["acc-follows-lead", "passed", 44.7],
    ])

    // the drive file of a road test is version 2 and scores the same through POST /api/score
    const file = await tech.get(`/api/drives/${roadId}/file`)
    expect(file.body.format).toBe("straightaway.drive/2")
    expect((await tech.post("/api/score", file.body)).body.verdict).toBe("met")
    // a learn drive without check marks still exports as version 1
    expect((await tech.get(`/api/drives/${learnId}/file`)).body.format).toBe("straightaway.drive/1")

    const text = await pdfText(`/api/drives/${roadId}/record`, lead)
    expect(text).toContain("Each system calibrated on this job")
    expect(text).toContain("Target distance 1504 mm (specified 1500 +/- 10 mm)")
    expect(text).toContain("Target height 1203 mm (specified 1200 +/- 5 mm)")
    expect(text).toContain("Floor level over the area 1.5 mm (specified 0 +/- 3 mm)")
    expect(text).toContain("Calibration reported complete, no fault codes: Calibration reported complete, no codes")
    expect(text).toContain(`Learn drive Drive ${learnId.slice(0, 8)}`)
    expect(text).toContain(`Drive ${roadId.slice(0, 8)}: Met (this record)`)
    for (const c of checks) {
      const words = c.key === "sign-display" ? "Not equipped at 44.7 mph" : "Passed at 44.7 mph"
      expect(text, c.label).toContain(
        `${c.label}: ${words} (counts at ${c.minSpeedMph === null ? "any speed" : `${c.minSpeedMph} mph or faster`}`,
      )
    }
    expect(text).toContain("Straightaway holds no maker's values")
    // the learn drive's own record lists the same job
    const learnText = await pdfText(`/api/drives/${learnId}/record`, lead)
    expect(learnText).toContain(`Drive ${learnId.slice(0, 8)}`)
    expect(learnText).toContain("(this record)")
    expect(learnText).toContain("Adaptive cruise engages at or above its speed: Passed at 44.7 mph")
  })

  it("a road test with a failed required check goes to the lead's queue, naming it", async () => {
    const job = await newJob()
    await tech.request("PUT", `/api/jobs/${job.id}/tasks/${job.camera}/setup`, setupBody(1500))
    const id = randomUUID()
    expect((await startRoadTest(job, id)).status).toBe(201)
    await tech.post(`/api/drives/${id}/samples`, { batchId: "f1", samples: roadSamples() })
    await tech.post(`/api/drives/${id}/marks`, {
      marks: [{ id: randomUUID(), t: T0 + 50_000, kind: "check", checkKey: "lane-departure-warning", result: "fail" }],
    })
    const done = await tech.post(`/api/drives/${id}/finish`)
    expect(done.body.score.verdict).toBe("not_met")
    expect(done.body.score.reasons).toContain(
      'Road test: "Lane-departure warning on a lane line" failed (at 44.7 mph).',
    )
    const queue = await lead.get("/api/review")
    expect(queue.status).toBe(200)
    expect(queue.body.drives.map((d: { id: string }) => d.id)).toContain(id)
    // a road test missing a required check is unverified and queued too
    const missing = randomUUID()
    expect((await startRoadTest(job, missing)).status).toBe(201)
    await tech.post(`/api/drives/${missing}/samples`, { batchId: "m1", samples: roadSamples() })
    expect((await tech.post(`/api/drives/${missing}/finish`)).body.score.verdict).toBe("unverified")
    expect((await lead.get("/api/review")).body.drives.map((d: { id: string }) => d.id)).toContain(missing)
  })
})
