// Shop isolation (api.md "Errors" and "Roles": 404 = not found or in another shop; nobody sees or changes
// another shop's rows). Shop B's admin, who passes every role check, tries every route with an :id on
// shop A's rows: each answer is a 404 in the error shape, and every row of shop A is as it was.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { checklistBody } from "../../helpers/checklist"
import { createTestShop, testDb } from "../../helpers/db"
import { signedIn, type ApiClient } from "../../helpers/http"
import {
  buildWorld,
  driveFile,
  expectErrorShape,
  recordedDrive,
  samplesOf,
  snapshotShop,
  startDrive,
  type World,
} from "./world"

let a: World
let bAdmin: ApiClient
let bTech: ApiClient
let bShopId: string
let aNoticeId: string

beforeAll(async () => {
  a = await buildWorld("Isolation A")
  const b = await createTestShop("Isolation B")
  bShopId = b.shopId
  ;[bAdmin, bTech] = await Promise.all([signedIn(b.admin), signedIn(b.tech)])
  const notice = await testDb()
    .insertInto("notification")
    .values({
      shop_id: a.shop.shopId,
      user_id: a.shop.tech.id,
      message: "A drive was sent back",
      link: `/drives/${a.finished.id}`,
    })
    .returning("id")
    .executeTakeFirstOrThrow()
  aNoticeId = notice.id
})

type Attempt = [method: string, path: string, body?: unknown]

function attempts(): Attempt[] {
  const d = a.finished.id
  const r = a.recording.id
  return [
    ["GET", `/api/drives/${d}`],
    ["GET", `/api/drives/${r}`],
    ["POST", `/api/drives/${r}/samples`, { batchId: randomUUID(), samples: samplesOf(3, 8, Date.UTC(2027, 5, 1)) }],
    ["POST", `/api/drives/${d}/samples`, { batchId: randomUUID(), samples: samplesOf(3, 8, Date.UTC(2027, 5, 1)) }],
    ["POST", `/api/drives/${r}/marks`, { marks: [{ id: randomUUID(), t: Date.UTC(2027, 5, 1), kind: "cleared" }] }],
    ["DELETE", `/api/drives/${r}/marks/${a.recording.markIds[0]}`],
    ["DELETE", `/api/drives/${d}/marks/${a.finished.markIds[0]}`],
    ["POST", `/api/drives/${r}/finish`],
    ["POST", `/api/drives/${d}/finish`],
    ["GET", `/api/drives/${d}/score`],
    ["GET", `/api/drives/${d}/file`],
    ["GET", `/api/drives/${d}/file?format=gpx`],
    ["GET", `/api/drives/${d}/file?format=csv`],
    ["GET", `/api/drives/${d}/record`],
    ["POST", `/api/drives/${d}/record/email`, { to: "b-shop@customer.invalid" }],
    ["POST", `/api/drives/${d}/share`, { expiresInDays: 7 }],
    ["POST", `/api/drives/${d}/review`, { decision: "approve" }],
    ["POST", `/api/drives/${d}/review`, { decision: "redo", note: "Again, please." }],
    ["GET", `/api/jobs/${a.job.id}`],
    ["PATCH", `/api/jobs/${a.job.id}`, { roNumber: "RO-TAKEN-BY-B", customer: { name: "Someone Else" } }],
    ["GET", `/api/jobs/${a.job.id}/tasks/${a.job.taskId}/checklist`],
    ["PUT", `/api/jobs/${a.job.id}/tasks/${a.job.taskId}/checklist`, checklistBody({ notes: "overwritten by B" })],
    ["GET", `/api/attachments/${a.attachmentId}`],
    ["GET", `/api/attachments/${a.attachmentId}?variant=thumbnail`],
    ["POST", `/api/uploads/${a.attachmentId}/complete`],
    ["GET", `/api/profiles/${a.profileId}`],
    ["PATCH", `/api/profiles/${a.profileId}`, { name: "Renamed by B", settings: { minSpeedMph: 20 } }],
    ["PATCH", `/api/users/${a.shop.tech.id}`, { role: "admin" }],
    ["PATCH", `/api/users/${a.shop.admin.id}`, { disabled: true }],
    ["POST", "/api/uploads", { jobId: a.job.id, filename: "b.pdf", contentType: "application/pdf", size: 100 }],
  ]
}

