// api.md: samples are idempotent per batchId and per sample `t`, "a batch is stored whole or not at all";
// marks are idempotent per mark id; a client-made drive id makes POST /api/drives idempotent. The
// recorder's outbox replays these after a lost answer, so every replay must store nothing twice.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { storedSample } from "@/lib/drive-file/stored"
import { createTestShop, testDb } from "../../helpers/db"
import { type ApiClient } from "../../helpers/http"
import { clientsFor, countShopRows, driveFile, expectErrorShape, samplesOf, startDrive, type Clients } from "./world"

let c: Clients
let shopId: string

beforeAll(async () => {
  const shop = await createTestShop("Idempotency")
  shopId = shop.shopId
  c = await clientsFor(shop)
})

async function stored(publicId: string) {
  const db = testDb()
  const driveId = internalDriveId(shopId, publicId)
  const [samples, batches, marks] = await Promise.all([
    db
      .selectFrom("sample_decoded")
      .select(["t", "lat", "lon", "speed", "accuracy"])
      .where("drive_id", "=", publicId) // the view names drives by public id
      .where("shop_id", "=", shopId)
      .orderBy("t")
      .execute(),
    db.selectFrom("sample_batch").select("batch_id").where("drive_id", "=", driveId).execute(),
    db.selectFrom("mark").select(["id", "t", "kind", "text"]).where("drive_id", "=", driveId).orderBy("t").execute(),
  ])
  return { samples, batches, marks }
}

function postSamples(client: ApiClient, driveId: string, batchId: string, samples: unknown[]) {
  return client.post(`/api/drives/${driveId}/samples`, { batchId, samples })
}

describe("samples", () => {
  it("counts a batch sent twice once, and answers the replay as the first time", async () => {
    const id = await startDrive(c.technician)
    const batch = samplesOf(40)
    const first = await postSamples(c.technician, id, "b-1", batch)
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ accepted: 40, duplicates: 0 })
    const again = await postSamples(c.technician, id, "b-1", batch)
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ accepted: 40, duplicates: 0 })
    const s = await stored(id)
    expect(s.samples).toHaveLength(40)
    expect(s.batches).toHaveLength(1)
  })

  it("takes a sample's `t` once across batches: an overlapping batch stores only the new ones", async () => {
    const id = await startDrive(c.technician)
    const run = samplesOf(60)
    await postSamples(c.technician, id, "b-1", run.slice(0, 40))
    const overlap = await postSamples(c.technician, id, "b-2", run.slice(30, 60))
    expect(overlap.body).toMatchObject({ accepted: 20, duplicates: 10 })
    const sameTimes = await postSamples(
      c.technician,
      id,
      "b-3",
      run.slice(0, 10).map((x) => ({ ...x, lat: x.lat + 0.01 })),
    )
    expect(sameTimes.body).toMatchObject({ accepted: 0, duplicates: 10 })
    const s = await stored(id)
    expect(s.samples).toHaveLength(60)
    // The first sample stored for a `t` stays as it was.
    expect(s.samples[0]!.lat).toBe(storedSample(run[0]!).lat)
  })

  it("stores one copy when the same batch arrives five times at once", async () => {
    const id = await startDrive(c.technician)
    const batch = samplesOf(50, 4)
    const answers = await Promise.all(Array.from({ length: 5 }, () => postSamples(c.technician, id, "burst", batch)))
    for (const res of answers) expect(res.status).toBe(200)
    expect(answers.map((r) => r.body.accepted)).toEqual([50, 50, 50, 50, 50])
    expect((await stored(id)).samples).toHaveLength(50)
  })

  it("stores nothing of a batch with one bad sample, names it, and takes the same batch id once fixed", async () => {
    const id = await startDrive(c.technician)
    const batch = samplesOf(25, 6)
    const broken = batch.map((x, i) => (i === 17 ? { ...x, lat: 91 } : x))
    const before = await countShopRows(shopId)
    const res = await postSamples(c.technician, id, "b-fix", broken)
    expectErrorShape(res, 400)
    expect(res.body.error.fields).toHaveProperty("samples.17.lat")
    expect(await countShopRows(shopId)).toEqual(before)
    expect(await stored(id)).toEqual({ samples: [], batches: [], marks: [] })
    const fixed = await postSamples(c.technician, id, "b-fix", batch)
    expect(fixed.status).toBe(200)
    expect(fixed.body).toMatchObject({ accepted: 25, duplicates: 0 })
  })

  it("stores nothing of a batch whose bad sample is a wrong type or a time that is not whole", async () => {
    const id = await startDrive(c.technician)
    const batch = samplesOf(10, 9)
    for (const bad of [
      { ...batch[9]!, t: batch[9]!.t + 0.5 },
      { ...batch[9]!, lon: "-88.1" },
      { ...batch[9]!, speed: -1 },
      null,
      "sample",
    ]) {
      const res = await postSamples(c.technician, id, `b-${randomUUID()}`, [...batch.slice(0, 9), bad])
      expectErrorShape(res, 400)
      expect(Object.keys(res.body.error.fields)[0]).toMatch(/^samples\.9/)
    }
    expect(await stored(id)).toEqual({ samples: [], batches: [], marks: [] })
  })
})

