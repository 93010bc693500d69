import { describe, expect, it } from "vitest"
import type { Sample } from "@/lib/drive-file"
import { scoreDrive } from "@/lib/scoring"
import { mphToMps } from "@/lib/units"
import { ALWAYS_CONDITIONS, SCORE_FIELDS } from "../../helpers/score"
import { T0, drive, mark, samplesWithSpeeds, steady } from "../helpers/drive"

// Rule numbers refer to /work/shared/specs/drive-file.md "Scoring rules".
const FAST = 20 // m/s, above 35 mph = 15.6464 m/s
const SLOW = 10 // m/s, below it

const condition = (score: ReturnType<typeof scoreDrive>, key: string) => score.conditions.find((c) => c.key === key)!

describe("rule 1: which samples are used", () => {
  it("drops samples less accurate than maxAccuracyM and keeps one exactly at the limit", () => {
    const samples = steady(10, FAST)
    samples[3]!.accuracy = 30.0001
    samples[4]!.accuracy = 30
    samples[5]!.accuracy = null
    const s = scoreDrive(drive(samples))
    expect(s.samplesUsed).toBe(10)
    expect(s.samplesDropped).toBe(1)
    expect(s.samplesDroppedForAccuracy).toBe(1)
  })

  it("keeps the first of samples with the same time, in file order", () => {
    const base = samplesWithSpeeds([FAST, FAST])
    const slowTwin: Sample = { ...base[1]!, speed: 0 }
    // First kept: interval mean speed 20 m/s, qualifies for 1 s.
    expect(scoreDrive(drive([base[0]!, base[1]!, slowTwin])).qualifyingSeconds).toBe(1)
    // Slow twin first: mean 10 m/s, nothing qualifies.
    expect(scoreDrive(drive([base[0]!, slowTwin, base[1]!])).qualifyingSeconds).toBe(0)
    expect(scoreDrive(drive([base[0]!, slowTwin, base[1]!])).duplicateSamples).toBe(1)
  })

  it("lets an accurate sample stand in for a dropped one at the same time", () => {
    const base = samplesWithSpeeds([FAST, FAST])
    const blurred: Sample = { ...base[1]!, speed: 0, accuracy: 80 }
    const s = scoreDrive(drive([base[0]!, blurred, base[1]!]))
    expect(s.samplesUsed).toBe(2)
    expect(s.qualifyingSeconds).toBe(1)
  })

  it("sorts samples by time", () => {
    const samples = steady(20, FAST)
    const reversed = [...samples].reverse()
    expect(scoreDrive(drive(reversed))).toEqual(scoreDrive(drive(samples)))
  })

  it("sorts marks by time, keeping file order for equal times", () => {
    const samples = steady(30, FAST)
    const onThenOff = scoreDrive(drive(samples, [mark(0, "lead-on"), mark(0, "lead-off")]))
    const offThenOn = scoreDrive(drive(samples, [mark(0, "lead-off"), mark(0, "lead-on")]))
    expect(onThenOff.followingSeconds).toBe(0)
    expect(offThenOn.followingSeconds).toBe(30)
    const unsorted = scoreDrive(drive(samples, [mark(10, "lead-off"), mark(0, "lead-on")]))
    expect(unsorted.followingSeconds).toBe(10)
  })
})

describe("rule 2: intervals and data gaps", () => {
  it("counts a pause over maxGapSeconds toward duration and gaps only", () => {
    const samples = [...samplesWithSpeeds([FAST, FAST, FAST]), ...samplesWithSpeeds([FAST, FAST], { startS: 12 })]
    const s = scoreDrive(drive(samples, [mark(0, "lead-on")]))
    expect(s.durationSeconds).toBe(13)
    expect(s.gapSeconds).toBe(10)
    expect(s.qualifyingSeconds).toBe(3)
    expect(s.followingSeconds).toBe(3)
    expect(condition(s, "data-gaps").met).toBe(false)
  })

  it("treats a pause of exactly maxGapSeconds as an ordinary interval", () => {
    const samples = [...samplesWithSpeeds([FAST]), ...samplesWithSpeeds([FAST], { startS: 5 })]
    const s = scoreDrive(drive(samples))
    expect(s.gapSeconds).toBe(0)
    expect(s.qualifyingSeconds).toBe(5)
  })

  it("includes the distance across a gap", () => {
    // Karney geodesic (WGS-84): (45,0) -> (45.001,0) = 111.1318 m (check-values §3c)
    const samples: Sample[] = [
      { t: T0, lat: 45, lon: 0, speed: FAST },
      { t: T0 + 60_000, lat: 45.001, lon: 0, speed: FAST },
    ]
    const s = scoreDrive(drive(samples))
    expect(s.gapSeconds).toBe(60)
    expect(s.distanceMeters).toBeCloseTo(111.1318, 3)
  })
})

