// Drive ids are per shop (DEVELOPERS.md "Drive ids: public per shop, internal across the server"): the id a
// recorder makes names a drive within its shop only. Two shops that start a drive with the same id each get
// their own drive, use that id everywhere, and see nothing of the other's.
import { randomUUID } from "node:crypto"
import { sql } from "kysely"
import { beforeAll, describe, expect, it } from "vitest"
import { internalDriveId } from "@/lib/drive-id"
import { sha256Hex } from "@/lib/record/seal"
import { signShareToken } from "@/lib/share"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"
import { sampleRun } from "./helpers"

/** The first event of a fresh live stream (the snapshot), then the stream is closed. */
async function liveSnapshot(client: ApiClient, driveId: string) {
  const abort = new AbortController()
  const res = await fetch(`${testEnv().baseUrl}/api/drives/${driveId}/live`, {
    headers: { cookie: client.cookie ?? "", "x-forwarded-for": client.address, accept: "text/event-stream" },
    signal: abort.signal,
  })
  expect(res.status).toBe(200)
  const reader = res.body!.getReader()
  const decoder = new TextDecoder()
  let text = ""
  try {
    for (;;) {
      const { value, done } = await reader.read()
      if (done) throw new Error("the live stream ended before its snapshot")
      text += decoder.decode(value, { stream: true })
      const m = /event: snapshot\ndata: (.*)\n\n/.exec(text)
      if (m) return JSON.parse(m[1]!)
    }
  } finally {
    abort.abort()
  }
}

