import fc from "fast-check"
import { describe, expect, it } from "vitest"
import {
  decodeSample,
  encodeDegrees,
  encodeMillis,
  encodeSampleColumns,
  INT4_MAX,
  storedSample,
} from "@/lib/drive-file/stored"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"

describe("stored sample precision", () => {
  it("reads back exactly what was sent when it has at most 7 decimals (degrees) or 3 (m/s, m)", () => {
    // The spec's own example sample (shared/specs/drive-file.md "File").
    const s = { t: 1767261600000, lat: 44.0512, lon: -92.4871, speed: 16.2, accuracy: 5 }
    expect(storedSample(s)).toEqual(s)
    fc.assert(
      fc.property(
        fc.integer({ min: -900_000_000, max: 900_000_000 }),
        fc.integer({ min: -1_800_000_000, max: 1_800_000_000 }),
        fc.integer({ min: 0, max: 200_000 }),
        (lat7, lon7, mm) => {
          const sent = {
            t: 1,
            lat: Number((lat7 / 1e7).toFixed(7)),
            lon: Number((lon7 / 1e7).toFixed(7)),
            speed: Number((mm / 1e3).toFixed(3)),
          }
          expect(storedSample(sent)).toEqual(sent)
        },
      ),
    )
  })

  it("moves any value by at most half a step: 5e-8 degree, 0.0005 m/s or m", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -90, max: 90, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: 0, max: 2_000_000, noNaN: true }),
        (lat, lon, v) => {
          const out = storedSample({ t: 0, lat, lon, speed: v, accuracy: v })
          expect(Math.abs(out.lat - lat)).toBeLessThanOrEqual(5e-8 + 1e-12)
          expect(Math.abs(out.lon - lon)).toBeLessThanOrEqual(5e-8 + 1e-12)
          expect(Math.abs(out.speed! - v)).toBeLessThanOrEqual(5e-4 + 1e-9)
          expect(Object.is(out.lat, -0) || Object.is(out.lon, -0)).toBe(false)
        },
      ),
    )
  })

  it("fits int4: the extremes of the spec's ranges, and values past int4 held at its largest", () => {
    // int4 is -2,147,483,648..2,147,483,647 (PostgreSQL manual, "Numeric Types").
    expect(encodeDegrees(180)).toBe(1_800_000_000)
    expect(encodeDegrees(-180)).toBe(-1_800_000_000)
    expect(encodeMillis(3_000_000)).toBe(INT4_MAX)
    expect(encodeMillis(Number.MAX_VALUE)).toBe(INT4_MAX)
    expect(encodeMillis(null)).toBeNull()
    expect(encodeMillis(undefined)).toBeNull()
    expect(decodeSample(5, 1, -1, null, 0)).toEqual({ t: 5, lat: 1e-7, lon: -1e-7, accuracy: 0 })
  })

  it("encodes a batch column by column the same way", () => {
    const samples = [
      { t: 1, lat: 44.12345678, lon: -92.5, speed: null },
      { t: 2, lat: 0, lon: 0, accuracy: 4.0004 },
    ]
    expect(encodeSampleColumns(samples)).toEqual({
      t: [1, 2],
      lat: [441234568, 0],
      lon: [-925000000, 0],
      speed: [null, null],
      accuracy: [null, 4000],
    })
  })

  // The spec's tolerances (shared/specs/drive-file.md "Tolerances that checks allow"): seconds +-2 s,
  // distance +-0.2 %, event counts exact. Stored rounding keeps a generated drive's score inside them.
  it.each(["met", "harsh", "short", "unverified"] as const)(
    "scores a %s drive within the spec's tolerances after storage rounding",
    (pattern) => {
      const file = generateDrive({ seed: 11, hz: 10, minutes: 20, pattern, speedMissingShare: 0.2, dataGaps: 1 })
      const raw = scoreDrive(file)
      const stored = scoreDrive({ ...file, samples: file.samples.map(storedSample) })
      expect(stored.verdict).toBe(raw.verdict)
      expect(stored.harshEvents).toEqual(raw.harshEvents)
      for (const key of [
        "durationSeconds",
        "gapSeconds",
        "qualifyingSeconds",
        "followingSeconds",
        "qualifyingSecondsBeforeClear",
        "followingSecondsBeforeClear",
      ] as const) {
        expect(Math.abs(stored[key] - raw[key]), key).toBeLessThanOrEqual(2)
      }
      expect(Math.abs(stored.distanceMeters - raw.distanceMeters)).toBeLessThanOrEqual(raw.distanceMeters * 0.002)
      expect(stored.samplesUsed).toBe(raw.samplesUsed)
    },
  )
})
