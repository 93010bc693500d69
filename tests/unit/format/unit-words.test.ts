import { describe, expect, it } from "vitest"
import { DEFAULT_PROFILE, resolveProfile } from "@/lib/drive-file/profile"
import { formatLengthRangeFt, formatSpeedBandMph } from "@/lib/format"
import { describeReasons } from "@/lib/format/conditions"
import { checkWords } from "@/lib/record/calibrations"
import { gpsMessage } from "@/lib/recorder/position"
import { profileInWords, speedMeterWords } from "@/lib/recorder/profile-words"
import { typedGapFt } from "@/lib/recorder/time-gap"
import { checkSpeedWords, checkTooSlowWords } from "@/lib/road-test/words"
import { scoreDrive } from "@/lib/scoring"
import { check, roadTest } from "../helpers/road-test"

// The words the crew and the record's readers see, in both unit systems. Profiles and marks keep mph and feet
// (drive-file format); the expected metric values are worked by hand with NIST's exact factors
// (NIST SP 811, 2008 edition, Appendix B.8: 1 mi = 1609.344 m, so 1 mph = 1.609344 km/h; 1 ft = 0.3048 m;
// standard acceleration of gravity g = 9.80665 m/s²).

describe("road-test check speeds", () => {
  it("says the check's speed in mph for a US customary shop", () => {
    expect(checkSpeedWords(30, "imperial")).toBe("30 mph or faster")
    expect(checkSpeedWords(null, "imperial")).toBe("any speed")
    expect(checkTooSlowWords(45, "imperial")).toBe("Under 45 mph now: a pass here would not count.")
  })

  it("says it in km/h for a metric shop", () => {
    // NIST SP 811: 30 mph × 1.609344 = 48.28032 km/h -> 48.3 (check speeds to a tenth)
    expect(checkSpeedWords(30, "metric")).toBe("48.3 km/h or faster")
    expect(checkSpeedWords(null, "metric")).toBe("any speed")
    // NIST SP 811: 45 mph × 1.609344 = 72.42048 km/h -> 72.4
    expect(checkTooSlowWords(45, "metric")).toBe("Under 72.4 km/h now: a pass here would not count.")
  })
})

describe("the record's check words (page, PDF, e-mail)", () => {
  const passed = { label: "Lane keeping", need: "required", minSpeedMph: 45, status: "passed", speedMph: 52 }

  it("writes the speed it passed at and the speed it counts at in the shop's units", () => {
    expect(checkWords(passed, "imperial")).toBe("Passed at 52 mph (counts at 45 mph or faster; required)")
    // NIST SP 811: 52 × 1.609344 = 83.685888 -> 83.7 km/h; 45 × 1.609344 = 72.42048 -> 72.4 km/h
    expect(checkWords(passed, "metric")).toBe("Passed at 83.7 km/h (counts at 72.4 km/h or faster; required)")
  })

  it("never rounds a speed short of the check's up to it", () => {
    const below = { ...passed, status: "below_speed", speedMph: 44.9 }
    expect(checkWords(below, "imperial")).toBe(
      "Passed below its speed (not counted) at 44.9 mph (counts at 45 mph or faster; required)",
    )
    // NIST SP 811: 44.9 × 1.609344 = 72.2595 -> 72.3 km/h, under 72.4
    expect(checkWords(below, "metric")).toBe(
      "Passed below its speed (not counted) at 72.3 km/h (counts at 72.4 km/h or faster; required)",
    )
  })

  it("keeps the words for an unknown speed and a check not logged", () => {
    const unknown = { ...passed, status: "failed", speedMph: null, need: "where_equipped", minSpeedMph: null }
    expect(checkWords(unknown, "metric")).toBe("Failed at an unknown speed (counts at any speed; where equipped)")
    const notLogged = { ...passed, status: "not_logged", speedMph: null }
    expect(checkWords(notLogged, "metric")).toBe("Not logged (counts at 72.4 km/h or faster; required)")
  })
})

describe("speed bands and gap windows", () => {
  it("writes an open and a closed band", () => {
    expect(formatSpeedBandMph(35, null, "imperial")).toBe("35+ mph")
    expect(formatSpeedBandMph(35, 65, "imperial")).toBe("35–65 mph")
    // NIST SP 811: 35 × 1.609344 = 56.32704 -> 56; 65 × 1.609344 = 104.60736 -> 105
    expect(formatSpeedBandMph(35, null, "metric")).toBe("56+ km/h")
    expect(formatSpeedBandMph(35, 65, "metric")).toBe("56–105 km/h")
  })

  it("writes a gap window", () => {
    expect(formatLengthRangeFt(100, 300, "imperial")).toBe("100–300 ft")
    // NIST SP 811: 100 ft × 0.3048 = 30.48 m -> 30; 300 ft × 0.3048 = 91.44 m -> 91
    expect(formatLengthRangeFt(100, 300, "metric")).toBe("30–91 m")
  })
})

