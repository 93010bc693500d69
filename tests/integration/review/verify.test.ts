// Issue "a verifiable record": the PDF names its revision and prints a verification code; the public
// verify route says which revision of which record a code or a PDF's exact bytes are, and nothing more.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { generateDrive } from "@/lib/tracks"
import { createTestShop, type TestShop } from "../../helpers/db"
import { testEnv } from "../../helpers/env"
import { ApiClient, signedIn } from "../../helpers/http"
import { pdfText } from "../../helpers/pdf"

async function download(client: ApiClient, driveId: string) {
  const res = await client.getBytes(`/api/drives/${driveId}/record`)
  expect(res.status).toBe(200)
  return res.bytes
}

function postPdf(client: ApiClient, bytes: Uint8Array) {
  return client.request("POST", "/api/verify", undefined, {
    raw: bytes,
    headers: { "content-type": "application/pdf" },
  })
}

describe("verifying a drive record", () => {
  let shop: TestShop
  let lead: ApiClient
  let driveId: string
  let file: ReturnType<typeof generateDrive>
  beforeAll(async () => {
    shop = await createTestShop("Verify")
    lead = await signedIn(shop.lead)
    file = generateDrive({ seed: 41, minutes: 20, pattern: "never-cleared" })
    const imported = await lead.post("/api/drives/import", file)
    expect(imported.status).toBe(201)
    driveId = imported.body.drive.id
  })

  it("prints revision 1's code and verify address on the PDF; the code and the PDF's bytes match revision 1", async () => {
    const pdf = await download(lead, driveId)
    const [latest] = (await lead.get(`/api/drives/${driveId}/revisions`)).body.revisions
    expect(latest.revision).toBe(1)
    const text = await pdfText(pdf)
    expect(text).toContain(latest.code)
    expect(text).toContain("Revision 1 of this record")
    expect(text).toMatch(/\/verify/)
    const anon = new ApiClient()
    const byCode = await anon.post("/api/verify", { code: latest.code.toLowerCase().replace(/-/g, " ") })
    expect(byCode.status).toBe(200)
    expect(byCode.body).toMatchObject({ result: "matches", revision: 1, latestRevision: 1 })
    expect(byCode.body.message).toMatch(/matches revision 1/)
    const byBytes = await postPdf(anon, pdf)
    expect(byBytes.body).toMatchObject({ result: "matches", revision: 1 })
  })

  it("matches nothing for a PDF with one byte changed", async () => {
    const pdf = await download(lead, driveId)
    const changed = new Uint8Array(pdf)
    const at = Math.floor(changed.length / 2)
    changed[at] = changed[at]! ^ 0x01
    const res = await postPdf(new ApiClient(), changed)
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ result: "no_match", message: expect.stringMatching(/matches no record/) })
  })

  it("says a newer revision exists for a revision-1 PDF and code once a late mark made revision 2", async () => {
    const old = await download(lead, driveId)
    const [rev1] = (await lead.get(`/api/drives/${driveId}/revisions`)).body.revisions
    const late = await lead.post(`/api/drives/${driveId}/marks`, {
      marks: [{ id: randomUUID(), t: file.samples[900]!.t, kind: "cleared" }],
    })
    expect(late.status).toBe(200)
    const revisions = (await lead.get(`/api/drives/${driveId}/revisions`)).body.revisions
    expect(revisions[0].revision).toBe(2)
    const anon = new ApiClient()
    for (const res of [await postPdf(anon, old), await anon.post("/api/verify", { code: rev1.code })]) {
      expect(res.body).toMatchObject({ result: "newer_revision", revision: 1, latestRevision: 2 })
      expect(res.body.message).toMatch(/revision 2 is the latest/)
    }
    const fresh = await download(lead, driveId)
    expect(await pdfText(fresh)).toContain(revisions[0].code)
    expect((await postPdf(anon, fresh)).body).toMatchObject({ result: "matches", revision: 2, latestRevision: 2 })
  })

  it("shows another shop's person no more than the PDF itself holds", async () => {
    const other = await signedIn((await createTestShop("VerifyOther")).lead)
    const pdf = await download(lead, driveId)
    const text = (await pdfText(pdf)).replace(/\s+/g, " ")
    const [latest] = (await lead.get(`/api/drives/${driveId}/revisions`)).body.revisions
    const res = await other.post("/api/verify", { code: latest.code })
    expect(res.status).toBe(200)
    expect(Object.keys(res.body).sort()).toEqual(["latestRevision", "message", "record", "result", "revision"])
    expect(Object.keys(res.body.record).sort()).toEqual(["sealedAt", "shopName", "vehicle", "verdict"])
    for (const value of Object.values(res.body.record) as string[]) expect(text).toContain(value)
    expect(text).toContain(`Revision ${res.body.revision} of this record`)
    // The signed-in API of the other shop still knows nothing of the drive.
    expect((await other.get(`/api/drives/${driveId}/revisions`)).status).toBe(404)
  })

  it("refuses what is not a code or a PDF with a 400 in the error shape", async () => {
    const anon = new ApiClient()
    const bad = await anon.post("/api/verify", { code: "not-a-code" })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.code).toMatch(/12 letters and digits/)
    expect(
      (
        await anon.request("POST", "/api/verify", undefined, {
          raw: "{",
          headers: { "content-type": "application/json" },
        })
      ).status,
    ).toBe(400)
    const html = await anon.request("POST", "/api/verify", undefined, {
      raw: "<html></html>",
      headers: { "content-type": "application/pdf" },
    })
    expect(html.status).toBe(400)
    expect(html.body.error.fields.file).toBe("is not a PDF")
  })

  it("throttles one address after 20 codes that match nothing (429 with Retry-After), like sign-in", async () => {
    const anon = new ApiClient()
    let last = await anon.post("/api/verify", { code: "0000-0000-0000" })
    for (let i = 0; i < 25 && last.status === 200; i++)
      last = await anon.post("/api/verify", { code: `0000-0000-${String(i).padStart(4, "0")}` })
    expect(last.status).toBe(429)
    expect(last.body.error.code).toBe("too_many_attempts")
    expect(Number(last.headers.get("retry-after"))).toBeGreaterThan(0)
    expect((await new ApiClient().post("/api/verify", { code: "0000-0000-0000" })).status).toBe(200)
  })

  // Last in the file: the server stops reading mid-upload, which resets the client's kept-alive connection.
  it("refuses a chunked body over the limit with a 413 while it is still arriving", async () => {
    const anon = new ApiClient()
    // A chunked body (no Content-Length) is counted as it arrives.
    const chunk = new Uint8Array(1024 * 1024)
    chunk.set(new TextEncoder().encode("%PDF-1.7\n"))
    let sent = 0
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent++ >= 12) controller.close()
        else controller.enqueue(chunk)
      },
    })
    const res = await fetch(`${testEnv().baseUrl}/api/verify`, {
      method: "POST",
      headers: { "content-type": "application/pdf", "x-forwarded-for": anon.address },
      body: stream,
      duplex: "half",
    } as RequestInit)
    expect(res.status).toBe(413)
    expect((await res.json()).error.code).toBe("too_large")
  })
})
