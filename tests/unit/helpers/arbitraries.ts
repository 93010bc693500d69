import fc from "fast-check"
import type { DriveFile, Mark, Sample } from "@/lib/drive-file"
import { MARK_KINDS } from "@/lib/drive-file"
import { T0 } from "./drive"

/** Samples with unique, increasing times (steps 0.1-9 s, so some data gaps), some without speed or accuracy. */
export const arbSamples = fc
  .array(
    fc.record({
      stepMs: fc.integer({ min: 100, max: 9000 }),
      dLat: fc.integer({ min: -400, max: 400 }),
      dLon: fc.integer({ min: -400, max: 400 }),
      speed: fc.option(fc.double({ min: 0, max: 35, noNaN: true }), { nil: null }),
      accuracy: fc.option(fc.integer({ min: 0, max: 45 }), { nil: null }),
    }),
    { minLength: 0, maxLength: 80, size: "medium" },
  )
  .map((steps) => {
    let t = T0
    let lat = 44.05
    let lon = -92.49
    return steps.map(({ stepMs, dLat, dLon, speed, accuracy }): Sample => {
      t += stepMs
      lat += dLat / 1e6
      lon += dLon / 1e6
      const s: Sample = { t, lat: Math.round(lat * 1e7) / 1e7, lon: Math.round(lon * 1e7) / 1e7 }
      if (speed !== null) s.speed = speed
      if (accuracy !== null) s.accuracy = accuracy
      return s
    })
  })

/** Marks with unique times; `t` is a position 0..1 that arbDrive maps onto the samples' time span. */
export const arbMarks = fc
  .uniqueArray(
    fc.record({
      t: fc.integer({ min: 0, max: 1_000_000 }),
      kind: fc.constantFrom(...MARK_KINDS),
      gapFt: fc.integer({ min: 60, max: 220 }),
      withGap: fc.boolean(),
    }),
    { selector: (m) => m.t, maxLength: 12 },
  )
  .map((ms) =>
    ms.map(({ t, kind, gapFt, withGap }): Mark => {
      if (kind === "gap") return { t, kind, gapFt }
      if (kind === "note") return { t, kind, text: "invented note" }
      if (kind === "lead-on" && withGap) return { t, kind, gapFt }
      return { t, kind }
    }),
  )

export const arbProfile = fc.record({
  minQualifyingMinutes: fc.constantFrom(0.1, 0.5, 1),
  minFollowingMinutes: fc.constantFrom(0.05, 0.2),
  maxDriveMinutes: fc.constantFrom(1, 2, 30),
  maxSpeedMph: fc.constantFrom(null, 60),
  maxAccelMps2: fc.constantFrom(1, 3),
})

export const arbDrive: fc.Arbitrary<DriveFile> = fc
  .tuple(arbSamples, arbMarks, arbProfile)
  .map(([samples, marks, profile]) => {
    const spanMs = (samples.at(-1)?.t ?? T0) - T0 + 2000
    // Spread marks over the samples' span so they fall before, inside and after the track.
    const placed = marks.map((m) => ({ ...m, t: T0 - 1000 + Math.round((m.t / 1_000_000) * spanMs) }))
    const unique = placed.filter((m, i) => placed.findIndex((o) => o.t === m.t) === i)
    return { format: "straightaway.drive/1" as const, profile, samples, marks: unique }
  })

/** A permutation of 0..n-1 from random keys. */
export function permute<T>(items: readonly T[], keys: readonly number[]): T[] {
  return items
    .map((item, i) => ({ item, key: keys[i % Math.max(1, keys.length)]! * 1000 + i }))
    .sort((a, b) => a.key - b.key)
    .map((x) => x.item)
}