describe("drive ids are per shop", () => {
  const id = randomUUID()
  const markId = randomUUID()
  let a: TestShop
  let b: TestShop
  let aTech: ApiClient
  let bTech: ApiClient
  const aSamples = sampleRun(30, 7, Date.UTC(2026, 0, 1, 10))
  const bSamples = sampleRun(40, 8, Date.UTC(2026, 0, 2, 15))
  const aTs = new Set(aSamples.map((s) => s.t))
  const bTs = new Set(bSamples.map((s) => s.t))

  beforeAll(async () => {
    a = await createTestShop("SameIdA")
    b = await createTestShop("SameIdB")
    aTech = await signedIn(a.tech)
    bTech = await signedIn(b.tech)
  })

  it("both shops start a drive with the same id: two drives, each shop's own (201 both)", async () => {
    const madeA = await aTech.post("/api/drives", { id, vehicleDescription: "Invented Aldermoor wagon" })
    const madeB = await bTech.post("/api/drives", { id, vehicleDescription: "Invented Brackwater van" })
    expect([madeA.status, madeB.status]).toEqual([201, 201])
    expect(madeA.body.drive).toMatchObject({ id, driverId: a.tech.id, vehicleDescription: "Invented Aldermoor wagon" })
    expect(madeB.body.drive).toMatchObject({ id, driverId: b.tech.id, vehicleDescription: "Invented Brackwater van" })
    // a retry is still a replay of the shop's own drive
    const again = await bTech.post("/api/drives", { id, vehicleDescription: "something else" })
    expect(again.status).toBe(200)
    expect(again.body.drive).toEqual(madeB.body.drive)

    const rows = await testDb()
      .selectFrom("drive")
      .select(["id", "public_id", "shop_id"])
      .where("public_id", "=", id)
      .orderBy("created_at")
      .execute()
    expect(rows).toEqual([
      { id: internalDriveId(a.shopId, id), public_id: id, shop_id: a.shopId },
      { id: internalDriveId(b.shopId, id), public_id: id, shop_id: b.shopId },
    ])
  })

  it("samples and marks go to the poster's own drive, and each shop reads only its own", async () => {
    expect((await aTech.post(`/api/drives/${id}/samples`, { batchId: "1", samples: aSamples })).body).toMatchObject({
      accepted: 30,
    })
    // the same batch id on B's drive is B's first batch, not a replay of A's
    expect((await bTech.post(`/api/drives/${id}/samples`, { batchId: "1", samples: bSamples })).body).toMatchObject({
      accepted: 40,
      replayed: false,
    })
    const aMark = { id: markId, t: aSamples[5]!.t, kind: "note", text: "Mark of shop A" }
    const bMark = { id: markId, t: bSamples[5]!.t, kind: "note", text: "Mark of shop B" }
    expect((await aTech.post(`/api/drives/${id}/marks`, { marks: [aMark] })).body).toEqual({
      accepted: 1,
      duplicates: 0,
    })
    expect((await bTech.post(`/api/drives/${id}/marks`, { marks: [bMark] })).body).toEqual({
      accepted: 1,
      duplicates: 0,
    })

    const aDrive = await aTech.get(`/api/drives/${id}`)
    const bDrive = await bTech.get(`/api/drives/${id}`)
    expect(aDrive.body.drive).toMatchObject({ id, counts: { samples: 30, marks: 1 } })
    expect(bDrive.body.drive).toMatchObject({ id, counts: { samples: 40, marks: 1 } })
    expect(aDrive.body.score.samplesUsed).toBe(30)
    expect(bDrive.body.score.samplesUsed).toBe(40)
    expect(aDrive.text).not.toContain("Brackwater")
    expect(bDrive.text).not.toContain("Aldermoor")
  })

  it("exports only the shop's own samples and marks (drive file, CSV, GPX)", async () => {
    const aFile = await aTech.get(`/api/drives/${id}/file`)
    const bFile = await bTech.get(`/api/drives/${id}/file`)
    expect(aFile.body.samples.map((s: { t: number }) => s.t)).toEqual([...aTs])
    expect(bFile.body.samples.map((s: { t: number }) => s.t)).toEqual([...bTs])
    expect(aFile.body.marks).toEqual([expect.objectContaining({ text: "Mark of shop A" })])
    expect(bFile.body.marks).toEqual([expect.objectContaining({ text: "Mark of shop B" })])
    // the file name carries the public id, the one the shop knows
    expect(aFile.headers.get("content-disposition")).toContain(id.slice(0, 8))

    const aCsv = await aTech.get(`/api/drives/${id}/file?format=csv`)
    for (const t of bTs) expect(aCsv.text).not.toContain(String(t))
    for (const t of aTs) expect(aCsv.text).toContain(String(t))
    const bGpx = await bTech.get(`/api/drives/${id}/file?format=gpx`)
    expect(bGpx.text).toContain("Invented Brackwater van")
    expect(bGpx.text).not.toContain("Mark of shop A")
  })

  it("the live channel of each shop carries only its own drive, named by the public id", async () => {
    const aPoll = await aTech.get(`/api/drives/${id}/live?after=0`)
    const bPoll = await bTech.get(`/api/drives/${id}/live?after=0`)
    expect(aPoll.body.events.map((e: { body: { text?: string } }) => e.body.text)).toEqual(["Mark of shop A"])
    expect(bPoll.body.events.map((e: { body: { text?: string } }) => e.body.text)).toEqual(["Mark of shop B"])
    expect(aPoll.body.score.samplesUsed).toBe(30)
    expect(bPoll.body.score.samplesUsed).toBe(40)

    const aSnap = await liveSnapshot(aTech, id)
    const bSnap = await liveSnapshot(bTech, id)
    // the recorder compares snapshot.drive.id with its own id
    expect(aSnap.drive).toMatchObject({ id, vehicleDescription: "Invented Aldermoor wagon" })
    expect(bSnap.drive).toMatchObject({ id, vehicleDescription: "Invented Brackwater van" })
    expect(aSnap.marks.map((m: { text?: string }) => m.text)).toEqual(["Mark of shop A"])
    expect(bSnap.marks.map((m: { text?: string }) => m.text)).toEqual(["Mark of shop B"])
  })

  it("finishes, reviews and shares each drive on its own; the links show each shop's own record", async () => {
    const aFinish = await aTech.post(`/api/drives/${id}/finish`)
    expect(aFinish.status).toBe(200)
    expect(aFinish.body.drive).toMatchObject({ id, status: "finished" })
    // B's drive is still recording: A's finish did not touch it
    expect((await bTech.get(`/api/drives/${id}`)).body.drive.status).toBe("recording")
    expect((await bTech.post(`/api/drives/${id}/finish`)).status).toBe(200)

    const aLink = await (await signedIn(a.lead)).post(`/api/drives/${id}/share`, { expiresInDays: 1 })
    const bLink = await (await signedIn(b.lead)).post(`/api/drives/${id}/share`, { expiresInDays: 1 })
    expect([aLink.status, bLink.status]).toEqual([201, 201])
    expect(aLink.body.token).not.toBe(bLink.body.token)
    const anonymous = new ApiClient()
    const aPage = await anonymous.get(`/share/${aLink.body.token}`)
    const bPage = await anonymous.get(`/share/${bLink.body.token}`)
    expect(aPage.status).toBe(200)
    expect(aPage.text).toContain("Invented Aldermoor wagon")
    expect(aPage.text).not.toContain("Invented Brackwater van")
    expect(bPage.text).toContain("Invented Brackwater van")
    expect(bPage.text).not.toContain("Invented Aldermoor wagon")
    expect((await anonymous.get(`/share/${aLink.body.token}/record`)).headers.get("content-type")).toBe(
      "application/pdf",
    )

    // withdrawing A's links leaves B's working
    expect((await (await signedIn(a.lead)).delete(`/api/drives/${id}/share`)).status).toBe(204)
    expect((await anonymous.get(`/share/${aLink.body.token}`)).text).toContain('data-reason="withdrawn"')
    expect((await anonymous.get(`/share/${bLink.body.token}`)).text).toContain("Invented Brackwater van")

    // lists, the review queue and notices name the drive by its public id, never the internal one
    for (const path of ["/api/drives", "/api/numbers?format=csv"]) {
      const res = await (await signedIn(a.lead)).get(path)
      expect(res.text, path).toContain(id)
      expect(res.text, path).not.toContain(internalDriveId(a.shopId, id))
    }
  })

  it("deleting one shop's drive leaves the other's whole", async () => {
    await testDb().deleteFrom("drive").where("id", "=", internalDriveId(a.shopId, id)).execute()
    expect((await aTech.get(`/api/drives/${id}`)).status).toBe(404)
    const bDrive = await bTech.get(`/api/drives/${id}`)
    expect(bDrive.status).toBe(200)
    expect(bDrive.body.drive).toMatchObject({ id, status: "finished", counts: { samples: 40, marks: 1 } })
    const bFile = await bTech.get(`/api/drives/${id}/file`)
    expect(bFile.body.samples).toHaveLength(40)
  })
})