describe("rule 3: interval speed and qualifying", () => {
  it("uses the mean of the two device speeds", () => {
    // (14 + 18) / 2 = 16 >= 15.6464; (14 + 17) / 2 = 15.5 < 15.6464
    expect(scoreDrive(drive(samplesWithSpeeds([14, 18]))).qualifyingSeconds).toBe(1)
    expect(scoreDrive(drive(samplesWithSpeeds([14, 17]))).qualifyingSeconds).toBe(0)
  })

  // NIST SP 811 B.8: 35 mph = 15.6464 m/s exactly
  it("counts exactly 35 mph (15.6464 m/s, NIST SP 811) as qualifying and just under it not", () => {
    expect(scoreDrive(drive(samplesWithSpeeds([15.6464, 15.6464]))).qualifyingSeconds).toBe(1)
    expect(scoreDrive(drive(samplesWithSpeeds([15.6463, 15.6463]))).qualifyingSeconds).toBe(0)
  })

  it("derives speed from geodesic distance / dt when a sample has no speed", () => {
    // Karney geodesic (WGS-84): (45,0) -> (45.001,0) = 111.1318 m (check-values §3c)
    const pair = (dtS: number): Sample[] => [
      { t: T0, lat: 45, lon: 0, speed: 30 },
      { t: T0 + dtS * 1000, lat: 45.001, lon: 0 },
    ]
    const profile = { maxGapSeconds: 10 }
    // 111.1318 / 7 = 15.876 m/s qualifies; / 8 = 13.89 m/s does not (the device's 30 m/s is not used).
    expect(scoreDrive(drive(pair(7), [], profile)).qualifyingSeconds).toBe(7)
    expect(scoreDrive(drive(pair(8), [], profile)).qualifyingSeconds).toBe(0)
  })

  // NIST SP 811 B.8: 60 mph = 26.8224 m/s exactly
  it("stops counting above maxSpeedMph when set (60 mph = 26.8224 m/s, NIST SP 811)", () => {
    const profile = { maxSpeedMph: 60 }
    expect(scoreDrive(drive(samplesWithSpeeds([26.8224, 26.8224]), [], profile)).qualifyingSeconds).toBe(1)
    expect(scoreDrive(drive(samplesWithSpeeds([26.83, 26.83]), [], profile)).qualifyingSeconds).toBe(0)
    expect(scoreDrive(drive(samplesWithSpeeds([26.83, 26.83]))).qualifyingSeconds).toBe(1)
  })

  it("honours a custom minSpeedMph", () => {
    const v = mphToMps(45)
    expect(scoreDrive(drive(samplesWithSpeeds([FAST, FAST]), [], { minSpeedMph: 45 })).qualifyingSeconds).toBe(0)
    expect(scoreDrive(drive(samplesWithSpeeds([v, v]), [], { minSpeedMph: 45 })).qualifyingSeconds).toBe(1)
  })
})

