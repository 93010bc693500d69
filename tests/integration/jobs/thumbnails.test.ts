import { PDFDocument, PDFName, PDFNumber, PDFRawStream } from "pdf-lib"
import sharp from "sharp"
import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop } from "../../helpers/db"
import { type ApiClient, signedIn } from "../../helpers/http"
import { insertJob, insertScoredDrive } from "../review/fixtures"
import {
  completeUpload,
  objectExists,
  putToPresignedUrl,
  startUpload,
  storedAttachment,
  uploadFile,
  setUpShopWithJob,
} from "./helpers"

const team = setUpShopWithJob("Thumbnails")
let landscape: Buffer

const W = 3000
const H = 2000

/**
 * A 3000 x 2000 JPEG of about 3 MB, like a phone photo: top half red, bottom half blue, with seeded noise so it
 * does not compress away. Stored with EXIF Orientation 6 and a Make tag.
 */
async function phonePhoto() {
  const px = Buffer.alloc(W * H * 3)
  let seed = 12345
  const noise = () => {
    seed = (seed * 1103515245 + 12345) & 0x7fffffff
    return (seed / 0x7fffffff - 0.5) * 60
  }
  const clamp = (v: number) => Math.max(0, Math.min(255, v))
  for (let y = 0; y < H; y++) {
    const top = y < H / 2
    for (let x = 0; x < W; x++) {
      const i = (y * W + x) * 3
      const n = noise()
      px[i] = clamp((top ? 200 : 30) + n)
      px[i + 1] = clamp(60 + n + (x % 200) / 4)
      px[i + 2] = clamp((top ? 40 : 210) + n)
    }
  }
  return sharp(px, { raw: { width: W, height: H, channels: 3 } })
    .jpeg({ quality: 92 })
    .withMetadata({ orientation: 6 })
    .withExifMerge({ IFD0: { Make: "Invented Optics" } })
    .toBuffer()
}

/** A whole upload of `bytes` to the suite's job, on no task. */
function upload(client: ApiClient, filename: string, contentType: string, bytes: Uint8Array) {
  return uploadFile(client, { jobId: team.job.id, taskId: null, filename, contentType, bytes })
}

async function pixel(image: Buffer, x: number, y: number) {
  const { data, info } = await sharp(image).raw().toBuffer({ resolveWithObject: true })
  const i = (y * info.width + x) * info.channels
  return [data[i]!, data[i + 1]!, data[i + 2]!]
}

beforeAll(async () => {
  landscape = await phonePhoto()
})

