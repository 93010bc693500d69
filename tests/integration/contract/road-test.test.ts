// The contract suites for the road-test routes (DEVELOPERS.md "Road tests and set-up records"):
// conformance (status codes and named fields), the role matrix, shop isolation and bad input.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop } from "../../helpers/db"
import { signedIn, type ApiClient, type ApiResponse } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"
import { clientsFor, countShopRows, expectErrorShape, snapshotShop, type Clients } from "./world"
import type { TestShop } from "../../helpers/db"

type Who = "technician" | "co_driver" | "shop_lead" | "admin" | "anon"

let shop: TestShop
let c: Clients
let job: { id: string; cameraTask: string; radarTask: string }

const setupBody = (value = 1500) => ({
  measurements: [
    { key: "target_distance", value, specified: 1500, tolerance: 10, unit: "mm" },
    { key: "target_height", value: 1205, specified: 1200, tolerance: 10, unit: "mm" },
  ],
  scanResult: "pass",
  scanNotes: "Calibration reported complete",
})
const setupUrl = (taskId = job.cameraTask) => `/api/jobs/${job.id}/tasks/${taskId}/setup`

beforeAll(async () => {
  shop = await createTestShop("Road-test contract")
  c = await clientsFor(shop)
  const row = await createJob(c.shop_lead, {
    tasks: [
      { sensor: "forward_camera", method: "static", reason: "windshield_replaced" },
      { sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" },
    ],
  })
  job = { id: row.id, cameraTask: row.tasks[0].id, radarTask: row.tasks[1].id }
})

describe("conformance", () => {
  it("GET setup: 200 {setup: null} before anything is recorded", async () => {
    const res = await c.technician.get(setupUrl())
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ setup: null })
  })

  it("PUT setup: 200 {setup} with its named fields; GET gives the same", async () => {
    const res = await c.technician.request("PUT", setupUrl(), setupBody())
    expect(res.status).toBe(200)
    for (const f of [
      "taskId",
      "measurements",
      "scanResult",
      "scanNotes",
      "outOfTolerance",
      "override",
      "blocksRoadTest",
      "updatedBy",
      "updatedAt",
    ]) {
      expect(res.body.setup, f).toHaveProperty(f)
    }
    expect(res.body.setup).toMatchObject({
      taskId: job.cameraTask,
      scanResult: "pass",
      outOfTolerance: 0,
      blocksRoadTest: false,
      override: null,
    })
    expect(res.body.setup.measurements[0]).toMatchObject({
      key: "target_distance",
      value: 1500,
      specified: 1500,
      tolerance: 10,
      unit: "mm",
      outOfTolerance: false,
    })
    expect((await c.technician.get(setupUrl())).body).toEqual(res.body)
  })

  it("POST setup/override: 409 when nothing is out of tolerance, 200 {setup} with the override when something is", async () => {
    expectErrorShape(await c.shop_lead.post(`${setupUrl()}/override`, { note: "Checked twice" }), 409)
    await c.technician.request("PUT", setupUrl(), setupBody(1530))
    const res = await c.shop_lead.post(`${setupUrl()}/override`, {
      note: "Target board re-measured by hand; procedure allows it",
    })
    expect(res.status).toBe(200)
    expect(res.body.setup).toMatchObject({
      blocksRoadTest: false,
      outOfTolerance: 1,
      override: { note: "Target board re-measured by hand; procedure allows it" },
    })
    await c.technician.request("PUT", setupUrl(), setupBody())
  })

  it("setup routes answer 409 for a dynamic task (no target set-up)", async () => {
    expectErrorShape(await c.technician.get(setupUrl(job.radarTask)), 409)
    expectErrorShape(await c.technician.request("PUT", setupUrl(job.radarTask), setupBody()), 409)
  })

  it("POST /api/drives: kind and roadTestChecks on the drive; a static task's drive is a road test of every system of the job", async () => {
    const res = await c.technician.post("/api/drives", { id: randomUUID(), jobId: job.id, taskId: job.cameraTask })
    expect(res.status).toBe(201)
    expect(res.body.drive.kind).toBe("road_test")
    const systems = new Set(res.body.drive.roadTestChecks.map((x: { system: string }) => x.system))
    expect([...systems].sort()).toEqual(["forward_camera", "forward_radar"])
    const learn = await c.technician.post("/api/drives", { id: randomUUID(), jobId: job.id, taskId: job.radarTask })
    expect(learn.body.drive).toMatchObject({ kind: "learn", roadTestChecks: null })
  })

  it("profiles answer with roadTestChecks; a PATCH of them is a new version", async () => {
    const made = await c.shop_lead.post("/api/profiles", {
      name: `Camera ${randomUUID().slice(0, 6)}`,
      sensor: "forward_camera",
    })
    expect(made.status).toBe(201)
    const checks = made.body.profile.roadTestChecks
    expect(checks.map((x: { key: string }) => x.key)).toEqual([
      "lane-keeping-engages",
      "lane-departure-warning",
      "sign-display",
    ])
    const changed = await c.shop_lead.patch(`/api/profiles/${made.body.profile.id}`, {
      roadTestChecks: [{ ...checks[0], minSpeedMph: 45 }],
    })
    expect(changed.status).toBe(200)
    expect(changed.body.profile.version).toBe(2)
    expect(changed.body.versions[1].roadTestChecks).toHaveLength(3)
    expect(changed.body.profile.roadTestChecks).toEqual([{ ...checks[0], minSpeedMph: 45 }])
  })
})

