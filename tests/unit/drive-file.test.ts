import { describe, expect, it } from "vitest"
import { z } from "zod"
import {
  DEFAULT_PROFILE,
  apiMarkSchema,
  driveFileSchema,
  formatParseError,
  markSchema,
  parseDriveFile,
  resolveProfile,
  sampleSchema,
} from "@/lib/drive-file"
import { issuesToFields } from "@/lib/validation/zod-fields"

const valid = () => ({
  format: "straightaway.drive/1",
  profile: { minSpeedMph: 35, leadGapFt: { min: 100, max: 165 } },
  samples: [
    { t: 1767261600000, lat: 44.0512, lon: -92.4871, speed: 16.2, accuracy: 5 },
    { t: 1767261601000, lat: 44.0514, lon: -92.4871, speed: null, accuracy: null },
    { t: 1767261602000, lat: 44.0516, lon: -92.4871 },
    { t: 1767261603000, lat: 44.0518, lon: -92.4871, speed: 16.4 },
  ],
  marks: [
    { t: 1767261660000, kind: "lead-on", gapFt: 130 },
    { t: 1767261670000, kind: "gap", gapFt: 140 },
    { t: 1767261680000, kind: "note", text: "Lead is a box truck" },
    { t: 1767261690000, kind: "cleared" },
  ],
})

function errorOf(input: unknown): string {
  const r = parseDriveFile(input)
  if (r.ok) throw new Error("expected the file to be refused")
  return formatParseError(r)
}

describe("parseDriveFile", () => {
  it("accepts a valid file and keeps null or absent speed and accuracy", () => {
    const r = parseDriveFile(valid())
    expect(r.ok).toBe(true)
    if (r.ok) {
      expect(r.file.samples).toHaveLength(4)
      expect(r.file.samples[1]!.speed).toBeNull()
      expect(r.file.samples[2]!.speed).toBeUndefined()
    }
  })

  it("names the path in bracket notation with a plain message", () => {
    const f = valid()
    f.samples[3]!.lat = 91
    expect(errorOf(f)).toBe("samples[3].lat: must be between -90 and 90")
  })

  it("refuses longitude outside -180..180 but accepts both ends", () => {
    const f = valid()
    f.samples[0]!.lon = 180
    f.samples[1]!.lon = -180
    expect(parseDriveFile(f).ok).toBe(true)
    f.samples[2]!.lon = 180.0001
    expect(errorOf(f)).toBe("samples[2].lon: must be between -180 and 180")
  })

  it("refuses an unknown format", () => {
    expect(errorOf({ ...valid(), format: "straightaway.drive/2" })).toBe('format: must be "straightaway.drive/1"')
  })

  it("refuses an unknown mark kind", () => {
    const f = valid() as { marks: unknown[] }
    f.marks[2] = { t: 1, kind: "overtake" }
    expect(errorOf(f)).toMatch(/^marks\[2\]\.kind: must be one of lead-on, gap, lead-off/)
  })

  it("requires gapFt on a gap mark and text on a note", () => {
    const a = valid() as { marks: unknown[] }
    a.marks[1] = { t: 1, kind: "gap" }
    expect(errorOf(a)).toBe("marks[1].gapFt: is required for a gap mark")
    const b = valid() as { marks: unknown[] }
    b.marks[2] = { t: 1, kind: "note" }
    expect(errorOf(b)).toBe("marks[2].text: is required for a note mark")
  })

  it("refuses wrong types, missing fields and negative or fractional values", () => {
    const wrongType = valid() as { samples: Record<string, unknown>[] }
    wrongType.samples[0]!.lat = "44.05"
    expect(errorOf(wrongType)).toBe("samples[0].lat: must be a number")
    const missing = valid() as { samples: Record<string, unknown>[] }
    delete missing.samples[1]!.lon
    expect(errorOf(missing)).toBe("samples[1].lon: is required")
    const negative = valid()
    negative.samples[0]!.speed = -0.1
    expect(errorOf(negative)).toBe("samples[0].speed: must be 0 m/s or more")
    const fractional = valid()
    fractional.samples[0]!.t = 1.5
    expect(errorOf(fractional)).toBe("samples[0].t: must be a whole number of milliseconds")
    expect(errorOf({ format: "straightaway.drive/1", samples: [] })).toBe("marks: is required")
    expect(errorOf(null)).toBe("file: must be a JSON object")
  })

  it("refuses a profile whose gap window is upside down", () => {
    expect(errorOf({ ...valid(), profile: { leadGapFt: { min: 200 } } })).toBe(
      "profile.leadGapFt.max: must be at least leadGapFt.min (200 ft)",
    )
    expect(errorOf({ ...valid(), profile: { maxGapSeconds: 0 } })).toBe("profile.maxGapSeconds: must be more than 0 s")
  })

  it("turns zod issues into an API field map keyed samples.3.lat", () => {
    const f = valid()
    f.samples[3]!.lat = -91
    f.samples[0]!.accuracy = -1
    const r = driveFileSchema.safeParse(f)
    expect(r.success).toBe(false)
    expect(issuesToFields(r.error!.issues)).toEqual({
      "samples.0.accuracy": "must be 0 m or more",
      "samples.3.lat": "must be between -90 and 90",
    })
  })

  it("words a wrong type as the API does (must be a number, not zod's stock sentence), and a missing one as required", () => {
    const stock = z.object({ n: z.number(), list: z.array(z.string()), box: z.object({}), on: z.boolean() })
    const r = stock.safeParse({ n: "7", list: 1, box: [], on: "yes" })
    expect(issuesToFields(r.error!.issues)).toEqual({
      n: "must be a number",
      list: "must be a list",
      box: "must be an object",
      on: "must be true or false",
    })
    expect(issuesToFields(stock.safeParse({ list: [], box: {}, on: true }).error!.issues)).toEqual({
      n: "is required",
    })
  })
})

