import { describe, expect, it } from "vitest"
import {
  compassWord,
  createLocalClock,
  hoursApart,
  jaccard,
  matchLoop,
  niceScale,
  rankLoops,
  rankLoopsOnBasis,
  shareClass,
  type LoopDrive,
} from "@/lib/roads"

describe("local clock", () => {
  it("reads the shop's hour and weekday across a daylight-saving change", () => {
    // IANA tz database: America/Chicago is UTC-6 (CST) in winter and UTC-5 (CDT) from 2026-03-08 02:00 local
    const clock = createLocalClock("America/Chicago")
    expect(clock(Date.UTC(2026, 0, 1, 16, 30))).toEqual({ hour: 10, weekday: 4 }) // Thursday 1 January 2026
    expect(clock(Date.UTC(2026, 2, 8, 7, 30))).toEqual({ hour: 1, weekday: 0 })
    expect(clock(Date.UTC(2026, 2, 8, 8, 30))).toEqual({ hour: 3, weekday: 0 })
    // IANA tz database: Asia/Kolkata is UTC+5:30, so a quarter-hour cache must still split at :30 UTC
    const india = createLocalClock("Asia/Kolkata")
    expect(india(Date.UTC(2026, 0, 1, 4, 29)).hour).toBe(9)
    expect(india(Date.UTC(2026, 0, 1, 4, 31)).hour).toBe(10)
  })

  it("counts hours apart around midnight", () => {
    expect(hoursApart(23, 0)).toBe(1)
    expect(hoursApart(8, 17)).toBe(9)
  })
})

const home = { lat: 43.8731, lon: -91.9187 }
function drive(loopId: string, hour: number, cleared: number | null, over: Partial<LoopDrive> = {}): LoopDrive {
  return {
    driveId: `${loopId}-${hour}-${cleared}-${Math.random()}`,
    loopId,
    profileId: null,
    hour,
    weekday: 3,
    startLat: home.lat,
    startLon: home.lon,
    drivenSeconds: 1000,
    qualifyingSeconds: 800,
    clearedSeconds: cleared,
    ...over,
  }
}

describe("ranking loops", () => {
  const drives = [
    ...[600, 620, 640, 610, 700].map((c) => drive("steady", 10, c)),
    ...[1300, 1250, 1400, 1200, 1350].map((c) => drive("arterial", 10, c, { qualifyingSeconds: 400 })),
    ...[1500, 1600, 1700, 1550, 1650].map((c) => drive("steady", 17, c)),
    ...[900, 950, 1000, 920, 980].map((c) => drive("arterial", 17, c)),
    drive("steady", 10, null),
    drive("far", 10, 300, { startLat: home.lat + 0.1 }),
  ]

  it("puts the loop with the fastest median time to learn complete first, for the hour asked", () => {
    const ten = rankLoops(drives, { hour: 10, dayKind: "weekday", home })
    expect(ten.map((l) => l.loopId)).toEqual(["steady", "arterial"])
    expect(ten[0]).toMatchObject({ drives: 5, trusted: true, medianClearSeconds: 620 })
    expect(rankLoops(drives, { hour: 17, dayKind: "weekday", home }).map((l) => l.loopId)).toEqual([
      "arterial",
      "steady",
    ])
  })

  it("leaves out drives that never completed, started far from the shop, or fall on another kind of day", () => {
    expect(rankLoops(drives, { hour: 10, dayKind: null, home }).some((l) => l.loopId === "far")).toBe(false)
    expect(rankLoops(drives, { hour: 10, dayKind: null, home: null }).some((l) => l.loopId === "far")).toBe(true)
    expect(rankLoops(drives, { hour: 10, dayKind: "weekend", home })).toEqual([])
  })

  it("ranks a loop resting on too few drives after the trusted ones", () => {
    const few = [...drives, drive("lucky", 10, 100), drive("lucky", 10, 110)]
    const ranked = rankLoops(few, { hour: 10, dayKind: "weekday", home })
    expect(ranked.at(-1)).toMatchObject({ loopId: "lucky", trusted: false, drives: 2 })
  })
})

describe("ranking loops by hour and weekday", () => {
  // Wednesdays (3) at 10:00 the parkway is jammed by a market; other weekdays it is the fastest.
  const week = [
    ...[1500, 1550, 1600, 1520, 1580].map((c) => drive("parkway", 10, c, { weekday: 3 })),
    ...[900, 950, 920, 980, 940].map((c) => drive("avenue", 10, c, { weekday: 3 })),
    ...[1, 2, 4, 5].flatMap((weekday) => [600, 620, 610].map((c) => drive("parkway", 10, c, { weekday }))),
    ...[1, 2, 4, 5].flatMap((weekday) => [1100, 1150].map((c) => drive("avenue", 10, c, { weekday }))),
    ...[800, 820].map((c) => drive("avenue", 10, c, { weekday: 6 })),
  ]
  const chain = (weekday: number) => [
    { weekday, dayKind: null },
    { weekday: null, dayKind: weekday === 0 || weekday === 6 ? ("weekend" as const) : ("weekday" as const) },
    { weekday: null, dayKind: null },
  ]

  it("ranks on the weekday when the history holds a trusted loop for it", () => {
    const wed = rankLoopsOnBasis(week, { hour: 10, home }, chain(3))
    expect(wed.basis).toEqual({ weekday: 3, dayKind: null })
    expect(wed.loops.map((l) => l.loopId)).toEqual(["avenue", "parkway"])
    expect(wed.loops[0]).toMatchObject({ drives: 5, medianClearSeconds: 940 })
    // hour only (any day), the parkway's many quick weekday drives win: the weekday changes the answer
    expect(rankLoops(week, { hour: 10, dayKind: null, home })[0]!.loopId).toBe("parkway")
  })

  it("falls back to the kind of day, then to the hour alone, when the weekday has too few drives", () => {
    // Mondays: 3 parkway drives, 2 avenue drives: no loop of 5, so all weekdays count
    const mon = rankLoopsOnBasis(week, { hour: 10, home }, chain(1))
    expect(mon.basis).toEqual({ weekday: null, dayKind: "weekday" })
    expect(mon.loops[0]).toMatchObject({ loopId: "parkway", drives: 17 })
    // Saturdays: 2 avenue drives, and no weekend loop of 5 either: every day at this hour, still marked by its count
    const sat = rankLoopsOnBasis(week, { hour: 10, home }, chain(6))
    expect(sat.basis).toEqual({ weekday: null, dayKind: null })
    expect(sat.loops.map((l) => l.loopId)).toEqual(["parkway", "avenue"])
    expect(sat.loops[1]!.drives).toBe(15)
  })
})

describe("helpers", () => {
  it("matches a route to the loop it overlaps at least half", () => {
    expect(jaccard(["a", "b", "c"], ["b", "c", "d"])).toBe(0.5)
    const loops = [
      { id: "1", cells: ["a", "b", "c", "d"] },
      { id: "2", cells: ["x", "y"] },
    ]
    expect(matchLoop(["a", "b", "c"], loops)?.id).toBe("1")
    expect(matchLoop(["a", "x", "q", "r"], loops)).toBeNull()
  })

  it("names the share classes and picks round scale bars", () => {
    expect([0.9, 0.6, 0.3, 0.1].map(shareClass)).toEqual(["most", "often", "some", "rare"])
    expect(niceScale(2500, "metric")).toEqual({ meters: 2000, label: "2 km" })
    expect(niceScale(1200, "imperial").label).toBe("0.5 mi")
    expect(compassWord(home, { lat: home.lat + 0.05, lon: home.lon + 0.07 })).toBe("north-east")
  })
})
