import { PDFDocument } from "pdf-lib"
import { describe, expect, it } from "vitest"
import { createTestShop } from "../../helpers/db"
import { type ApiClient, signedIn } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"
import {
  completeUpload,
  JPEG_START,
  objectExists,
  putToPresignedUrl,
  startUpload,
  storedAttachment,
  TINY_PNG,
  uploadFile,
  setUpShopWithJob,
} from "./helpers"

const team = setUpShopWithJob("Uploads")

const MB = 1024 * 1024

/** An upload address for `bytes` on the suite's job; nothing is put there yet. */
function start(client: ApiClient, filename: string, contentType: string, bytes: Uint8Array) {
  return startUpload(client, { jobId: team.job.id, filename, contentType, bytes })
}

/** A whole upload of `bytes` to the suite's job. */
function upload(client: ApiClient, filename: string, contentType: string, bytes: Uint8Array) {
  return uploadFile(client, { jobId: team.job.id, filename, contentType, bytes })
}

async function objectKeyOf(attachmentId: string) {
  return (await storedAttachment(attachmentId))?.object_key
}

describe("POST /api/uploads", () => {
  it("refuses a file over 15 MB with a 413", async () => {
    const tech = await signedIn(team.shop.tech)
    const res = await tech.post("/api/uploads", {
      jobId: team.job.id,
      filename: "big.jpg",
      contentType: "image/jpeg",
      size: 15 * MB + 1,
    })
    expect(res.status).toBe(413)
    expect(res.body.error.code).toBe("too_large")
    const ok = await tech.post("/api/uploads", {
      jobId: team.job.id,
      filename: "edge.jpg",
      contentType: "image/jpeg",
      size: 15 * MB,
    })
    expect(ok.status).toBe(201)
  })

  it("refuses a type that is not a photo or PDF with a 400", async () => {
    const tech = await signedIn(team.shop.tech)
    for (const contentType of ["application/zip", "image/gif", "text/html"]) {
      const res = await tech.post("/api/uploads", { jobId: team.job.id, filename: "x.bin", contentType, size: 100 })
      expect(res.status).toBe(400)
      expect(res.body.error.fields.contentType).toMatch(/must be one of/)
    }
  })

  it("refuses another shop's job (404) and co-drivers (403)", async () => {
    const other = await createTestShop("Uploads other")
    const otherJob = await createJob(await signedIn(other.lead))
    const tech = await signedIn(team.shop.tech)
    expect(
      (await tech.post("/api/uploads", { jobId: otherJob.id, filename: "a.png", contentType: "image/png", size: 10 }))
        .status,
    ).toBe(404)
    const codriver = await signedIn(team.shop.codriver)
    expect(
      (
        await codriver.post("/api/uploads", {
          jobId: team.job.id,
          filename: "a.png",
          contentType: "image/png",
          size: 10,
        })
      ).status,
    ).toBe(403)
  })
})

describe("POST /api/uploads/:id/complete", () => {
  it("completes a PNG whose bytes are a PNG, and lists it on the job with a link that serves the file", async () => {
    const tech = await signedIn(team.shop.tech)
    const taskId = team.job.tasks[0]!.id
    const { id, done } = await uploadFile(tech, {
      jobId: team.job.id,
      taskId,
      filename: "tires.png",
      contentType: "image/png",
      bytes: TINY_PNG,
    })
    expect(done.status).toBe(200)
    expect(done.body.attachment).toMatchObject({ id, taskId, contentType: "image/png", size: TINY_PNG.length })
    expect(done.body.attachment.thumbnailUrl).toContain(id)

    const detail = await tech.get(`/api/jobs/${team.job.id}`)
    expect(detail.body.job.attachments.map((a: { id: string }) => a.id)).toContain(id)

    const file = await tech.getBytes(done.body.attachment.url)
    expect(file.status).toBe(200)
    expect(file.bytes.equals(TINY_PNG)).toBe(true)
    expect(file.headers.get("content-type")).toBe("image/png")
    expect(file.headers.get("x-content-type-options")).toBe("nosniff")
    expect(file.headers.get("content-disposition")).toMatch(/^attachment; /)

    const otherShop = await createTestShop("Attachment other")
    expect((await (await signedIn(otherShop.lead)).get(done.body.attachment.url)).status).toBe(404)
  })

  it("completes a JPEG whose bytes start FF D8 FF", async () => {
    const tech = await signedIn(team.shop.tech)
    const { done } = await upload(tech, "face.jpg", "image/jpeg", JPEG_START)
    expect(done.status).toBe(200)
    expect(done.body.attachment.contentType).toBe("image/jpeg")
  })

  it("refuses a file whose bytes are not the declared type, and removes it from the object store", async () => {
    const tech = await signedIn(team.shop.tech)
    const pending = await start(tech, "scan.pdf", "application/pdf", TINY_PNG)
    await putToPresignedUrl(pending.uploadUrl, "application/pdf", TINY_PNG)
    const key = (await objectKeyOf(pending.id))!
    expect(await objectExists(key)).toBe(true)

    const done = await completeUpload(tech, pending.id)
    expect(done.status).toBe(400)
    expect(done.body.error.message).toMatch(/image\/png, not application\/pdf/)
    expect(await objectExists(key)).toBe(false) // HeadObject through the S3 SDK: gone
    expect(await objectKeyOf(pending.id)).toBeUndefined()
    const detail = await tech.get(`/api/jobs/${team.job.id}`)
    expect(detail.body.job.attachments.map((a: { id: string }) => a.id)).not.toContain(pending.id)
  })

  it("refuses text dressed as a photo", async () => {
    const tech = await signedIn(team.shop.tech)
    const bytes = Buffer.from("<html>not a photo</html>")
    const pending = await start(tech, "photo.webp", "image/webp", bytes)
    await putToPresignedUrl(pending.uploadUrl, "image/webp", bytes)
    const key = (await objectKeyOf(pending.id))!
    const done = await completeUpload(tech, pending.id)
    expect(done.status).toBe(400)
    expect(await objectExists(key)).toBe(false)
  })

  it("answers 400 while nothing was uploaded yet, and keeps the upload open", async () => {
    const tech = await signedIn(team.shop.tech)
    const pending = await start(tech, "later.png", "image/png", TINY_PNG)
    const early = await completeUpload(tech, pending.id)
    expect(early.status).toBe(400)
    await putToPresignedUrl(pending.uploadUrl, "image/png", TINY_PNG)
    expect((await completeUpload(tech, pending.id)).status).toBe(200)
  })
})