describe("roles", () => {
  const expectAs = async (who: Who, call: (client: ApiClient) => Promise<ApiResponse>, status: number) => {
    const res = await call(c[who])
    if (status >= 400) expectErrorShape(res, status)
    else expect(res.status, `${who}: ${res.text.slice(0, 200)}`).toBe(status)
  }

  it("GET setup: every role of the shop (a co-driver only on a job that names them), 401 signed out", async () => {
    for (const who of ["technician", "shop_lead", "admin"] as const)
      await expectAs(who, (cl) => cl.get(setupUrl()), 200)
    await expectAs("co_driver", (cl) => cl.get(setupUrl()), 404)
    await expectAs("anon", (cl) => cl.get(setupUrl()), 401)
  })

  it("PUT setup: technician, shop lead, admin; co-driver 403; signed out 401", async () => {
    for (const who of ["technician", "shop_lead", "admin"] as const)
      await expectAs(who, (cl) => cl.request("PUT", setupUrl(), setupBody()), 200)
    await expectAs("co_driver", (cl) => cl.request("PUT", setupUrl(), setupBody()), 403)
    await expectAs("anon", (cl) => cl.request("PUT", setupUrl(), setupBody()), 401)
  })

  it("POST setup/override: shop lead and admin only", async () => {
    await c.technician.request("PUT", setupUrl(), setupBody(1530))
    await expectAs("technician", (cl) => cl.post(`${setupUrl()}/override`, { note: "x" }), 403)
    await expectAs("co_driver", (cl) => cl.post(`${setupUrl()}/override`, { note: "x" }), 403)
    await expectAs("anon", (cl) => cl.post(`${setupUrl()}/override`, { note: "x" }), 401)
    await expectAs("shop_lead", (cl) => cl.post(`${setupUrl()}/override`, { note: "Lead checked the board" }), 200)
    await c.technician.request("PUT", setupUrl(), setupBody(1530))
    await expectAs("admin", (cl) => cl.post(`${setupUrl()}/override`, { note: "Admin checked the board" }), 200)
    await c.technician.request("PUT", setupUrl(), setupBody())
  })
})

describe("isolation", () => {
  it("another shop's admin gets a 404 on every set-up route and changes nothing", async () => {
    const other = await createTestShop("Road-test contract B")
    const bAdmin = await signedIn(other.admin)
    const before = await snapshotShop(shop.shopId)
    const setupBefore = (await c.technician.get(setupUrl())).body
    expectErrorShape(await bAdmin.get(setupUrl()), 404)
    expectErrorShape(await bAdmin.request("PUT", setupUrl(), setupBody(1600)), 404)
    expectErrorShape(await bAdmin.post(`${setupUrl()}/override`, { note: "not yours" }), 404)
    expectErrorShape(await bAdmin.post("/api/drives", { id: randomUUID(), jobId: job.id, taskId: job.cameraTask }), 400)
    expect(await snapshotShop(shop.shopId)).toEqual(before)
    expect((await c.technician.get(setupUrl())).body).toEqual(setupBefore)
  })
})

