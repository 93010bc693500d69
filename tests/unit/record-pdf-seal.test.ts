import QRCode from "qrcode"
import { describe, expect, it } from "vitest"
import { computeTimeline, type RecordData } from "@/lib/record"
import { buildDriveRecordPdf } from "@/lib/record/pdf"
import { verifyLink } from "@/lib/record/pdf-seal"
import { resolveProfile } from "@/lib/drive-file/profile"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { pdfText } from "../helpers/pdf"

function record(seal?: RecordData["seal"]): RecordData {
  const file = generateDrive({ seed: 3, pattern: "short", minutes: 9 })
  const score = scoreDrive(file)
  return {
    driveId: "5d7c2a9e-1b3f-4e8a-9c6d-0f1e2d3c4b5a",
    shopName: "Juniper Flats Body Works",
    job: null,
    vehicle: null,
    vehicleDescription: "Invented Tarrow hatchback",
    task: null,
    profileName: null,
    checklist: null,
    photos: [],
    score,
    timeline: computeTimeline(file.samples, file.marks, resolveProfile(file.profile)),
    marks: [],
    driverName: "Ada Fenwick",
    coDriverName: null,
    markLoggers: [],
    review: null,
    startedAt: "2026-01-01T10:00:00.000Z",
    finishedAt: "2026-01-01T10:09:00.000Z",
    generatedAt: "2026-01-02T08:00:00.000Z",
    seal,
  }
}

describe("the drive record's seal", () => {
  const seal = {
    revision: 2,
    revisedAt: "2026-01-02T07:55:12.000Z",
    code: "04HM-ASW9-NF6Y",
    verifyUrl: "https://shop.example.invalid/verify",
  }

  it("prints the revision, the verification code and the verify address", async () => {
    const text = (await pdfText(await buildDriveRecordPdf(record(seal)))).replace(/\s+/g, " ")
    // the shop's zone (US Central by default): 07:55 UTC is 01:55 CST (UTC-6 in January)
    expect(text).toContain(
      "Revision 2 of this record, sealed Jan 2, 2026, 1:55 AM CST. Verification code 04HM-ASW9-NF6Y.",
    )
    expect(text).toContain("Check this record")
    expect(text).toContain("Verification code: 04HM-ASW9-NF6Y")
    expect(text).toContain("https://shop.example.invalid/verify")
  }, 30_000)

  it("leaves all of it out of a record with no seal", async () => {
    const text = await pdfText(await buildDriveRecordPdf(record()))
    expect(text).not.toContain("Check this record")
    expect(text).not.toContain("Verification code")
  }, 30_000)

  it("encodes the verify page with the code filled in (a version the QR standard, ISO/IEC 18004, allows)", () => {
    expect(verifyLink(seal)).toBe("https://shop.example.invalid/verify?code=04HM-ASW9-NF6Y")
    const qr = QRCode.create(verifyLink(seal), { errorCorrectionLevel: "M" })
    // ISO/IEC 18004: a version-v symbol is 17 + 4v modules wide, v from 1 to 40.
    expect((qr.modules.size - 17) % 4).toBe(0)
    expect(qr.version).toBe((qr.modules.size - 17) / 4)
  })
})
