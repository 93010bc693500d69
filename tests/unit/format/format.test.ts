import { describe, expect, it } from "vitest"
import {
  describeTimeZone,
  formatAcceleration,
  formatClock,
  formatDate,
  formatDateTime,
  formatDay,
  formatDistance,
  formatDuration,
  formatHour,
  formatLength,
  formatLengthFt,
  formatSpeed,
  formatSpeedMph,
  formatTime,
  formatTimeWithSeconds,
  isoDay,
  isoLocalDateTime,
  isTimeZone,
  plural,
  wholeSeconds,
} from "@/lib/format"

describe("durations: one style, whole seconds rounded down", () => {
  it("writes minutes and seconds (hand-worked: 708 s = 11 × 60 + 48)", () => {
    expect(formatDuration(708)).toBe("11 min 48 s")
    expect(formatDuration(48)).toBe("48 s")
    expect(formatDuration(600)).toBe("10 min")
    expect(formatDuration(0)).toBe("0 s")
  })

  it("writes hours (hand-worked: 3725 s = 3600 + 2 × 60 + 5)", () => {
    expect(formatDuration(3725)).toBe("1 h 2 min 5 s")
    expect(formatDuration(7200)).toBe("2 h")
  })

  it("rounds down, so a shortfall of 599.9 s never reads as 10 min", () => {
    expect(formatDuration(599.9)).toBe("9 min 59 s")
    expect(formatDuration(707.6)).toBe("11 min 47 s")
    // float dust from sums of samples does not cost a second
    expect(formatDuration(707.9999999999)).toBe("11 min 48 s")
  })

  it("gives machine-readable columns whole seconds with the same rounding (down)", () => {
    expect(wholeSeconds(707.9999999)).toBe(708)
    expect(wholeSeconds(708.96)).toBe(708)
    expect(wholeSeconds(599.6)).toBe(599)
    expect(wholeSeconds(null)).toBeNull()
    expect(formatDuration(wholeSeconds(708.96))).toBe(formatDuration(708.96))
  })

  it("runs the recorder's clocks as minutes and seconds, rounded down the same way", () => {
    // hand-worked: 425 s = 7 × 60 + 5; 3725 s = 3600 + 2 × 60 + 5
    expect(formatClock(425)).toBe("7:05")
    expect(formatClock(599.9)).toBe("9:59")
    expect(formatClock(0)).toBe("0:00")
    expect(formatClock(3725)).toBe("1:02:05")
    expect(formatClock(707.9999999999)).toBe("11:48")
    expect(formatClock(null)).toBe("—")
  })

  it("says a missing duration with a dash", () => {
    expect(formatDuration(null)).toBe("—")
    expect(formatDuration(Number.NaN)).toBe("—")
  })
})

describe("dates: one style, in the shop's time zone", () => {
  // IANA tz database: America/Chicago is UTC-6 (CST) in December and UTC-5 (CDT) in July;
  // Europe/Berlin is UTC+1 in December. Hand-worked from those offsets.
  const noonish = "2026-12-02T15:42:19Z"

  it("writes a moment in the shop's zone, with the zone named when asked", () => {
    expect(formatDateTime(noonish, "America/Chicago")).toBe("Dec 2, 2026, 9:42 AM")
    expect(formatDateTime(noonish, "America/Chicago", { zoneName: true })).toBe("Dec 2, 2026, 9:42 AM CST")
    expect(formatDateTime("2026-07-04T17:00:00Z", "America/Chicago", { zoneName: true })).toBe(
      "Jul 4, 2026, 12:00 PM CDT",
    )
    expect(formatDateTime(noonish, "Europe/Berlin")).toBe("Dec 2, 2026, 4:42 PM")
    expect(formatDateTime(noonish, "UTC", { zoneName: true })).toBe("Dec 2, 2026, 3:42 PM UTC")
  })

  it("puts a moment on the shop's calendar day, not UTC's", () => {
    // 03:00 UTC on Dec 2 is 9 PM on Dec 1 in Chicago
    expect(formatDate("2026-12-02T03:00:00Z", "America/Chicago")).toBe("Dec 1, 2026")
    expect(isoDay("2026-12-02T03:00:00Z", "America/Chicago")).toBe("2026-12-01")
    expect(isoDay("2026-12-02T03:00:00Z", "UTC")).toBe("2026-12-02")
    expect(formatDay("2026-11-30T18:00:00Z", "America/Chicago")).toBe("Nov 30")
    expect(formatTime(noonish, "America/Chicago")).toBe("9:42 AM")
    expect(formatTimeWithSeconds(noonish, "America/Chicago")).toBe("9:42:19 AM")
    expect(formatTimeWithSeconds(noonish, "Europe/Berlin")).toBe("4:42:19 PM")
  })

  it("writes an hour of the shop's day in formatTime's style (12-hour clock, en-US)", () => {
    expect(formatHour(9)).toBe(formatTime("2026-12-02T15:00:00Z", "America/Chicago"))
    expect(formatHour(9)).toBe("9:00 AM")
    expect(formatHour(0)).toBe("12:00 AM")
    expect(formatHour(12)).toBe("12:00 PM")
    expect(formatHour(23)).toBe("11:00 PM")
    expect(formatHour(24)).toBe("12:00 AM")
  })

  it("writes a machine-readable moment in the shop's zone with its UTC offset (ISO 8601)", () => {
    expect(isoLocalDateTime(noonish, "America/Chicago")).toBe("2026-12-02T09:42:19-06:00")
    expect(isoLocalDateTime("2026-07-04T17:00:00Z", "America/Chicago")).toBe("2026-07-04T12:00:00-05:00")
    expect(isoLocalDateTime(noonish, "Europe/Berlin")).toBe("2026-12-02T16:42:19+01:00")
    expect(isoLocalDateTime(noonish, "UTC")).toBe("2026-12-02T15:42:19+00:00")
    // IANA tz database: Asia/Kolkata is UTC+5:30 all year. 03:00 UTC on Dec 2 is 9 PM on Dec 1 in Chicago.
    expect(isoLocalDateTime(noonish, "Asia/Kolkata")).toBe("2026-12-02T21:12:19+05:30")
    expect(isoLocalDateTime("2026-12-02T03:00:00.900Z", "America/Chicago")).toBe("2026-12-01T21:00:00-06:00")
    expect(isoLocalDateTime("not a date", "UTC")).toBe("")
  })

  it("names the zone for the PDF and refuses names that are not zones", () => {
    expect(describeTimeZone("America/Chicago", noonish)).toBe("America/Chicago (CST)")
    expect(describeTimeZone("UTC", noonish)).toBe("UTC")
    expect(isTimeZone("America/Chicago")).toBe(true)
    expect(isTimeZone("Mars/Olympus")).toBe(false)
    expect(isTimeZone("")).toBe(false)
    // an unknown zone falls back to the product default rather than throwing
    expect(formatDateTime(noonish, "Mars/Olympus")).toBe("Dec 2, 2026, 9:42 AM")
  })
})

