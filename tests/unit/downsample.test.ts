import { describe, expect, it } from "vitest"
import { computeTimeline } from "@/lib/record"
import { downsampleTimeline, lttbIndices } from "@/lib/record/downsample"
import { resolveProfile } from "@/lib/drive-file"
import { generateDrive } from "@/lib/tracks"

describe("lttbIndices (largest-triangle-three-buckets, Steinarsson 2013)", () => {
  it("keeps the first and last point and the peak of a spike", () => {
    const ys = Array.from({ length: 1000 }, (_, i) => (i === 537 ? 100 : Math.sin(i / 50)))
    const idx = lttbIndices(
      ys.length,
      (i) => i,
      (i) => ys[i]!,
      50,
    )
    expect(idx).toHaveLength(50)
    expect(idx[0]).toBe(0)
    expect(idx.at(-1)).toBe(999)
    expect(idx).toContain(537)
    expect([...idx].sort((a, b) => a - b)).toEqual(idx)
  })
  it("returns every index when the threshold is not below the count", () => {
    expect(
      lttbIndices(
        5,
        (i) => i,
        (i) => i,
        10,
      ),
    ).toEqual([0, 1, 2, 3, 4])
  })
})

describe("downsampleTimeline", () => {
  const file = generateDrive({ seed: 36_000, hz: 10, minutes: 60, pattern: "met" })
  const timeline = computeTimeline(file.samples, file.marks, resolveProfile(file.profile))

  it("keeps at most 2,000 points of a 36,000-sample drive, in time order, with every band's edges", () => {
    expect(timeline.length).toBeGreaterThan(30_000)
    const out = downsampleTimeline(timeline, 2000)
    expect(out.length).toBeLessThanOrEqual(2000)
    expect(out.length).toBeGreaterThan(1500)
    for (let i = 1; i < out.length; i++) expect(out[i]!.tS).toBeGreaterThan(out[i - 1]!.tS)
    const kept = new Set(out)
    let runs = 0
    for (let i = 0; i < timeline.length; i++) {
      if (i === 0 || timeline[i]!.state !== timeline[i - 1]!.state) {
        runs++
        expect(kept.has(timeline[i]!)).toBe(true)
        if (i > 0) expect(kept.has(timeline[i - 1]!)).toBe(true)
      }
    }
    expect(runs).toBeGreaterThan(1)
    expect(out[0]).toBe(timeline[0])
    expect(out.at(-1)).toBe(timeline.at(-1))
  })

  it("keeps the edges of the longest runs when there are more runs than half the points", () => {
    const flicker = Array.from({ length: 10_000 }, (_, i) => ({
      tS: i,
      lat: 0,
      lon: 0,
      speedMph: 40,
      state: (i % 7 === 0 ? "slow" : i < 5000 ? "qualifying" : "following") as "slow" | "qualifying" | "following",
    }))
    const out = downsampleTimeline(flicker, 500)
    expect(out.length).toBeLessThanOrEqual(500)
    expect(out[0]).toBe(flicker[0])
    expect(out.at(-1)).toBe(flicker.at(-1))
  })
})