describe("another shop's rows are a 404 and stay as they were", () => {
  it("every route with an :id, as shop B's admin", async () => {
    const failures: string[] = []
    for (const [method, path, body] of attempts()) {
      const before = await snapshotShop(a.shop.shopId)
      const res = await bAdmin.request(method, path, body)
      if (res.status !== 404) failures.push(`${method} ${path}: ${res.status} ${res.text.slice(0, 160)}`)
      else expectErrorShape(res)
      const after = await snapshotShop(a.shop.shopId)
      const changed = Object.keys(before).filter((k) => before[k] !== after[k])
      if (changed.length) failures.push(`${method} ${path} changed shop A's ${changed.join(", ")}`)
    }
    expect(failures).toEqual([])
  })

  // A route the role may not use is a 403 before any row is looked up, so it tells nothing about shop A either.
  const LEAD_ONLY = /\/(review|share|record\/email)$|^\/api\/(users|profiles)\//
  it("the same as shop B's technician: 404, or 403 where the role may not use the route at all", async () => {
    const before = await snapshotShop(a.shop.shopId)
    for (const [method, path, body] of attempts()) {
      const res = await bTech.request(method, path, body)
      const expected = LEAD_ONLY.test(path) && !(method === "GET" && path.startsWith("/api/profiles")) ? 403 : 404
      expect(res.status, `${method} ${path}`).toBe(expected)
      expectErrorShape(res)
    }
    expect(await snapshotShop(a.shop.shopId)).toEqual(before)
  })

  it("shop A's ids named in a body or query are refused, never used", async () => {
    const before = await snapshotShop(a.shop.shopId)
    const bBefore = await testDb().selectFrom("drive").select("id").where("shop_id", "=", bShopId).execute()
    const refusals = [
      await bAdmin.post("/api/drives", { id: randomUUID(), jobId: a.job.id }),
      await bAdmin.post("/api/drives", { id: randomUUID(), taskId: a.job.taskId }),
      await bAdmin.post("/api/drives", { id: randomUUID(), coDriverId: a.shop.codriver.id }),
      await bAdmin.post("/api/drives/import?jobId=" + a.job.id, driveFile(41)),
      await bAdmin.post("/api/drives/import?taskId=" + a.job.taskId, driveFile(41)),
      await bAdmin.post("/api/jobs", {
        roNumber: `RO-${randomUUID().slice(0, 6)}`,
        customer: { name: "B customer" },
        vehicle: { vin: "1J9RP1A36A1644345" },
        tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "replaced", profileId: a.profileId }],
      }),
    ]
    for (const res of refusals) {
      expect([400, 404], res.text.slice(0, 200)).toContain(res.status)
      expectErrorShape(res)
    }
    const marked = await bAdmin.patch("/api/notifications", { ids: [aNoticeId] })
    expect(marked.status).toBe(200)
    expect(marked.body.updated).toBe(0)
    expect(await snapshotShop(a.shop.shopId)).toEqual(before)
    expect(await testDb().selectFrom("drive").select("id").where("shop_id", "=", bShopId).execute()).toEqual(bBefore)
  })

  it("lists show none of shop A's rows", async () => {
    const bDrive = await startDrive(bTech)
    const aIds = [
      a.finished.id,
      a.recording.id,
      a.foreign.id,
      a.job.id,
      a.bareJob.id,
      a.profileId,
      a.shop.tech.id,
      a.shop.codriver.id,
      aNoticeId,
    ]
    for (const path of [
      "/api/drives",
      "/api/review",
      "/api/jobs",
      "/api/profiles",
      "/api/users",
      "/api/people?role=co_driver",
      "/api/people?role=technician",
      "/api/notifications",
      "/api/numbers",
      "/api/numbers?format=csv",
    ]) {
      const res = await bAdmin.get(path)
      expect(res.status, path).toBe(200)
      for (const id of aIds) expect(res.text, `${path} shows ${id}`).not.toContain(id)
      expect(res.text).not.toContain(a.shop.tech.email)
    }
    const drives = await bAdmin.get("/api/drives")
    expect(drives.body.drives.map((d: { id: string }) => d.id)).toEqual([bDrive])
  })

  // Drive ids are the recorder's client-made UUIDs and name a drive within its shop only (DEVELOPERS.md "Drive
  // ids: public per shop, internal across the server"): shop B starting a drive with an id shop A uses gets a
  // new drive of its own (201, as for any new id), and learns nothing about A's.
  it("a drive id shop A uses is, for shop B, just a new drive of B's", async () => {
    const before = await snapshotShop(a.shop.shopId)
    const started = await bAdmin.post("/api/drives", { id: a.finished.id, vehicleDescription: "B's loaner" })
    expect(started.status, started.text).toBe(201)
    expect(started.body.drive).toMatchObject({
      id: a.finished.id,
      status: "recording",
      verdict: null,
      vehicleDescription: "B's loaner",
      jobId: null,
    })
    expect(started.text).not.toContain(a.shop.tech.id)
    const again = await bAdmin.post("/api/drives", { id: a.finished.id })
    expect(again.status).toBe(200)
    expect(again.body.drive).toEqual(started.body.drive)
    const seen = await bAdmin.get(`/api/drives/${a.finished.id}`)
    expect(seen.status).toBe(200)
    expect(seen.body.drive).toMatchObject({ status: "recording", counts: { samples: 0, marks: 0 } })
    expect(seen.text).not.toContain(a.shop.tech.id)
    expect(await snapshotShop(a.shop.shopId)).toEqual(before)
  })

  // Mark ids are the recorder's client-made UUIDs and name a mark within its drive only (primary key
  // (drive_id, id)): shop B sending an id shop A used stores B's own mark, like any new id, and learns nothing.
  it("a mark id shop A uses is, on shop B's own drive, just a new mark of B's", async () => {
    const before = await snapshotShop(a.shop.shopId)
    const bDrive = await recordedDrive(bTech, null)
    const aMarkId = a.recording.markIds[0]!
    const mark = { ...driveFile(9).marks[0]!, id: aMarkId }
    const first = await bTech.post(`/api/drives/${bDrive.id}/marks`, { marks: [mark] })
    expect(first.status, first.text).toBe(200)
    expect(first.body).toEqual({ accepted: 1, duplicates: 0 })
    // the same post again is a replay on B's drive, as for any mark
    const again = await bTech.post(`/api/drives/${bDrive.id}/marks`, { marks: [mark] })
    expect(again.body).toEqual({ accepted: 0, duplicates: 1 })
    const bRows = await testDb()
      .selectFrom("mark")
      .select(["id", "drive_id", "shop_id"])
      .where("id", "=", aMarkId)
      .where("shop_id", "=", bShopId)
      .execute()
    expect(bRows).toEqual([{ id: aMarkId, drive_id: internalDriveId(bShopId, bDrive.id), shop_id: bShopId }])
    const shown = await bTech.get(`/api/drives/${bDrive.id}/file`)
    expect(shown.status).toBe(200)
    expect(shown.body.marks).toHaveLength(driveFile(9).marks.length + 1)
    // B's undo of that mark takes back B's mark only
    const undo = await bTech.delete(`/api/drives/${bDrive.id}/marks/${aMarkId}`)
    expect(undo.status).toBe(204)
    expect(
      await testDb().selectFrom("mark").select("id").where("id", "=", aMarkId).where("shop_id", "=", bShopId).execute(),
    ).toEqual([])
    expect(await snapshotShop(a.shop.shopId)).toEqual(before)
  })
})