describe("rule 4: lead state and following", () => {
  const s60 = () => steady(60, FAST)

  it("follows from lead-on to lead-off", () => {
    const s = scoreDrive(drive(s60(), [mark(10, "lead-on", { gapFt: 130 }), mark(25, "lead-off")]))
    expect(s.followingSeconds).toBe(15)
    expect(s.qualifyingSeconds).toBe(60)
  })

  it("counts an unknown gap as following", () => {
    expect(scoreDrive(drive(s60(), [mark(0, "lead-on")])).followingSeconds).toBe(60)
  })

  it("does not count a gap outside the window, and counts both window edges", () => {
    const at = (gapFt: number) => scoreDrive(drive(s60(), [mark(0, "lead-on", { gapFt })])).followingSeconds
    expect(at(99.9)).toBe(0)
    expect(at(100)).toBe(60)
    expect(at(165)).toBe(60)
    expect(at(165.1)).toBe(0)
  })

  it("takes the latest gap mark since the lead-on", () => {
    const marks = [mark(0, "lead-on", { gapFt: 130 }), mark(20, "gap", { gapFt: 300 }), mark(40, "gap", { gapFt: 120 })]
    expect(scoreDrive(drive(s60(), marks)).followingSeconds).toBe(40)
  })

  it("forgets the gap at lead-off: a new lead-on without gapFt is unknown again", () => {
    const marks = [mark(0, "lead-on", { gapFt: 400 }), mark(10, "lead-off"), mark(20, "lead-on")]
    expect(scoreDrive(drive(s60(), marks)).followingSeconds).toBe(40)
  })

  it("ignores gap marks while the lead is off", () => {
    const marks = [mark(5, "gap", { gapFt: 130 }), mark(10, "lead-on", { gapFt: 400 })]
    expect(scoreDrive(drive(s60(), marks)).followingSeconds).toBe(0)
  })

  it("looks at the lead state at the start of each interval", () => {
    // lead-on at 10.5 s: the interval 10..11 started with the lead off, so following starts at 11 s.
    expect(scoreDrive(drive(s60(), [mark(10.5, "lead-on")])).followingSeconds).toBe(49)
  })

  it("counts following only while qualifying", () => {
    const samples = samplesWithSpeeds([FAST, FAST, FAST, SLOW, SLOW, SLOW])
    const s = scoreDrive(drive(samples, [mark(0, "lead-on")]))
    expect(s.qualifyingSeconds).toBe(2)
    expect(s.followingSeconds).toBe(2)
  })
})

describe("rule 5: harsh events", () => {
  it("counts a maximal run of hard acceleration once", () => {
    // accelerations 4, 4, 4 m/s² (> 3.0) in a row: one event
    const s = scoreDrive(drive(samplesWithSpeeds([16, 16, 20, 24, 28, 28])))
    expect(s.harshEvents).toEqual({ accel: 1, decel: 0 })
  })

  it("counts separate runs of hard braking separately", () => {
    // -4 m/s², then 0, then -4: two braking events (< -3.4)
    const s = scoreDrive(drive(samplesWithSpeeds([28, 24, 24, 20, 20])))
    expect(s.harshEvents).toEqual({ accel: 0, decel: 2 })
  })

  it("does not count accelerations at exactly the limits", () => {
    expect(scoreDrive(drive(samplesWithSpeeds([20, 23, 26]))).harshEvents).toEqual({ accel: 0, decel: 0 })
    // 6.8 -> 3.4 -> 0 m/s is exactly -3.4 m/s² each second (exact in binary: 6.8 = 2 × 3.4)
    expect(scoreDrive(drive(samplesWithSpeeds([6.8, 3.4, 0]))).harshEvents).toEqual({ accel: 0, decel: 0 })
    expect(scoreDrive(drive(samplesWithSpeeds([6.8, 3.39, 0]))).harshEvents).toEqual({ accel: 0, decel: 1 })
  })

  it("breaks a run at a data gap, and ignores the change across the gap", () => {
    const broken = [...samplesWithSpeeds([20, 24]), ...samplesWithSpeeds([24, 28], { startS: 10 })]
    expect(scoreDrive(drive(broken)).harshEvents).toEqual({ accel: 2, decel: 0 })
    // 20 m/s -> 60 m/s across a 10 s gap would be 4 m/s², but a gap is no interval for events.
    const across = [...samplesWithSpeeds([20]), ...samplesWithSpeeds([60], { startS: 10 })]
    expect(scoreDrive(drive(across)).harshEvents).toEqual({ accel: 0, decel: 0 })
  })

  it("uses the profile's limits", () => {
    const samples = samplesWithSpeeds([20, 22.5, 25])
    expect(scoreDrive(drive(samples, [], { maxAccelMps2: 2 })).harshEvents.accel).toBe(1)
    expect(scoreDrive(drive(samples)).harshEvents.accel).toBe(0)
  })

  it("finds no events on steady driving without device speeds (derived and smoothed)", () => {
    const samples = steady(120, FAST).map(({ speed: _speed, ...rest }) => rest)
    const s = scoreDrive(drive(samples))
    expect(s.harshEvents).toEqual({ accel: 0, decel: 0 })
    expect(s.qualifyingSeconds).toBe(120)
  })
})

