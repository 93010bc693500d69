import { describe, expect, it } from "vitest"
import {
  everyWeek,
  isoWeekStart,
  numbersToCsv,
  percentile,
  perTechnician,
  timeToClearByProfile,
  topReasons,
  verdictMixByWeek,
  type NumbersDrive,
} from "@/lib/numbers"

let n = 0
function drive(over: Partial<NumbersDrive>): NumbersDrive {
  n += 1
  return {
    driveId: `00000000-0000-4000-8000-${String(n).padStart(12, "0")}`,
    finishedAt: "2026-03-04T12:00:00.000Z",
    verdict: "met",
    profileName: "Forward radar",
    technicianId: "t1",
    technicianName: "Ada Fenwick",
    clearedAtSeconds: 600,
    durationSeconds: 1200,
    qualifyingSecondsBeforeClear: 660,
    followingSecondsBeforeClear: 180,
    harshEvents: 0,
    unmetConditions: [],
    reviewStatus: null,
    ...over,
  }
}

describe("percentile", () => {
  it("interpolates between closest ranks (C = 1): 40th of {15,20,35,40,50} is 29", () => {
    // Wikipedia, "Percentile", worked example of the second variant (C = 1); also NumPy's default.
    expect(percentile([15, 20, 35, 40, 50], 40)).toBeCloseTo(29, 10)
    expect(percentile([50, 40, 35, 20, 15], 75)).toBe(40)
    expect(percentile([1, 2, 3, 4], 50)).toBe(2.5)
    expect(percentile([], 50)).toBeNull()
  })
})

describe("isoWeekStart", () => {
  it("puts a Sunday in the week that began the Monday before (ISO 8601 weeks start on Monday)", () => {
    expect(isoWeekStart("2026-03-08T23:00:00Z", "UTC")).toBe("2026-03-02") // Sunday
    expect(isoWeekStart("2026-03-09T00:00:00Z", "UTC")).toBe("2026-03-09") // Monday
    // ISO 8601: 2021-01-03 (a Sunday) belongs to week 53 of 2020, which began on Monday 2020-12-28.
    expect(isoWeekStart("2021-01-03T10:00:00Z", "UTC")).toBe("2020-12-28")
  })

  it("reads the week on the shop's calendar, not UTC's", () => {
    // IANA tz database: America/Chicago is UTC-6 in November-March (CST). Monday 2026-11-30 05:30 UTC is
    // Sunday 11:30 PM on Nov 29 in Chicago: the week that began Monday Nov 23 there.
    expect(isoWeekStart("2026-11-30T05:30:00Z", "America/Chicago")).toBe("2026-11-23")
    expect(isoWeekStart("2026-11-30T05:30:00Z", "UTC")).toBe("2026-11-30")
    expect(isoWeekStart("2026-11-30T06:30:00Z", "America/Chicago")).toBe("2026-11-30")
    // Asia/Tokyo is UTC+9: Sunday 2026-11-29 15:30 UTC is already Monday 00:30 in Tokyo.
    expect(isoWeekStart("2026-11-29T15:30:00Z", "Asia/Tokyo")).toBe("2026-11-30")
    expect(isoWeekStart("2026-11-29T15:30:00Z", "UTC")).toBe("2026-11-23")
  })
})

describe("time to clear by profile", () => {
  it("bins cleared drives by minutes and leaves never-cleared drives out of the distribution", () => {
    const list = [
      drive({ clearedAtSeconds: 4 * 60 }),
      drive({ clearedAtSeconds: 9 * 60 }),
      drive({ clearedAtSeconds: 10 * 60 }),
      drive({ clearedAtSeconds: 14.5 * 60 }),
      drive({ clearedAtSeconds: 40 * 60 }),
      drive({ clearedAtSeconds: null, verdict: "not_met" }),
      drive({ profileName: "Rear radar", clearedAtSeconds: 7 * 60 }),
    ]
    const [forward, rear] = timeToClearByProfile(list)
    expect(forward!.profileName).toBe("Forward radar")
    expect(forward!.drives).toBe(6)
    expect(forward!.cleared).toBe(5)
    expect(forward!.bins).toEqual([1, 1, 2, 0, 0, 0, 1])
    expect(forward!.medianSeconds).toBe(600)
    // 14.5 min is in the 10-15 band; 40 min in the last (30+)
    expect(rear!.bins).toEqual([0, 1, 0, 0, 0, 0, 0])
  })
})

describe("verdict mix over time", () => {
  it("counts verdicts per ISO week, oldest week first", () => {
    const mix = verdictMixByWeek(
      [
        drive({ finishedAt: "2026-03-10T09:00:00Z", verdict: "short" }),
        drive({ finishedAt: "2026-03-03T09:00:00Z", verdict: "met" }),
        drive({ finishedAt: "2026-03-04T09:00:00Z", verdict: "not_met" }),
        drive({ finishedAt: "2026-03-11T09:00:00Z", verdict: "short" }),
      ],
      "UTC",
    )
    expect(mix).toEqual([
      { weekStart: "2026-03-02", total: 2, met: 1, short: 0, not_met: 1, unverified: 0 },
      { weekStart: "2026-03-09", total: 2, met: 0, short: 2, not_met: 0, unverified: 0 },
    ])
  })
})