describe("thumbnails made at upload", () => {
  it("stores a 320 px JPEG of a phone photo, turned upright by its EXIF orientation, without its metadata", async () => {
    expect((await sharp(landscape).metadata()).orientation).toBe(6)
    const tech = await signedIn(team.shop.tech)
    const { id, done } = await uploadFile(tech, {
      jobId: team.job.id,
      taskId: team.job.tasks[0]!.id,
      filename: "bumper.jpg",
      contentType: "image/jpeg",
      bytes: landscape,
    })
    expect(done.status).toBe(200)
    expect(done.body.attachment.thumbnailUrl).toBe(`/api/attachments/${id}?variant=thumbnail`)
    const row = (await storedAttachment(id))!
    expect(row.thumbnail_key).toBe(`${row.object_key}.thumb.jpg`)
    expect(await objectExists(row.thumbnail_key!)).toBe(true)

    const thumb = await tech.getBytes(done.body.attachment.thumbnailUrl)
    expect(thumb.status).toBe(200)
    expect(thumb.headers.get("content-type")).toBe("image/jpeg")
    expect(thumb.headers.get("cache-control")).toMatch(/^private/)
    const meta = await sharp(thumb.bytes).metadata()
    expect(meta.format).toBe("jpeg")
    // EXIF 2.32 (CIPA DC-008) Orientation 6: the stored 0th row is the visual right-hand side, so the upright
    // picture is portrait, 2000 x 3000 -> 213 x 320, with the stored top half (red) on the right.
    expect([meta.width, meta.height]).toEqual([213, 320])
    const [lr, , lb] = await pixel(thumb.bytes, 20, 160)
    const [rr, , rb] = await pixel(thumb.bytes, 193, 160)
    expect(lb).toBeGreaterThan(lr! + 100) // left: blue
    expect(rr).toBeGreaterThan(rb! + 100) // right: red
    expect(meta.orientation).toBeUndefined()
    expect(meta.exif).toBeUndefined()
    // Far smaller than the photo: under 3 % of its bytes.
    expect(landscape.byteLength).toBeGreaterThan(2_000_000)
    expect(thumb.bytes.byteLength).toBeLessThan(landscape.byteLength * 0.03)

    // The link without a variant is still the photo itself.
    const full = await tech.getBytes(done.body.attachment.url)
    expect(full.status).toBe(200)
    expect(full.bytes.equals(landscape)).toBe(true)
  })

  it("makes a JPEG thumbnail of a PNG, its transparent part on white", async () => {
    const png = await sharp({
      create: { width: 1200, height: 800, channels: 4, background: { r: 0, g: 0, b: 0, alpha: 0 } },
    })
      .composite([
        {
          input: { create: { width: 600, height: 800, channels: 4, background: { r: 20, g: 140, b: 60, alpha: 1 } } },
          left: 0,
          top: 0,
        },
      ])
      .png()
      .toBuffer()
    const tech = await signedIn(team.shop.tech)
    const { done } = await upload(tech, "placard.png", "image/png", png)
    expect(done.status).toBe(200)
    const thumb = await tech.getBytes(done.body.attachment.thumbnailUrl)
    expect(thumb.headers.get("content-type")).toBe("image/jpeg")
    const meta = await sharp(thumb.bytes).metadata()
    expect([meta.format, meta.width, meta.height]).toEqual(["jpeg", 320, 213])
    const [gr, gg] = await pixel(thumb.bytes, 40, 100)
    expect(gg).toBeGreaterThan(gr! + 60) // the green half
    const white = await pixel(thumb.bytes, 280, 100)
    for (const c of white) expect(c).toBeGreaterThan(240)
  })

  it("keeps a small photo at its own size", async () => {
    const small = await sharp({ create: { width: 32, height: 24, channels: 3, background: { r: 200, g: 120, b: 40 } } })
      .webp()
      .toBuffer()
    const tech = await signedIn(team.shop.tech)
    const { done } = await upload(tech, "label.webp", "image/webp", small)
    expect(done.status).toBe(200)
    const meta = await sharp((await tech.getBytes(done.body.attachment.thumbnailUrl)).bytes).metadata()
    expect([meta.format, meta.width, meta.height]).toEqual(["jpeg", 32, 24])
  })

  it("answers 404 for another shop's thumbnail and for a co-driver not on the job", async () => {
    const tech = await signedIn(team.shop.tech)
    const small = await sharp({ create: { width: 400, height: 300, channels: 3, background: "#336699" } })
      .jpeg()
      .toBuffer()
    const { done } = await upload(tech, "mount.jpg", "image/jpeg", small)
    expect(done.status).toBe(200)
    const other = await createTestShop("Thumbnails other")
    const theirs = await (await signedIn(other.lead)).getBytes(done.body.attachment.thumbnailUrl)
    expect(theirs.status).toBe(404)
    expect(theirs.bytes.byteLength).toBeLessThan(500) // the error body, no picture
    expect((await (await signedIn(team.shop.codriver)).getBytes(done.body.attachment.thumbnailUrl)).status).toBe(404)
    expect((await tech.getBytes(`/api/attachments/${done.body.attachment.id}?variant=poster`)).status).toBe(400)
  })
})