describe("marks", () => {
  it("counts a mark sent twice once, by its id", async () => {
    const id = await startDrive(c.technician, { coDriverId: undefined })
    const marks = [
      { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 1), kind: "lead-on" },
      { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 2), kind: "gap", gapFt: 130 },
    ]
    const first = await c.technician.post(`/api/drives/${id}/marks`, { marks })
    expect(first.body).toEqual({ accepted: 2, duplicates: 0 })
    const again = await c.technician.post(`/api/drives/${id}/marks`, { marks })
    expect(again.body).toEqual({ accepted: 0, duplicates: 2 })
    const plusOne = await c.technician.post(`/api/drives/${id}/marks`, {
      marks: [...marks, { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 3), kind: "cleared" }],
    })
    expect(plusOne.body).toEqual({ accepted: 1, duplicates: 2 })
    expect((await stored(id)).marks).toHaveLength(3)
  })

  it("stores nothing of a marks post with one bad mark", async () => {
    const id = await startDrive(c.technician)
    const good = { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 1), kind: "lead-on" }
    for (const bad of [
      { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 2), kind: "teleported" },
      { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 2), kind: "gap" },
      { id: "mark-1", t: Date.UTC(2026, 0, 1, 10, 2), kind: "cleared" },
      { id: randomUUID(), t: -5, kind: "cleared" },
    ]) {
      const res = await c.technician.post(`/api/drives/${id}/marks`, { marks: [good, bad] })
      expectErrorShape(res, 400)
      expect(Object.keys(res.body.error.fields)[0]).toMatch(/^marks\.1\./)
    }
    expect((await stored(id)).marks).toEqual([])
  })

  it("undoes a mark once: deleting it again is still a 204", async () => {
    const id = await startDrive(c.technician)
    const mark = { id: randomUUID(), t: Date.UTC(2026, 0, 1, 10, 1), kind: "lead-on" }
    await c.technician.post(`/api/drives/${id}/marks`, { marks: [mark] })
    expect((await c.technician.delete(`/api/drives/${id}/marks/${mark.id}`)).status).toBe(204)
    expect((await c.technician.delete(`/api/drives/${id}/marks/${mark.id}`)).status).toBe(204)
    expect((await stored(id)).marks).toEqual([])
  })
})

describe("drives", () => {
  it("starts one drive for one client id, however often and however fast the start is sent", async () => {
    const id = randomUUID()
    const answers = await Promise.all(
      Array.from({ length: 6 }, () =>
        c.technician.post("/api/drives", { id, vehicleDescription: "2022 Invented Marl" }),
      ),
    )
    expect(answers.map((r) => r.status).sort()).toEqual([200, 200, 200, 200, 200, 201])
    for (const r of answers) expect(r.body.drive.id).toBe(id)
    expect(await testDb().selectFrom("drive").select("id").where("public_id", "=", id).execute()).toHaveLength(1)
    // A lead retrying the technician's start gets that drive back, still the technician's.
    const byLead = await c.shop_lead.post("/api/drives", { id })
    expect(byLead.status).toBe(200)
    expect(byLead.body.drive.driverId).toBe(answers[0]!.body.drive.driverId)
  })

  it("finishes twice with one stored score", async () => {
    const id = await startDrive(c.technician)
    const file = driveFile(12)
    await postSamples(c.technician, id, "all", file.samples)
    const one = await c.technician.post(`/api/drives/${id}/finish`)
    const two = await c.technician.post(`/api/drives/${id}/finish`)
    expect([one.status, two.status]).toEqual([200, 200])
    expect(two.body.score).toEqual(one.body.score)
    expect(
      await testDb()
        .selectFrom("score")
        .select("drive_id")
        .where("drive_id", "=", internalDriveId(shopId, id))
        .execute(),
    ).toHaveLength(1)
  })

  it("imports nothing from a file that fails at any point", async () => {
    const before = await countShopRows(shopId)
    const file = driveFile(14)
    const lastMark = { t: file.samples[10]!.t, kind: "note", text: "" }
    const res = await c.technician.post("/api/drives/import", { ...file, marks: [...file.marks, lastMark] })
    expectErrorShape(res, 400)
    expect(Object.keys(res.body.error.fields)[0]).toMatch(/^marks/)
    expect(await countShopRows(shopId)).toEqual(before)
  })
})
