import { describe, expect, it } from "vitest"
import { roundGapFt, timeGap } from "@/lib/recorder/time-gap"
import { mphToMps } from "@/lib/units"

describe("timeGap", () => {
  // NIST SP 811: 1 mph = 0.44704 m/s and 1 ft = 0.3048 m exactly, so 60 mph = 88 ft/s exactly.
  it("turns 1.5 s at 60 mph into 132 ft", () => {
    const gap = timeGap(1_000, 2_500, mphToMps(60))
    expect(gap?.seconds).toBe(1.5)
    expect(gap?.gapFt).toBeCloseTo(132, 9)
  })

  // NIST SP 811: 45 mph = 66 ft/s exactly; 2 s -> 132 ft.
  it("turns 2 s at 45 mph into 132 ft", () => {
    expect(timeGap(0, 2000, mphToMps(45))?.gapFt).toBeCloseTo(132, 9)
  })

  it("gives seconds without feet when our speed is unknown", () => {
    expect(timeGap(0, 1800, null)).toEqual({ seconds: 1.8, gapFt: null })
  })

  it("refuses a second tap that is not after the first", () => {
    expect(timeGap(5000, 5000, 20)).toBeNull()
    expect(timeGap(5000, 4000, 20)).toBeNull()
  })

  it("rounds to whole feet", () => {
    expect(roundGapFt(131.6)).toBe(132)
    expect(roundGapFt(131.4)).toBe(131)
  })
})
