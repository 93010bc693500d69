import { describe, expect, it } from "vitest"
import { resolveProfile } from "@/lib/drive-file/profile"
import { checklistRows, computeTimeline, formatDuration, projectTrack, roLabel, type RecordData } from "@/lib/record"
import { buildDriveRecordPdf } from "@/lib/record/pdf"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { withCheckDigit } from "@/lib/vin"
import { checklistBody } from "../helpers/checklist"
import { pdfText } from "../helpers/pdf"

// A 1x1 PNG (PNG spec, ISO/IEC 15948: signature, IHDR, IDAT, IEND).
const PNG_1X1 = Uint8Array.from(
  Buffer.from(
    "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==",
    "base64",
  ),
)

function recordFor(pattern: "met" | "short", vin: string): RecordData {
  const file = generateDrive({ seed: pattern === "met" ? 11 : 12, pattern, minutes: pattern === "met" ? 18 : 9 })
  const score = scoreDrive(file)
  return {
    driveId: "5d7c2a9e-1b3f-4e8a-9c6d-0f1e2d3c4b5a",
    shopName: "Juniper Flats Body Works",
    job: { roNumber: "RO-7731", customerName: "Ines Marrow" },
    vehicle: { vin, year: 2024, make: "Corvane", model: "Tessel", plate: "QX 4410" },
    vehicleDescription: null,
    task: { sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" },
    profileName: "Forward radar, drive learn",
    checklist: {
      rows: checklistRows(checklistBody({ tires: { unit: "psi", placard: 35, fl: 35, fr: 34, rl: 35, rr: 36 } })),
      notes: "Cover wiped before the drive.",
      completedBy: "Ada Fenwick",
      completedAt: "2026-03-02T09:00:00.000Z",
    },
    photos: [{ filename: "mount.png", contentType: "image/png", bytes: PNG_1X1 }],
    score,
    timeline: computeTimeline(file.samples, file.marks, resolveProfile(file.profile)),
    marks: file.marks.map((m) => ({
      t: m.t,
      kind: m.kind,
      gapFt: m.gapFt ?? null,
      text: m.text ?? null,
      byName: "Ada Fenwick",
    })),
    driverName: "Ada Fenwick",
    coDriverName: "Cyril Oduya",
    markLoggers: ["Ada Fenwick"],
    review: null,
    startedAt: "2026-03-02T09:10:00.000Z",
    finishedAt: "2026-03-02T09:30:00.000Z",
    generatedAt: "2026-03-02T10:00:00.000Z",
  }
}

describe("drive record PDF", () => {
  it("holds the VIN, the verdict word and the qualifying minutes of a short drive", async () => {
    const vin = withCheckDigit("0ZTRJFBG0FC625797")
    const data = recordFor("short", vin)
    expect(data.score.verdict).toBe("short")
    const text = await pdfText(await buildDriveRecordPdf(data))
    expect(text).toContain(vin)
    expect(text).toContain("Short")
    const qualifying = formatDuration(data.score.qualifyingSecondsBeforeClear)
    expect(text).toContain(`${qualifying} (10 min needed)`)
    expect(text).toContain("RO-7731")
    expect(text).toContain("Bumper or grille work")
    // The cautions travel with every record.
    expect(text).toContain("does not certify")
    expect(text).toContain("maker's calibration procedure")
  })

  it("shows a met drive as Met with its function-check speed and the reviewer's decision", async () => {
    const data = recordFor("met", withCheckDigit("0ZTFB2F50DH512345"))
    data.review = {
      decision: "approve",
      note: "Clean drive.",
      reviewerName: "Bo Lindqvist",
      at: "2026-03-02T11:00:00.000Z",
    }
    expect(data.score.verdict).toBe("met")
    const text = await pdfText(await buildDriveRecordPdf(data))
    expect(text).toContain("Met")
    expect(text).toContain("Approved by Bo Lindqvist")
    const verified = data.score.conditions.find((c) => c.key === "verified")!
    expect(text).toContain(`at ${Math.round(verified.value!)} mph`)
    expect(text).toContain("Cyril Oduya")
  })

  it("writes times in the shop's zone with the zone named, the shop's units, and a speed chart", async () => {
    const data = recordFor("short", withCheckDigit("0ZTRJFBG0FC625797"))
    data.timeZone = "America/Chicago"
    data.units = "metric"
    const text = await pdfText(await buildDriveRecordPdf(data))
    // 2026-03-02T09:10Z is 3:10 AM in Chicago (CST, UTC-6 until the second Sunday of March; IANA tz database)
    expect(text).toContain("Mar 2, 2026, 3:10 AM CST")
    expect(text).toContain("America/Chicago (CST)")
    expect(text).not.toContain(" UTC")
    // NIST SP 811: 1 km = 1000 m; the distance in km with one decimal
    expect(text).toContain(`${(Math.round(data.score.distanceMeters / 100) / 10).toFixed(1)} km`)
    expect(text).toContain("56 km/h or faster") // 35 mph × 0.44704 × 3.6 = 56.3 km/h (NIST SP 811)
    expect(text).not.toMatch(/\d mph/)
    // the speed chart: its title, its axes (speed in the shop's units) and its legend
    for (const label of ["Speed over time", "Speed (km/h)", "Minutes into the drive", "the qualifying band"])
      expect(text).toContain(label)
  })

  it("writes names and notes outside plain ASCII as typed, accents, ß and Polish or Greek letters included", async () => {
    const data = recordFor("short", withCheckDigit("0ZTRJFBG0FC625797"))
    data.shopName = "Carrosserie Lefèvre"
    data.job = { roNumber: "RO-7731", customerName: "Zoë Brontë, Hauptstraße 5" }
    data.driverName = "Łukasz Żółć"
    data.coDriverName = "Δήμητρα Παππά"
    data.checklist!.notes = "Kept the résumé of the bumper work; 1500 ± 10 mm."
    const text = await pdfText(await buildDriveRecordPdf(data))
    for (const typed of [
      "Carrosserie Lefèvre",
      "Zoë Brontë, Hauptstraße 5",
      "Łukasz Żółć",
      "Δήμητρα Παππά",
      "résumé of the bumper work",
      "1500 ± 10 mm",
    ])
      expect(text.normalize("NFC")).toContain(typed)
    expect(text).not.toContain("?")
  })

  it("gives the same bytes for the same record (the PDF's dates come from the record, not the clock)", async () => {
    const data = recordFor("met", withCheckDigit("0ZTFB2F50DH512345"))
    const first = await buildDriveRecordPdf(data)
    const second = await buildDriveRecordPdf(data)
    expect(Buffer.from(first).equals(Buffer.from(second))).toBe(true)
    const later = await buildDriveRecordPdf({ ...data, generatedAt: "2026-03-02T10:00:01.000Z" })
    expect(Buffer.from(later).equals(Buffer.from(first))).toBe(false)
  })

  it("still builds when a photo's bytes are not an image", async () => {
    const data = recordFor("short", withCheckDigit("0ZTRJFBG0FC625797"))
    data.photos = [{ filename: "broken.jpg", contentType: "image/jpeg", bytes: new Uint8Array([1, 2, 3]) }]
    const text = await pdfText(await buildDriveRecordPdf(data))
    expect(text).toContain("broken.jpg could not be read")
  })
})

describe("record helpers", () => {
  it("adds RO to a repair order number only when it lacks it", () => {
    expect(roLabel("RO-24102")).toBe("RO-24102")
    expect(roLabel("24102")).toBe("RO 24102")
  })

  it("fails a tire more than the tolerance off its placard pressure", () => {
    const rows = checklistRows({ tires: { unit: "psi", placard: 35, fl: 35, fr: 35, rl: 31, rr: 35 } }, 3)
    expect(rows.find((r) => r.label.startsWith("Tire"))!.ok).toBe(false)
    const kpa = checklistRows({ tires: { unit: "kPa", placard: 240, fl: 260, fr: 240, rl: 240, rr: 240 } }, 3)
    // NIST SP 811: 1 psi = 6.894757 kPa, so 3 psi = 20.68 kPa; 20 kPa off is inside.
    expect(kpa.find((r) => r.label.startsWith("Tire"))!.ok).toBe(true)
  })

  it("colours the track by state and keeps it inside the box", () => {
    const file = generateDrive({ seed: 5, pattern: "met", minutes: 16 })
    const timeline = computeTimeline(file.samples, file.marks, resolveProfile(file.profile))
    const paths = projectTrack(timeline, 300, 200, 10)
    const states = new Set(paths.map((p) => p.state))
    expect(states.has("qualifying") || states.has("following")).toBe(true)
    expect(states.has("following")).toBe(true)
    for (const p of paths)
      for (const [x, y] of p.points) {
        expect(x).toBeGreaterThanOrEqual(9.99)
        expect(x).toBeLessThanOrEqual(290.01)
        expect(y).toBeGreaterThanOrEqual(9.99)
        expect(y).toBeLessThanOrEqual(190.01)
      }
  })
})
