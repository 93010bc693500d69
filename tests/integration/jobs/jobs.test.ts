import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop, insertDrive, testDb, type TestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"
import { createJob, inventedVin, newJobBody } from "../../helpers/jobs"

let shop: TestShop
let other: TestShop

beforeAll(async () => {
  shop = await createTestShop("Jobs")
  other = await createTestShop("Other")
})

describe("POST /api/jobs", () => {
  it("creates a job with its vehicle and tasks, the model year decoded from the VIN", async () => {
    const tech = await signedIn(shop.tech)
    const body = newJobBody()
    const res = await tech.post("/api/jobs", body)
    expect(res.status).toBe(201)
    const job = res.body.job
    expect(job).toMatchObject({
      roNumber: body.roNumber,
      status: "open",
      customer: { name: "Wren Castellano", email: "wren@example.invalid" },
    })
    // 49 CFR 565.15(b): position 7 alphabetic -> 2010-2039 cycle; position 10 "R" -> 2024 (check-values.md §2c)
    expect(job.vehicle).toMatchObject({ vin: body.vehicle.vin, year: 2024, make: "Corvane", model: "Tallis" })
    expect(job.tasks).toHaveLength(1)
    expect(job.tasks[0]).toMatchObject({
      sensor: "forward_radar",
      method: "dynamic",
      reason: "bumper_or_grille_work",
      checklist: null,
    })
  })

  it("refuses a VIN whose check digit is wrong with a 400 naming vehicle.vin", async () => {
    const tech = await signedIn(shop.tech)
    // 49 CFR 565 / NHTSA worked example: 1J9RP1A36A1644345 has check digit 6; a 7 in position 9 is wrong.
    const res = await tech.post("/api/jobs", newJobBody({ vehicle: { vin: "1J9RP1A37A1644345" } }))
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe("validation_failed")
    expect(res.body.error.fields["vehicle.vin"]).toMatch(/check digit works out to 6/)
  })

  it("accepts the NHTSA worked-example VIN 1J9RP1A36A1644345 and decodes 2010", async () => {
    const tech = await signedIn(shop.tech)
    const res = await tech.post("/api/jobs", newJobBody({ vehicle: { vin: "1j9rp1a36a1644345" } }))
    expect(res.status).toBe(201)
    // check-values.md §2b/§2c: position 7 'A', year code 'A' -> 2010
    expect(res.body.job.vehicle).toMatchObject({ vin: "1J9RP1A36A1644345", year: 2010 })
  })

  it("names each bad task value and stores nothing", async () => {
    const tech = await signedIn(shop.tech)
    const body = newJobBody({ tasks: [{ sensor: "lidar", method: "dynamic", reason: "replaced" }] })
    const res = await tech.post("/api/jobs", body)
    expect(res.status).toBe(400)
    expect(res.body.error.fields["tasks.0.sensor"]).toMatch(/must be one of/)
    const stored = await testDb().selectFrom("job").select("id").where("ro_number", "=", body.roNumber).execute()
    expect(stored).toHaveLength(0)
  })

  it("refuses a second job with the same RO number in the shop (409), but another shop may use it", async () => {
    const tech = await signedIn(shop.tech)
    const body = newJobBody()
    expect((await tech.post("/api/jobs", body)).status).toBe(201)
    const again = await tech.post("/api/jobs", { ...body, vehicle: { vin: inventedVin() } })
    expect(again.status).toBe(409)
    expect(again.body.error.fields.roNumber).toBeDefined()
    const otherLead = await signedIn(other.lead)
    expect((await otherLead.post("/api/jobs", body)).status).toBe(201)
  })

  it("is closed to co-drivers (403) and to the signed-out (401)", async () => {
    const codriver = await signedIn(shop.codriver)
    expect((await codriver.post("/api/jobs", newJobBody())).status).toBe(403)
    expect((await new ApiClient().post("/api/jobs", newJobBody())).status).toBe(401)
  })
})

describe("GET /api/jobs", () => {
  it("refuses co-drivers with a 403", async () => {
    const codriver = await signedIn(shop.codriver)
    const res = await codriver.get("/api/jobs")
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe("forbidden")
  })

  it("pages, sorts, filters and searches on the server, and shows only the shop's jobs", async () => {
    const fresh = await createTestShop("Paging")
    const lead = await signedIn(fresh.lead)
    const made = []
    for (let i = 0; i < 5; i++)
      made.push(await createJob(lead, { roNumber: `P-${i}`, customer: { name: `Customer ${"EDCBA"[i]}` } }))
    await createJob(await signedIn(other.lead), { roNumber: "P-9" })

    const page1 = await lead.get("/api/jobs?sort=roNumber&dir=asc&limit=2")
    expect(page1.status).toBe(200)
    expect(page1.body.total).toBe(5)
    expect(page1.body.jobs.map((j: { roNumber: string }) => j.roNumber)).toEqual(["P-0", "P-1"])
    const page2 = await lead.get(`/api/jobs?sort=roNumber&dir=asc&limit=2&cursor=${page1.body.nextCursor}`)
    expect(page2.body.jobs.map((j: { roNumber: string }) => j.roNumber)).toEqual(["P-2", "P-3"])
    const page3 = await lead.get(`/api/jobs?sort=roNumber&dir=asc&limit=2&cursor=${page2.body.nextCursor}`)
    expect(page3.body.jobs.map((j: { roNumber: string }) => j.roNumber)).toEqual(["P-4"])
    expect(page3.body.nextCursor).toBeNull()

    const byCustomer = await lead.get("/api/jobs?sort=customer&dir=asc&limit=10")
    expect(byCustomer.body.jobs.map((j: { customer: { name: string } }) => j.customer.name)).toEqual(
      ["A", "B", "C", "D", "E"].map((c) => `Customer ${c}`),
    )

    const newestFirst = await lead.get("/api/jobs?limit=10")
    expect(newestFirst.body.jobs[0].id).toBe(made[4].id)

    const search = await lead.get("/api/jobs?q=customer%20c")
    expect(search.body.jobs.map((j: { roNumber: string }) => j.roNumber)).toEqual(["P-2"])
    const byVin = await lead.get(`/api/jobs?q=${made[3].vehicle.vin.slice(-6)}`)
    expect(byVin.body.jobs.map((j: { roNumber: string }) => j.roNumber)).toEqual(["P-3"])

    await testDb().updateTable("job").set({ status: "review" }).where("id", "=", made[1].id).execute()
    const review = await lead.get("/api/jobs?status=review")
    expect(review.body.jobs.map((j: { id: string }) => j.id)).toEqual([made[1].id])
    expect(review.body.total).toBe(1)
  })

  it("answers 400 for a made-up cursor or status", async () => {
    const tech = await signedIn(shop.tech)
    expect((await tech.get("/api/jobs?cursor=not-a-cursor")).status).toBe(400)
    expect((await tech.get("/api/jobs?status=lost")).status).toBe(400)
  })
})

