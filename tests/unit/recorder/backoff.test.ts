import fc from "fast-check"
import { describe, expect, it } from "vitest"
import { BACKOFF_MAX_MS, backoffCeilingMs, backoffDelayMs } from "@/lib/recorder/backoff"

describe("backoff", () => {
  it("doubles the ceiling each retry up to the maximum", () => {
    expect([1, 2, 3, 4, 5].map((n) => backoffCeilingMs(n))).toEqual([1000, 2000, 4000, 8000, 16000])
    expect(backoffCeilingMs(50)).toBe(BACKOFF_MAX_MS)
  })

  it("spreads waits between a quarter of the base and the ceiling (full jitter)", () => {
    expect(backoffDelayMs(3, () => 0)).toBe(250)
    expect(backoffDelayMs(3, () => 0.999999)).toBe(4000)
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 40 }),
        fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }),
        (n, r) => {
          const d = backoffDelayMs(n, () => r)
          return d >= 250 && d <= backoffCeilingMs(n)
        },
      ),
    )
  })

  it("gives different waits for different draws, so phones do not retry in step", () => {
    const waits = new Set([0.1, 0.4, 0.7].map((r) => backoffDelayMs(6, () => r)))
    expect(waits.size).toBe(3)
  })
})