describe("units: the shop's choice, NIST SP 811 exact factors", () => {
  it("writes speeds (NIST SP 811 B.8: 1 mph = 0.44704 m/s, so 15.6464 m/s = 35 mph; 1 km/h = 1/3.6 m/s, so 56.327 km/h)", () => {
    expect(formatSpeed(15.6464, "imperial")).toBe("35 mph")
    expect(formatSpeed(15.6464, "metric")).toBe("56 km/h")
    expect(formatSpeed(15.6464, "metric", 1)).toBe("56.3 km/h")
    expect(formatSpeedMph(35, "imperial")).toBe("35 mph")
    expect(formatSpeedMph(35, "metric")).toBe("56 km/h")
    expect(formatSpeedMph(25, "metric")).toBe("40 km/h") // 25 × 0.44704 × 3.6 = 40.2336
  })

  it("writes road distances (NIST SP 811 B.8: 1 mi = 1609.344 m; 23184 m = 14.406 mi = 23.184 km)", () => {
    expect(formatDistance(23184, "imperial")).toBe("14.4 mi")
    expect(formatDistance(23184, "metric")).toBe("23.2 km")
    expect(formatDistance(1609.344, "imperial")).toBe("1.0 mi")
  })

  it("writes short lengths (NIST SP 811 B.8: 1 ft = 0.3048 m; 30 m = 98.43 ft, 100 ft = 30.48 m, 165 ft = 50.292 m)", () => {
    expect(formatLength(30, "imperial")).toBe("98 ft")
    expect(formatLength(30, "metric")).toBe("30 m")
    expect(formatLengthFt(100, "metric")).toBe("30 m")
    expect(formatLengthFt(165, "metric")).toBe("50 m")
    expect(formatLengthFt(165, "imperial")).toBe("165 ft")
  })

  it("writes accelerations in g with m/s² beside (NIST SP 811 B.8: standard gravity g_n = 9.80665 m/s²)", () => {
    expect(formatAcceleration(9.80665)).toBe("1.00 g (9.8 m/s²)")
    expect(formatAcceleration(3.4)).toBe("0.35 g (3.4 m/s²)") // 3.4 / 9.80665 = 0.3467
    expect(formatAcceleration(3.0)).toBe("0.31 g (3 m/s²)") // 3.0 / 9.80665 = 0.3059
  })
})

describe("plurals", () => {
  it("says 1 event and 2 events", () => {
    expect(plural(1, "event")).toBe("1 event")
    expect(plural(2, "event")).toBe("2 events")
    expect(plural(0, "event")).toBe("0 events")
  })
})

describe("conditions as people read them", async () => {
  const { describeConditions, describeReasons } = await import("@/lib/format/conditions")
  const { scoreDrive } = await import("@/lib/scoring")
  const { generateDrive } = await import("@/lib/tracks")

  it("calls advisory conditions advisory and counts events in the singular when there is one", () => {
    const score = scoreDrive(generateDrive({ seed: 12, pattern: "short", minutes: 9 }))
    const harsh = score.conditions.find((c) => c.key === "harsh-events")!
    const lines = describeConditions(
      {
        ...score,
        conditions: score.conditions.map((c) => (c.key === "harsh-events" ? { ...harsh, value: 1, met: false } : c)),
      },
      "imperial",
    )
    const line = lines.find((l) => l.key === "harsh-events")!
    expect(line.value).toBe("1 event")
    expect(line.requirement).toBe("advisory")
    expect(line.state).toBe("advisory")
    expect(lines.map((l) => l.requirement).join(" ")).not.toContain("none allowed")
  })

  it("writes a short drive's reason in the shop's units and the one duration style", () => {
    const score = scoreDrive(generateDrive({ seed: 12, pattern: "short", minutes: 9 }))
    expect(score.verdict).toBe("short")
    const metric = describeReasons(score, "metric").reasons.join(" ")
    expect(metric).toContain("56 km/h or faster") // NIST SP 811: 35 mph = 56.3 km/h
    expect(metric).toContain("10 min needed")
    expect(metric).not.toMatch(/\d\.\d min/)
    const imperial = describeConditions(score, "imperial").find((l) => l.key === "qualifying-time")!
    expect(imperial.label).toBe("Qualifying time (35 mph or faster)")
    expect(imperial.value).toBe(formatDuration(score.qualifyingSecondsBeforeClear))
    expect(imperial.requirement).toBe("10 min needed")
  })
})