describe("GET and PATCH /api/jobs/:id", () => {
  it("shows another shop's job as 404, and a malformed id as 404", async () => {
    const job = await createJob(await signedIn(other.lead))
    const tech = await signedIn(shop.tech)
    const res = await tech.get(`/api/jobs/${job.id}`)
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe("not_found")
    expect((await tech.get("/api/jobs/not-a-uuid")).status).toBe(404)
    expect((await tech.patch(`/api/jobs/${job.id}`, { customer: { name: "X" } })).status).toBe(404)
  })

  it("gives the job with tasks, their profile, checklists, attachments and drives", async () => {
    const fresh = await createTestShop("Detail")
    const { createTestProfile } = await import("../../helpers/db")
    const profile = await createTestProfile(fresh.shopId, "forward-radar", { minSpeedMph: 40 })
    const lead = await signedIn(fresh.lead)
    const job = await createJob(lead, {
      tasks: [
        { sensor: "forward_radar", method: "dynamic", reason: "replaced" },
        { sensor: "forward_camera", method: "static", reason: "windshield_replaced" },
      ],
    })
    const res = await lead.get(`/api/jobs/${job.id}`)
    expect(res.status).toBe(200)
    const [radar, camera] = res.body.job.tasks
    // The shop's profile for the sensor is the default; its settings come resolved (drive-file.md defaults).
    expect(radar.profile).toMatchObject({
      id: profile.profileId,
      key: "forward-radar",
      version: 1,
      versionId: profile.versionId,
    })
    expect(radar.profile.settings).toMatchObject({
      minSpeedMph: 40,
      maxDriveMinutes: 30,
      leadGapFt: { min: 100, max: 165 },
    })
    expect(camera.profile).toBeNull()
    expect(res.body.job).toMatchObject({ attachments: [], drives: [] })
  })

  it("edits the customer, vehicle and tasks, and refuses removing a task that has a drive", async () => {
    const lead = await signedIn(shop.lead)
    const job = await createJob(lead)
    const vin = inventedVin()
    const res = await lead.patch(`/api/jobs/${job.id}`, {
      customer: { name: "Ilse Marden", phone: "555-0199" },
      vehicle: { vin, plate: "NEW 1" },
      tasks: [
        { id: job.tasks[0].id, sensor: "forward_radar", method: "both", reason: "wheel_alignment" },
        { sensor: "rear_radar", method: "dynamic", reason: "bumper_or_grille_work" },
      ],
    })
    expect(res.status).toBe(200)
    expect(res.body.job.customer).toEqual({ name: "Ilse Marden", email: null, phone: "555-0199" })
    expect(res.body.job.vehicle).toMatchObject({ vin, plate: "NEW 1" })
    expect(res.body.job.tasks.map((t: { id: string; method: string }) => t.method)).toEqual(["both", "dynamic"])
    expect(res.body.job.tasks[0].id).toBe(job.tasks[0].id)

    const bad = await lead.patch(`/api/jobs/${job.id}`, {
      vehicle: { vin: vin.slice(0, 8) + (vin[8] === "0" ? "1" : "0") + vin.slice(9) },
    })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields["vehicle.vin"]).toBeDefined()

    await insertDrive(shop, { job_id: job.id, task_id: job.tasks[0].id, driver_id: shop.lead.id })
    const removing = await lead.patch(`/api/jobs/${job.id}`, {
      tasks: [{ sensor: "rear_radar", method: "dynamic", reason: "other" }],
    })
    expect(removing.status).toBe(409)
    const after = await lead.get(`/api/jobs/${job.id}`)
    expect(after.body.job.tasks).toHaveLength(2)
    expect(after.body.job.drives).toHaveLength(1)
  })

  it("lets a co-driver see a job only through a drive that names them", async () => {
    const lead = await signedIn(shop.lead)
    const job = await createJob(lead)
    const codriver = await signedIn(shop.codriver)
    expect((await codriver.get(`/api/jobs/${job.id}`)).status).toBe(404)
    await insertDrive(shop, { job_id: job.id, task_id: job.tasks[0].id, co_driver_id: shop.codriver.id })
    const res = await codriver.get(`/api/jobs/${job.id}`)
    expect(res.status).toBe(200)
    expect(res.body.job.drives).toHaveLength(1)
  })
})
