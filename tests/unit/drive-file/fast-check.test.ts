import fc from "fast-check"
import { describe, expect, it } from "vitest"
import type { z } from "zod"
import { driveFileSchema, parseDriveFile } from "@/lib/drive-file"
import { fastParseDriveFile } from "@/lib/drive-file/fast-check"
import { generateDrive } from "@/lib/tracks"
import { fastParseSampleBatch, sampleBatchSchema } from "@/lib/validation/drive"

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

/** The fast check never accepts what the schema refuses, and when it accepts, gives the schema's output. */
function expectAgreement(schema: z.ZodType, fast: (input: unknown) => unknown, input: unknown) {
  const zod = schema.safeParse(input)
  const out = fast(input)
  if (!zod.success) expect(out).toBeNull()
  if (out) expect(out).toEqual(zod.data)
}

/** Copies of `samples`, sample `i`'s `field` set to `v` or, with `drop`, taken out. */
function withOneFieldChanged(samples: readonly object[], i: number, field: string, v: unknown, drop: boolean) {
  const out = samples.map((s) => ({ ...s })) as Record<string, unknown>[]
  if (drop) delete out[i]![field]
  else out[i]![field] = v
  return out
}

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
        const file = { ...base, samples: withOneFieldChanged(base.samples, i, field, v, drop) }
        expectAgreement(driveFileSchema, fastParseDriveFile, file)
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

describe("fastParseSampleBatch", () => {
  const batch = { batchId: "b-1", samples: base.samples.slice(0, 50) }

  it("accepts the recorder's batch and returns what the schema returns (unknown keys dropped alike)", () => {
    const sent = JSON.parse(
      JSON.stringify({ ...batch, sentAt: 1, samples: batch.samples.map((s) => ({ ...s, heading: 90 })) }),
    )
    const fast = fastParseSampleBatch(sent)
    expect(fast).not.toBeNull()
    expect(fast).toEqual(sampleBatchSchema.parse(sent))
  })

  it("never accepts what the schema refuses, and when it accepts, gives the schema's output", () => {
    const batchId = fc.oneof(
      fc.string({ maxLength: 120 }),
      fc.constantFrom("", "x".repeat(100), "x".repeat(101), null, 7, undefined),
    )
    fc.assert(
      fc.property(
        fc.nat(batch.samples.length - 1),
        fieldName,
        value,
        fc.boolean(),
        batchId,
        fc.boolean(),
        (i, field, v, drop, id, notArray) => {
          const samples = withOneFieldChanged(batch.samples, i, field, v, drop)
          const sent = { batchId: id, samples: notArray ? { 0: samples[0] } : samples }
          expectAgreement(sampleBatchSchema, fastParseSampleBatch, sent)
        },
      ),
      { numRuns: 400 },
    )
  }, 60_000)

  it("leaves too many samples and a body that is not an object to the schema", () => {
    // 10,000 samples a POST at most (lib/validation/drive.ts); the schema names it.
    const many = { batchId: "many", samples: Array.from({ length: 10_001 }, (_, i) => ({ t: i, lat: 0, lon: 0 })) }
    expect(sampleBatchSchema.safeParse(many).success).toBe(false)
    expect(fastParseSampleBatch(many)).toBeNull()
    expect(fastParseSampleBatch([batch])).toBeNull()
    expect(fastParseSampleBatch(null)).toBeNull()
  })
})