describe("the internal id", () => {
  it("is computed the same in PostgreSQL (drive_internal_id) as in lib/drive-id.ts", async () => {
    const pairs = Array.from({ length: 50 }, () => [randomUUID(), randomUUID()] as const)
    for (const [shop, pub] of pairs) {
      const { rows } = await sql<{ id: string }>`select drive_internal_id(${shop}::uuid, ${pub}::uuid) as id`.execute(
        testDb(),
      )
      expect(rows[0]!.id).toBe(internalDriveId(shop, pub))
    }
  })

  it("is held to that rule by the table: a drive row with any other id is refused", async () => {
    const shop = await createTestShop("IdCheck")
    const pub = randomUUID()
    const row = { shop_id: shop.shopId, public_id: pub, profile: "{}", driver_id: shop.tech.id }
    await expect(
      testDb()
        .insertInto("drive")
        .values({ ...row, id: pub })
        .execute(),
    ).rejects.toThrow(/drive_id_from_public_id/)
    await testDb()
      .insertInto("drive")
      .values({ ...row, id: internalDriveId(shop.shopId, pub) })
      .execute()
    // every stored drive follows it, those from before the migration included
    const { rows } = await sql<{ n: string }>`
      select count(*) as n from drive where id <> drive_internal_id(shop_id, public_id)`.execute(testDb())
    expect(Number(rows[0]!.n)).toBe(0)
  })

  it("a share link made before drive ids were per shop (its token names the public id) still opens", async () => {
    const shop = await createTestShop("OldLink")
    const tech = await signedIn(shop.tech)
    const pub = randomUUID()
    expect((await tech.post("/api/drives", { id: pub, vehicleDescription: "Invented Corriel coupe" })).status).toBe(201)
    await tech.post(`/api/drives/${pub}/samples`, { batchId: "1", samples: sampleRun(20) })
    expect((await tech.post(`/api/drives/${pub}/finish`)).status).toBe(200)
    // As the share route made links then: the token names the drive's id of that time (now its public id), and
    // its SHA-256 was kept in share_link with the drive (whose key the migration moved along).
    const token = signShareToken(process.env.APP_SECRET!, pub, Date.now() + 86_400_000)
    await testDb()
      .insertInto("share_link")
      .values({
        token_sha256: sha256Hex(token),
        shop_id: shop.shopId,
        drive_id: internalDriveId(shop.shopId, pub),
        revision: 1,
      })
      .execute()
    const page = await new ApiClient().get(`/share/${token}`)
    expect(page.status).toBe(200)
    expect(page.text).toContain("Invented Corriel coupe")
    // a token naming a public id with no such link behind it opens nothing
    const unknown = signShareToken(process.env.APP_SECRET!, randomUUID(), Date.now() + 86_400_000)
    expect((await new ApiClient().get(`/share/${unknown}`)).text).toContain('data-reason="gone"')
  })
})