describe("bad input", () => {
  const bad: Array<[string, unknown, string]> = [
    ["no measurements", { scanResult: "pass" }, "measurements"],
    [
      "unknown measurement key",
      { ...setupBody(), measurements: [{ key: "bumper_gap", value: 1, specified: 1, tolerance: 0, unit: "mm" }] },
      "measurements.0.key",
    ],
    [
      "negative tolerance",
      { ...setupBody(), measurements: [{ key: "target_height", value: 1, specified: 1, tolerance: -1, unit: "mm" }] },
      "measurements.0.tolerance",
    ],
    [
      "value as text",
      {
        ...setupBody(),
        measurements: [{ key: "target_height", value: "1200", specified: 1, tolerance: 1, unit: "mm" }],
      },
      "measurements.0.value",
    ],
    [
      "other without a name",
      { ...setupBody(), measurements: [{ key: "other", value: 1, specified: 1, tolerance: 1, unit: "mm" }] },
      "measurements.0.label",
    ],
    ["unknown scan result", { ...setupBody(), scanResult: "maybe" }, "scanResult"],
    [
      "no unit",
      { ...setupBody(), measurements: [{ key: "target_height", value: 1, specified: 1, tolerance: 1, unit: "" }] },
      "measurements.0.unit",
    ],
  ]
  for (const [name, body, field] of bad) {
    it(`PUT setup refuses ${name} with a 400 naming ${field}, storing nothing`, async () => {
      const before = await countShopRows(shop.shopId)
      const setupBefore = (await c.technician.get(setupUrl())).body
      const res = await c.technician.request("PUT", setupUrl(), body)
      expectErrorShape(res, 400)
      expect(res.body.error.fields).toHaveProperty([field])
      expect(await countShopRows(shop.shopId)).toEqual(before)
      expect((await c.technician.get(setupUrl())).body).toEqual(setupBefore)
    })
  }

  it("PUT setup refuses a body that is not JSON, and a malformed id is a 404", async () => {
    expectErrorShape(
      await c.technician.request("PUT", setupUrl(), undefined, {
        raw: "{ nope",
        headers: { "content-type": "application/json" },
      }),
      400,
    )
    expectErrorShape(await c.technician.get(`/api/jobs/${job.id}/tasks/not-a-uuid/setup`), 404)
  })

  it("POST setup/override refuses an empty note with a 400 naming it", async () => {
    await c.technician.request("PUT", setupUrl(), setupBody(1530))
    const res = await c.shop_lead.post(`${setupUrl()}/override`, { note: "   " })
    expectErrorShape(res, 400)
    expect(res.body.error.fields).toHaveProperty(["note"])
    expect((await c.technician.get(setupUrl())).body.setup).toMatchObject({ blocksRoadTest: true, override: null })
    await c.technician.request("PUT", setupUrl(), setupBody())
  })

  it("POST /api/drives refuses an unknown kind and bad road-test checks; marks refuse a check the drive does not hold", async () => {
    const kind = await c.technician.post("/api/drives", { id: randomUUID(), kind: "test-drive" })
    expectErrorShape(kind, 400)
    expect(kind.body.error.fields).toHaveProperty(["kind"])
    const checks = await c.technician.post("/api/drives", {
      id: randomUUID(),
      kind: "road_test",
      roadTestChecks: [{ key: "Bad Key", system: "forward_radar", label: "x", minSpeedMph: 10, need: "required" }],
    })
    expectErrorShape(checks, 400)
    expect(checks.body.error.fields).toHaveProperty(["roadTestChecks.0.key"])
    const id = randomUUID()
    expect((await c.technician.post("/api/drives", { id, kind: "road_test" })).status).toBe(201)
    const before = await countShopRows(shop.shopId)
    const mark = await c.technician.post(`/api/drives/${id}/marks`, {
      marks: [
        { id: randomUUID(), t: Date.UTC(2027, 0, 1), kind: "check", checkKey: "surround-guide-lines", result: "pass" },
      ],
    })
    expectErrorShape(mark, 400)
    expect(mark.body.error.fields).toHaveProperty(["marks.0.checkKey"])
    const result = await c.technician.post(`/api/drives/${id}/marks`, {
      marks: [{ id: randomUUID(), t: Date.UTC(2027, 0, 1), kind: "check", checkKey: "acc-engages", result: "maybe" }],
    })
    expectErrorShape(result, 400)
    expect(result.body.error.fields).toHaveProperty(["marks.0.result"])
    expect(await countShopRows(shop.shopId)).toEqual(before)
  })
})