describe("rule 6 and 8: verification", () => {
  const profile = { minQualifyingMinutes: 0.5, minFollowingMinutes: 0.25 }
  const base = (speeds: number[]) => samplesWithSpeeds(speeds)
  const cleared = [mark(0, "lead-on"), mark(40, "cleared")]
  const run = (speeds: number[], extra: ReturnType<typeof mark>[]) =>
    scoreDrive(drive(base(speeds), [...cleared, ...extra], profile))
  const fast60 = Array.from({ length: 61 }, () => FAST)

  it("is met with a verified mark after the clear at speed", () => {
    const s = run(fast60, [mark(50, "verified")])
    expect(s.verdict).toBe("met")
    expect(s.reasons).toEqual([])
    expect(condition(s, "verified").value).toBeCloseTo(44.7, 1) // 20 m/s = 44.74 mph
  })

  it("does not count a verified mark below verifySpeedMph", () => {
    // 25 mph = 11.176 m/s (NIST SP 811); 11 m/s is below it
    const speeds = fast60.map((v, i) => (i >= 45 ? 11 : v))
    const s = run(speeds, [mark(50, "verified")])
    expect(s.verdict).toBe("unverified")
    expect(s.reasons[0]).toMatch(/25 mph/)
  })

  it("counts a verified mark at exactly verifySpeedMph (25 mph = 11.176 m/s, NIST SP 811)", () => {
    const speeds = fast60.map((v, i) => (i >= 45 ? 11.176 : v))
    expect(run(speeds, [mark(50, "verified")]).verdict).toBe("met")
  })

  it("does not count a verified mark before the clear", () => {
    expect(run(fast60, [mark(30, "verified")]).verdict).toBe("unverified")
  })

  it("is unverified when a verify-failed comes after the last good verified", () => {
    const s = run(fast60, [mark(45, "verified"), mark(50, "verify-failed")])
    expect(s.verdict).toBe("unverified")
    expect(s.reasons).toEqual(["A verify-failed mark came after the last good verified mark."])
  })

  it("is met when a good verified follows a verify-failed", () => {
    expect(run(fast60, [mark(45, "verify-failed"), mark(50, "verified")]).verdict).toBe("met")
  })

  it("treats a verified mark inside a data gap as unknown speed", () => {
    const samples = [...samplesWithSpeeds(fast60.slice(0, 46)), ...samplesWithSpeeds([FAST, FAST], { startS: 58 })]
    const s = scoreDrive(drive(samples, [...cleared, mark(50, "verified")], profile))
    expect(s.verdict).toBe("unverified")
    expect(s.reasons[0]).toMatch(/known speed/)
  })

  it("uses the non-gap interval that starts at the mark when the one ending there is a gap", () => {
    const samples = [...samplesWithSpeeds(fast60.slice(0, 46)), ...samplesWithSpeeds([FAST, FAST], { startS: 58 })]
    expect(scoreDrive(drive(samples, [...cleared, mark(58, "verified")], profile)).verdict).toBe("met")
  })
})

