import fc from "fast-check"
import { describe, expect, it } from "vitest"
import { driveFileSchema, parseDriveFile } from "@/lib/drive-file"
import { fastParseDriveFile } from "@/lib/drive-file/fast-check"
import { generateDrive } from "@/lib/tracks"

const base = generateDrive({ seed: 5, hz: 1, minutes: 8, pattern: "short" })

// Values a sample field may hold in a file someone sends: good ones, edge ones and wrong ones.
const value = fc.oneof(
  fc.double({ noNaN: false }),
  fc.integer({ min: -200, max: 2_000_000_000_000 }),
  fc.constantFrom(
    0,
    -0,
    90,
    -90,
    180,
    -180,
    90.0000001,
    -180.5,
    1.5,
    Number.MAX_SAFE_INTEGER + 2,
    Infinity,
    -Infinity,
    NaN,
  ),
  fc.constantFrom(null, undefined, "1", true, [], {}),
)
const fieldName = fc.constantFrom("t", "lat", "lon", "speed", "accuracy", "extra")

describe("fastParseDriveFile", () => {
  it("accepts a good file and returns what the schema returns", () => {
    const text = JSON.stringify({ ...base, extraTop: 1 })
    const fast = fastParseDriveFile(JSON.parse(text))
    expect(fast).not.toBeNull()
    expect(fast).toEqual(driveFileSchema.parse(JSON.parse(text)))
  })

  it("never accepts what the schema refuses, and when it accepts, gives the schema's output", () => {
    fc.assert(
      fc.property(fc.nat(base.samples.length - 1), fieldName, value, fc.boolean(), (i, field, v, drop) => {
        const samples = base.samples.map((s) => ({ ...s })) as Record<string, unknown>[]
        if (drop) delete samples[i]![field]
        else samples[i]![field] = v
        const file = { ...base, samples }
        const zod = driveFileSchema.safeParse(file)
        const fast = fastParseDriveFile(file)
        if (!zod.success) expect(fast).toBeNull()
        if (fast) expect(fast).toEqual(zod.data)
      }),
      { numRuns: 300 },
    )
  }, 60_000)

  it("leaves the wording to the schema: samples[3].lat: must be between -90 and 90", () => {
    const samples = base.samples.map((s, i) => (i === 3 ? { ...s, lat: 91 } : s))
    expect(parseDriveFile({ ...base, samples })).toEqual({
      ok: false,
      path: "samples[3].lat",
      message: "must be between -90 and 90",
    })
    const marks = [...base.marks, { t: 5, kind: "gap" }]
    const r = parseDriveFile({ ...base, marks })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.path).toBe(`marks[${base.marks.length}].gapFt`)
    expect(fastParseDriveFile({ ...base, format: "other" })).toBeNull()
    expect(fastParseDriveFile({ ...base, profile: { minSpeedMph: -1 } })).toBeNull()
  })
})