describe("batch schemas for the API", () => {
  it("validates one sample and one mark on their own", () => {
    expect(sampleSchema.safeParse({ t: 0, lat: 0, lon: 0 }).success).toBe(true)
    expect(sampleSchema.safeParse({ t: 0, lat: 0, lon: 200 }).success).toBe(false)
    expect(markSchema.safeParse({ t: 5, kind: "lead-off" }).success).toBe(true)
    expect(markSchema.safeParse({ t: 5, kind: "gap" }).success).toBe(false)
  })

  it("requires a UUID id on an API mark and still checks the mark rules", () => {
    const id = "7d444840-9dc0-11d1-b245-5ffdce74fad2"
    expect(apiMarkSchema.safeParse({ id, t: 5, kind: "cleared" }).success).toBe(true)
    expect(apiMarkSchema.safeParse({ t: 5, kind: "cleared" }).success).toBe(false)
    expect(apiMarkSchema.safeParse({ id: "batch-1", t: 5, kind: "cleared" }).success).toBe(false)
    expect(apiMarkSchema.safeParse({ id, t: 5, kind: "note" }).success).toBe(false)
  })
})

describe("resolveProfile", () => {
  it("fills the defaults of drive-file.md", () => {
    expect(resolveProfile(undefined)).toEqual({
      minSpeedMph: 35, // common practice, no published source
      maxSpeedMph: null,
      leadGapFt: { min: 100, max: 165 }, // common practice, no published source
      minQualifyingMinutes: 10, // common practice: 10 to 30 minutes
      minFollowingMinutes: 2, // product default
      maxDriveMinutes: 30, // common practice
      maxAccelMps2: 3.0, // product default
      maxDecelMps2: 3.4, // product default below
      maxGapSeconds: 5, // product default
      maxAccuracyM: 30, // product default
      verifySpeedMph: 25, // common practice, no published source
    })
  })

  // AASHTO Green Book §3.2.2 (as restated in TxDOT Roadway Design Manual §4.11.1): 11.2 ft/s² = 3.4 m/s²
  it("uses the AASHTO comfortable deceleration rate 3.4 m/s² as the default braking limit", () => {
    expect(DEFAULT_PROFILE.maxDecelMps2).toBe(3.4)
    expect((11.2 * 0.3048).toFixed(1)).toBe("3.4")
  })

  it("keeps given keys and fills the rest, including half a gap window", () => {
    const p = resolveProfile({ minSpeedMph: 40, leadGapFt: { max: 200 }, maxSpeedMph: 70 })
    expect(p.minSpeedMph).toBe(40)
    expect(p.maxSpeedMph).toBe(70)
    expect(p.leadGapFt).toEqual({ min: 100, max: 200 })
    expect(p.verifySpeedMph).toBe(25)
  })
})