describe("rule 7: time before the clear", () => {
  const profile = { minQualifyingMinutes: 0.5, minFollowingMinutes: 0.25 }

  it("pro-rates the interval that straddles the clear", () => {
    const s = scoreDrive(drive(steady(60, FAST), [mark(0, "lead-on"), mark(30.25, "cleared")], profile))
    expect(s.qualifyingSecondsBeforeClear).toBe(30.25)
    expect(s.followingSecondsBeforeClear).toBe(30.25)
    expect(s.qualifyingSeconds).toBe(60)
    expect(s.clearedAtSeconds).toBe(30.25)
  })

  it("pro-rates over a long interval too", () => {
    // one 4 s interval 10..14 at speed, clear at 11 s: 1 of its 4 s counts
    const samples = [...samplesWithSpeeds([FAST]), ...samplesWithSpeeds([FAST, FAST], { startS: 10, stepS: 4 })]
    const s = scoreDrive(drive(samples, [mark(11, "cleared")]))
    expect(s.qualifyingSecondsBeforeClear).toBe(1)
  })

  it("uses the first cleared mark and measures it from the first kept sample", () => {
    const samples = steady(60, FAST)
    samples[0]!.accuracy = 99 // dropped: the drive starts at 1 s
    const s = scoreDrive(drive(samples, [mark(50, "cleared"), mark(20, "cleared")]))
    expect(s.clearedAtSeconds).toBe(19)
    expect(s.qualifyingSecondsBeforeClear).toBe(19)
  })
})

describe("rule 8: verdicts", () => {
  const profile = { minQualifyingMinutes: 0.5, minFollowingMinutes: 0.25, maxDriveMinutes: 1 }

  it("is not_met without a cleared mark, and says timed out at the time limit", () => {
    const s = scoreDrive(drive(steady(60, FAST), [mark(0, "lead-on")], profile))
    expect(s.verdict).toBe("not_met")
    expect(s.clearedAtSeconds).toBeNull()
    expect(s.reasons.join(" ")).toMatch(/never reported the learn complete/)
    expect(s.reasons.join(" ")).toMatch(/timed out/)
    expect(condition(s, "time-limit").met).toBe(false)
  })

  it("does not say timed out before the limit", () => {
    const s = scoreDrive(drive(steady(59, FAST), [mark(0, "lead-on")], profile))
    expect(s.verdict).toBe("not_met")
    expect(s.reasons.join(" ")).not.toMatch(/timed out/)
  })

  it("is short when qualifying time before the clear is too little, with minutes in the reason", () => {
    const s = scoreDrive(
      drive(steady(60, FAST), [mark(0, "lead-on"), mark(27, "cleared"), mark(40, "verified")], profile),
    )
    expect(s.verdict).toBe("short")
    expect(s.reasons).toEqual(["Qualifying time (35 mph or faster) before the clear was 0.4 min; 0.5 min needed."])
  })

  it("is short when following time before the clear is too little", () => {
    const marks = [mark(0, "lead-on"), mark(10, "lead-off"), mark(35, "cleared"), mark(40, "verified")]
    const s = scoreDrive(drive(steady(60, FAST), marks, profile))
    expect(s.verdict).toBe("short")
    expect(s.reasons[0]).toMatch(/^Following time .* before the clear was 0\.1 min; 0\.25 min needed\.$/)
  })

  it("is met at exactly the required times", () => {
    const marks = [mark(15, "lead-on"), mark(30, "cleared"), mark(40, "verified")]
    const s = scoreDrive(drive(steady(60, FAST), marks, profile))
    expect(s.qualifyingSecondsBeforeClear).toBe(30)
    expect(s.followingSecondsBeforeClear).toBe(15)
    expect(s.verdict).toBe("met")
  })

  it("puts short before unverified", () => {
    const s = scoreDrive(drive(steady(60, FAST), [mark(0, "lead-on"), mark(20, "cleared")], profile))
    expect(s.verdict).toBe("short")
  })

  it("reports every field of the Score", () => {
    const s = scoreDrive(
      drive(steady(60, FAST), [mark(0, "lead-on"), mark(40, "cleared"), mark(50, "verified")], profile),
    )
    for (const key of SCORE_FIELDS) {
      expect(s).toHaveProperty(key)
    }
    expect(s.conditions.map((c) => c.key)).toEqual(expect.arrayContaining([...ALWAYS_CONDITIONS]))
    expect(condition(s, "qualifying-time")).toMatchObject({ met: true, value: 40, required: 30, unit: "s" })
  })

  it("scores an empty drive without failing", () => {
    const s = scoreDrive(drive([], []))
    expect(s.verdict).toBe("not_met")
    expect(s.durationSeconds).toBe(0)
    expect(s.distanceMeters).toBe(0)
  })
})