describe("the recorder's speed meter", () => {
  const open = resolveProfile({})
  const closed = resolveProfile({ minSpeedMph: 35, maxSpeedMph: 65 })

  it("says the band and why qualifying time pauses, in the shop's units", () => {
    expect(speedMeterWords(open, null, "imperial")).toBe("No speed from GPS yet · band 35+ mph")
    expect(speedMeterWords(open, null, "metric")).toBe("No speed from GPS yet · band 56+ km/h")
    expect(speedMeterWords(open, 40, "metric")).toBe("Inside the band 56+ km/h")
    expect(speedMeterWords(open, 30, "imperial")).toBe("Under 35 mph: qualifying time paused")
    // NIST SP 811: 65 × 1.609344 = 104.60736 -> 105 km/h
    expect(speedMeterWords(closed, 70, "metric")).toBe("Over 105 km/h: qualifying time paused")
    expect(speedMeterWords(closed, 70, "imperial")).toBe("Over 65 mph: qualifying time paused")
  })

  it("decides on the stored mph, not on the rounded words", () => {
    // 34.9 mph = 56.166 km/h reads "56", as does the band's 35 mph: still under the band.
    expect(speedMeterWords(open, 34.9, "metric")).toBe("Under 56 km/h: qualifying time paused")
    expect(speedMeterWords(open, 35, "metric")).toBe("Inside the band 56+ km/h")
  })
})

describe("the profile before the drive", () => {
  it("reads in mph and feet for a US customary shop", () => {
    const lines = profileInWords(DEFAULT_PROFILE, "imperial")
    expect(lines[0]).toBe("Drive 35 mph or faster for at least 10 min (qualifying time).")
    expect(lines[1]).toBe("Follow a lead vehicle 100 to 165 ft ahead for at least 2 min of that (following time).")
    expect(lines[3]).toContain("works at 25 mph or faster")
  })

  it("reads in km/h and metres for a metric shop, accelerations in g with m/s² beside", () => {
    const lines = profileInWords(resolveProfile({ minSpeedMph: 35, maxSpeedMph: 65 }), "metric")
    expect(lines[0]).toBe("Drive between 56 and 105 km/h for at least 10 min (qualifying time).")
    // NIST SP 811: 100 ft = 30.48 m -> 30; 165 ft = 50.292 m -> 50
    expect(lines[1]).toBe("Follow a lead vehicle 30 to 50 m ahead for at least 2 min of that (following time).")
    // NIST SP 811: 25 mph × 1.609344 = 40.2336 km/h -> 40
    expect(lines[3]).toContain("works at 40 km/h or faster")
    // g = 9.80665 m/s²: 3.0 / 9.80665 = 0.3059 -> 0.31 g; 3.4 / 9.80665 = 0.3467 -> 0.35 g
    expect(lines[4]).toBe(
      "Smooth driving: speeding up harder than 0.31 g (3 m/s²) or braking harder than 0.35 g (3.4 m/s²) is noted for review.",
    )
    expect(lines.join(" ")).not.toMatch(/\b(mph|ft)\b/)
  })
})

describe("GPS accuracy and typed gaps", () => {
  it("says a rough position in the shop's unit", () => {
    // NIST SP 811: 31 m / 0.3048 = 101.71 ft -> 102; 30 m / 0.3048 = 98.43 ft -> 98
    expect(gpsMessage("poor", 31, 30, "imperial")).toBe(
      "Position is rough (±102 ft). Samples rougher than ±98 ft do not count.",
    )
    expect(gpsMessage("poor", 31, 30, "metric")).toBe(
      "Position is rough (±31 m). Samples rougher than ±30 m do not count.",
    )
  })

  it("keeps a typed gap as whole feet", () => {
    expect(typedGapFt(120, "imperial")).toBe(120)
    // NIST SP 811: 40 m / 0.3048 = 131.23 ft -> 131 (which reads back as 131 × 0.3048 = 39.93 -> 40 m)
    expect(typedGapFt(40, "metric")).toBe(131)
  })
})

describe("the road test's reasons on the finish screen and the record", () => {
  it("carries the scorer's speeds into the shop's unit", () => {
    // 8 m/s = 17.9 mph (NIST SP 811: 1 mph = 0.44704 m/s); "Lane keeping engages" counts at 40 mph
    const score = scoreDrive(roadTest([check(30, "acc-engages", "pass"), check(10, "lane-keeping-engages", "pass")]))
    expect(describeReasons(score, "imperial").reasons).toEqual([
      'Road test: "Lane keeping engages" passed only at 17.9 mph; it counts at 40 mph or faster.',
    ])
    // 17.9 × 1.609344 = 28.807 -> 28.8 km/h; 40 × 1.609344 = 64.37376 -> 64.4 km/h
    expect(describeReasons(score, "metric").reasons).toEqual([
      'Road test: "Lane keeping engages" passed only at 28.8 km/h; it counts at 64.4 km/h or faster.',
    ])
  })
})