describe("photos that do not decode", () => {
  // Decision: a JPEG, PNG or WebP whose picture cannot be read is refused at upload (400) and removed, like a file
  // that fails the byte check, so the technician learns it while still at the vehicle.
  it("refuses a JPEG that passes the byte check but holds no picture, and removes it", async () => {
    const fake = Buffer.concat([
      Buffer.from("ffd8ffe000104a46494600010100000100010000", "hex"),
      Buffer.alloc(4000, 0x5a),
    ])
    const tech = await signedIn(team.shop.tech)
    const { id, done } = await upload(tech, "broken.jpg", "image/jpeg", fake)
    expect(done.status).toBe(400)
    expect(done.body.error.code).toBe("invalid_request")
    expect(done.body.error.message).toMatch(/cannot be read.*removed/)
    expect(await storedAttachment(id)).toBeUndefined()
    const detail = await tech.get(`/api/jobs/${team.job.id}`)
    expect(detail.body.job.attachments.map((a: { id: string }) => a.id)).not.toContain(id)
  })

  it("refuses a JPEG cut short in transfer, and removes the object", async () => {
    const cut = landscape.subarray(0, Math.floor(landscape.byteLength * 0.4))
    const tech = await signedIn(team.shop.tech)
    const start = await startUpload(tech, {
      jobId: team.job.id,
      filename: "cut.jpg",
      contentType: "image/jpeg",
      bytes: cut,
    })
    await putToPresignedUrl(start.uploadUrl, "image/jpeg", cut)
    const key = (await storedAttachment(start.id))!.object_key
    const done = await completeUpload(tech, start.id)
    expect(done.status).toBe(400)
    expect(await objectExists(key)).toBe(false)
    expect(await objectExists(`${key}.thumb.jpg`)).toBe(false)
    expect(await storedAttachment(start.id)).toBeUndefined()
  })

  it("keeps a HEIC photo without a thumbnail (no HEVC decoder in the image library) and sends the photo itself", async () => {
    // A 64 x 48 HEIC (HEVC) made with libheif's heif-enc (x265), 488 bytes.
    const heic = Buffer.from(
      "AAAAHGZ0eXBoZWljAAAAAG1pZjFoZWljbWlhZgAAAaptZXRhAAAAAAAAACFoZGxyAAAAAAAAAABwaWN0AAAAAAAAAAAAAAAAAAAAAA5waXRtAAAAAAACAAAAEGlkYXQAAAAAAEAAMAAAADhpbG9jAQAAAERAAAIAAQAAAAAAAAHOAAEAAAAAAAAAGgACAAEAAAAAAAAAAQAAAAAAAAAIAAAAOGlpbmYAAAAAAAIAAAAVaW5mZQIAAAEAAQAAaHZjMQAAAAAVaW5mZQIAAAAAAgAAZ3JpZAAAAADVaXBycAAAALNpcGNvAAAAc2h2Y0MBA3AAAAAAAAAAAAAe8AD8/fj4AAAPAyAAAQAYQAEMAf//A3AAAAMAkAAAAwAAAwAeugJAIQABACdCAQEDcAAAAwCQAAADAAADAB6gIIEFlurkprmwIAAAAwAgAAADACEiAAEABkQBwXPAiQAAABRpc3BlAAAAAAAAAEAAAABAAAAAFGlzcGUAAAAAAAAAQAAAADAAAAAQcGl4aQAAAAADCAgIAAAAGmlwbWEAAAAAAAAAAgABAoECAAICA4QAAAAaaXJlZgAAAAAAAAAOZGltZwACAAEAAQAAACJtZGF0AAAAFigBrxmA70mlvtMTh/6ngv8irWmPm4A=",
      "base64",
    )
    expect(heic.byteLength).toBe(488)
    const tech = await signedIn(team.shop.tech)
    const { id, done } = await upload(tech, "IMG_0042.HEIC", "image/heic", heic)
    expect(done.status).toBe(200)
    expect((await storedAttachment(id))!.thumbnail_key).toBeNull()
    const thumb = await tech.getBytes(`/api/attachments/${id}?variant=thumbnail`)
    expect(thumb.status).toBe(200)
    expect(thumb.bytes.equals(heic)).toBe(true)
    expect(thumb.headers.get("content-disposition")).toMatch(/^attachment; /)
  })
})

describe("the drive record PDF", () => {
  it("embeds the thumbnails, not the full photos", async () => {
    const recordShop = await createTestShop("Thumbnail record")
    const recordJob = await insertJob(recordShop)
    const drive = await insertScoredDrive(recordShop, { pattern: "short", seed: 412, job: recordJob })
    const tech = await signedIn(recordShop.tech)
    for (const name of ["front.jpg", "bracket.jpg"]) {
      const file = { jobId: recordJob.jobId, taskId: recordJob.taskId, filename: name, contentType: "image/jpeg" }
      expect((await uploadFile(tech, { ...file, bytes: landscape })).done.status).toBe(200)
    }
    const pdf = await tech.getBytes(`/api/drives/${drive.id}/record`)
    expect(pdf.status).toBe(200)
    // Two full photos alone would be about 5.9 MB; the whole record stays under a tenth of one photo.
    expect(pdf.bytes.byteLength).toBeLessThan(landscape.byteLength / 10)
    const doc = await PDFDocument.load(pdf.bytes)
    const images = doc.context
      .enumerateIndirectObjects()
      .map(([, obj]) => obj)
      .filter(
        (obj): obj is PDFRawStream =>
          obj instanceof PDFRawStream && obj.dict.get(PDFName.of("Subtype")) === PDFName.of("Image"),
      )
      .map((s) => [
        s.dict.lookup(PDFName.of("Width"), PDFNumber).asNumber(),
        s.dict.lookup(PDFName.of("Height"), PDFNumber).asNumber(),
      ])
    expect(images).toEqual([
      [213, 320],
      [213, 320],
    ])
  })
})