describe("what is served is what was checked (issue 15)", () => {
  it("a second PUT to a used upload address changes nothing served", async () => {
    const tech = await signedIn(team.shop.tech)
    const { id, uploadUrl, done } = await upload(tech, "bumper.png", "image/png", TINY_PNG)
    expect(done.status).toBe(200)
    const html = Buffer.from("<html><script>alert(document.cookie)</script></html>")
    // The address may still be inside its few minutes; whatever the store does with the PUT, nothing served changes.
    await putToPresignedUrl(uploadUrl, "image/png", html).catch(() => null)
    const file = await tech.getBytes(done.body.attachment.url)
    expect(file.status).toBe(200)
    expect(file.bytes.equals(TINY_PNG)).toBe(true)
    expect(file.headers.get("content-type")).toBe("image/png")
    const again = await completeUpload(tech, id)
    expect(again.status).toBe(200)
    expect((await tech.getBytes(done.body.attachment.url)).bytes.equals(TINY_PNG)).toBe(true)
    // The accepted copy lives under a key no upload address is made for.
    expect(await objectKeyOf(id)).toMatch(/^stored\//)
  })

  it("the upload address expires in minutes", async () => {
    const tech = await signedIn(team.shop.tech)
    const pending = await start(tech, "x.png", "image/png", TINY_PNG)
    const expires = Number(new URL(pending.uploadUrl).searchParams.get("X-Amz-Expires"))
    expect(expires).toBeGreaterThan(0)
    expect(expires).toBeLessThanOrEqual(10 * 60)
  })

  it("refuses a file that starts with %PDF- but holds HTML, and accepts a real PDF, served as an attachment", async () => {
    const tech = await signedIn(team.shop.tech)
    const fake = Buffer.from("%PDF-1.7\n<html><body><script>alert(1)</script></body></html>\n")
    const bad = await upload(tech, "scan.pdf", "application/pdf", fake)
    expect(bad.done.status).toBe(400)
    expect(bad.done.body.error.message).toMatch(/does not open as one/)

    const doc = await PDFDocument.create()
    doc.addPage([200, 200])
    doc.addPage([200, 200])
    const real = Buffer.from(await doc.save())
    const good = await upload(tech, "alignment printout.pdf", "application/pdf", real)
    expect(good.done.status).toBe(200)
    const file = await tech.getBytes(good.done.body.attachment.url)
    expect(file.bytes.equals(real)).toBe(true)
    expect(file.headers.get("content-type")).toBe("application/pdf")
    expect(file.headers.get("x-content-type-options")).toBe("nosniff")
    expect(file.headers.get("content-disposition")).toMatch(/^attachment; /)
  })

  it("downloads files whose names hold accents, emoji and other scripts with their names intact (RFC 6266, RFC 8187)", async () => {
    const tech = await signedIn(team.shop.tech)
    for (const name of ["résumé.png", "🚗 front.png", "車検.png"]) {
      const { done } = await upload(tech, name, "image/png", TINY_PNG)
      expect(done.status).toBe(200)
      const header = (await tech.getBytes(done.body.attachment.url)).headers.get("content-disposition")!
      const star = /filename\*=UTF-8''([^;]+)$/.exec(header)?.[1]
      expect(decodeURIComponent(star!)).toBe(name)
    }
  })
})
