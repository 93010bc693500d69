import { beforeAll, describe, expect, it } from "vitest"
import { checklistBody } from "../../helpers/checklist"
import { createTestShop, type TestShop } from "../../helpers/db"
import { signedIn } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"

let shop: TestShop
beforeAll(async () => {
  shop = await createTestShop("Checklist")
})

const goodChecklist = checklistBody({
  faultCodes: { none: false, expected: ["c1a67-54"] },
  tires: { unit: "psi", placard: 35, fl: 35, fr: 34, rl: 36, rr: 38 },
  alignmentChecked: null,
  notes: "Bracket checked with a straight edge.",
})

describe("PUT/GET /api/jobs/:jobId/tasks/:taskId/checklist", () => {
  it("stores the checklist with who and when, and says it is ready", async () => {
    const tech = await signedIn(shop.tech)
    const job = await createJob(tech)
    const url = `/api/jobs/${job.id}/tasks/${job.tasks[0].id}/checklist`
    expect((await tech.get(url)).body.checklist).toBeNull()
    const put = await tech.request("PUT", url, goodChecklist)
    expect(put.status).toBe(200)
    // Tolerance 3 psi (the test shop's setting): rr at 38 is exactly 3 over and passes.
    expect(put.body.checklist).toMatchObject({
      ready: true,
      blockers: [],
      completedBy: shop.tech.name,
      completedById: shop.tech.id,
    })
    expect(put.body.checklist.faultCodes.expected).toEqual(["C1A67-54"])
    expect(Date.now() - Date.parse(put.body.checklist.completedAt)).toBeLessThan(60_000)

    const detail = await tech.get(`/api/jobs/${job.id}`)
    expect(detail.body.job.tasks[0].checklist).toMatchObject({
      ready: true,
      notes: goodChecklist.notes,
      completedBy: shop.tech.name,
    })
  })

  it("flags a tire more than the tolerance off the placard, in kPa too", async () => {
    const lead = await signedIn(shop.lead)
    const job = await createJob(lead)
    const url = `/api/jobs/${job.id}/tasks/${job.tasks[0].id}/checklist`
    // 241 kPa placard; 3 psi = 20.684 kPa (1 psi = 6.894757 kPa, derived from exact lbf and inch definitions)
    const res = await lead.request("PUT", url, {
      ...goodChecklist,
      tires: { unit: "kPa", placard: 241, fl: 241, fr: 261, rl: 262, rr: 220 },
    })
    expect(res.status).toBe(200)
    expect(res.body.checklist.ready).toBe(false)
    expect(res.body.checklist.blockers.map((b: { key: string }) => b.key)).toEqual(["tires.rl", "tires.rr"])
    expect(res.body.checklist.completedBy).toBe(shop.lead.name)
  })

  it("needs the alignment check when the reason is a wheel alignment", async () => {
    const tech = await signedIn(shop.tech)
    const job = await createJob(tech, {
      tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "wheel_alignment" }],
    })
    const url = `/api/jobs/${job.id}/tasks/${job.tasks[0].id}/checklist`
    const res = await tech.request("PUT", url, goodChecklist)
    expect(res.body.checklist.blockers.map((b: { key: string }) => b.key)).toEqual(["alignmentChecked"])
    const fixed = await tech.request("PUT", url, { ...goodChecklist, alignmentChecked: true })
    expect(fixed.body.checklist.ready).toBe(true)
  })

  it("names bad fields with a 400 and keeps what was stored", async () => {
    const tech = await signedIn(shop.tech)
    const job = await createJob(tech)
    const url = `/api/jobs/${job.id}/tasks/${job.tasks[0].id}/checklist`
    await tech.request("PUT", url, goodChecklist)
    const res = await tech.request("PUT", url, {
      ...goodChecklist,
      tires: { ...goodChecklist.tires, fl: -2 },
      fuelLevel: "lots",
    })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(["tires.fl", "fuelLevel"]))
    expect((await tech.get(url)).body.checklist.tires.fl).toBe(35)
  })

  it("is 404 for another shop's task, and closed to co-drivers", async () => {
    const other = await createTestShop("Checklist other")
    const job = await createJob(await signedIn(other.lead))
    const url = `/api/jobs/${job.id}/tasks/${job.tasks[0].id}/checklist`
    const tech = await signedIn(shop.tech)
    expect((await tech.get(url)).status).toBe(404)
    expect((await tech.request("PUT", url, goodChecklist)).status).toBe(404)
    const ownJob = await createJob(tech)
    const codriver = await signedIn(shop.codriver)
    expect(
      (await codriver.request("PUT", `/api/jobs/${ownJob.id}/tasks/${ownJob.tasks[0].id}/checklist`, goodChecklist))
        .status,
    ).toBe(403)
  })
})