describe("top reasons", () => {
  it("counts each unmet condition once per drive, most common first", () => {
    const reasons = topReasons([
      drive({ unmetConditions: ["qualifying-time", "following-time"] }),
      drive({ unmetConditions: ["following-time", "following-time"] }),
      drive({ unmetConditions: ["harsh-events"] }),
      drive({}),
    ])
    expect(reasons.map((r) => [r.key, r.drives])).toEqual([
      ["following-time", 2],
      ["harsh-events", 1],
      ["qualifying-time", 1],
    ])
    expect(reasons[0]!.share).toBe(0.5)
    expect(reasons[0]!.label).toBe("Too little following time")
  })
})

describe("per technician", () => {
  it("gives drives, met share, median seconds to learn complete, harsh events and drives sent back", () => {
    const rows = perTechnician([
      drive({ technicianId: "a", technicianName: "Ada", clearedAtSeconds: 600 }),
      drive({
        technicianId: "a",
        technicianName: "Ada",
        verdict: "short",
        clearedAtSeconds: 300,
        reviewStatus: "redo",
        harshEvents: 2,
      }),
      drive({ technicianId: "a", technicianName: "Ada", verdict: "not_met", clearedAtSeconds: null }),
      drive({ technicianId: "b", technicianName: "Bo", clearedAtSeconds: 720 }),
    ])
    expect(rows[0]).toEqual({
      technicianId: "a",
      name: "Ada",
      drives: 3,
      met: 1,
      metShare: 1 / 3,
      medianSecondsToClear: 450,
      harshEvents: 2,
      sentBack: 1,
    })
    expect(rows[1]!.name).toBe("Bo")
  })
})

describe("numbers CSV", () => {
  it("writes one RFC 4180 line per drive and defuses formula-like names", () => {
    const csv = numbersToCsv(
      [drive({ technicianName: '=HYPERLINK("x")', clearedAtSeconds: 630.96, durationSeconds: 1199.9999999 })],
      "America/Chicago",
    )
    const lines = csv.split("\r\n")
    expect(lines[0]).toBe(
      "drive_id,finished_at,technician,profile,verdict,time_to_learn_complete_seconds,qualifying_time_before_learn_complete_seconds,following_time_before_learn_complete_seconds,drive_time_seconds,harsh_events,review,unmet_conditions",
    )
    expect(lines[1]).toContain(`"'=HYPERLINK(""x"")"`)
    // Whole seconds, rounded down as formatDuration rounds ("10 min 30 s" on the page is 630 here).
    expect(lines[1]).toContain(",met,630,660,180,1200,0,,")
    // IANA tz database: Chicago is UTC-6 in March before daylight saving starts (2026-03-08).
    expect(lines[1]).toContain(",2026-03-04T06:00:00-06:00,")
    expect(lines).toHaveLength(3)
  })
})

describe("every week on the chart", () => {
  it("puts a row of zeros in each week without drives, over New Year, keeping the weeks with drives as they are", () => {
    const mix = verdictMixByWeek(
      [
        drive({ finishedAt: "2025-12-16T15:00:00Z", verdict: "met" }),
        drive({ finishedAt: "2026-01-07T15:00:00Z", verdict: "not_met" }),
      ],
      "America/Chicago",
    )
    const weeks = everyWeek(mix)
    // Calendar, hand-counted: Mondays Dec 15, 22, 29 (2025), Jan 5 (2026).
    expect(weeks.map((w) => w.weekStart)).toEqual(["2025-12-15", "2025-12-22", "2025-12-29", "2026-01-05"])
    expect(weeks[0]).toBe(mix[0])
    expect(weeks[3]).toBe(mix[1])
    expect(weeks[1]).toEqual({ weekStart: "2025-12-22", total: 0, met: 0, short: 0, not_met: 0, unverified: 0 })
    expect(weeks.reduce((sum, w) => sum + w.total, 0)).toBe(2)
  })

  it("steps whole weeks across a daylight-saving change, and has nothing to show for no drives", () => {
    // 2026-03-08 is the US change to daylight saving (IANA tz database): Mondays Mar 2, 9, 16.
    const weeks = everyWeek([
      { weekStart: "2026-03-02", total: 1, met: 1, short: 0, not_met: 0, unverified: 0 },
      { weekStart: "2026-03-16", total: 1, met: 0, short: 1, not_met: 0, unverified: 0 },
    ])
    expect(weeks.map((w) => w.weekStart)).toEqual(["2026-03-02", "2026-03-09", "2026-03-16"])
    expect(everyWeek([])).toEqual([])
  })
})
