import { describe, expect, it } from "vitest"
import { createLiveScorer, predictMinutesLeft, scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { drive, mark, steady } from "../helpers/drive"

describe("createLiveScorer", () => {
  it("equals the batch score when a 10 Hz drive arrives one second at a time", () => {
    const file = generateDrive({ seed: 11, hz: 10, minutes: 17, pattern: "harsh", speedMissingShare: 0.3, dataGaps: 2 })
    const live = createLiveScorer(file.profile)
    let m = 0
    for (let i = 0; i < file.samples.length; i += 10) {
      const batch = file.samples.slice(i, i + 10)
      live.addSamples(batch)
      const until = batch.at(-1)!.t
      const marks = []
      while (m < file.marks.length && file.marks[m]!.t <= until) marks.push(file.marks[m++]!)
      live.addMarks(marks)
      if (i % 600 === 0) live.score()
    }
    live.addMarks(file.marks.slice(m))
    const batch = scoreDrive(file)
    expect(live.score()).toEqual(batch)
    expect(batch.harshEvents.decel).toBeGreaterThan(0)
  })

  it("starts over when a lead mark arrives for a time already summed, even at a sample's exact time", () => {
    const samples = steady(60, 20)
    const live = createLiveScorer()
    live.addSamples(samples)
    expect(live.score().followingSeconds).toBe(0)
    live.addMarks([mark(59, "lead-on")]) // at the start of the last summed interval
    expect(live.score().followingSeconds).toBe(1)
    live.addMarks([mark(10, "lead-on")])
    expect(live.score()).toEqual(scoreDrive(drive(samples, [mark(59, "lead-on"), mark(10, "lead-on")])))
    expect(live.score().followingSeconds).toBe(50)
  })

  it("re-pro-rates when a late cleared mark lands inside time already summed", () => {
    const samples = steady(60, 20)
    const live = createLiveScorer()
    live.addSamples(samples)
    live.score()
    live.addMarks([mark(30.5, "cleared")])
    expect(live.score().qualifyingSecondsBeforeClear).toBe(30.5)
  })

  it("takes out-of-order and repeated samples like the batch does (first arrival wins)", () => {
    const samples = steady(30, 20)
    const slowTwin = { ...samples[10]!, speed: 0 }
    const live = createLiveScorer()
    live.addSamples(samples.slice(15))
    live.score()
    live.addSamples([samples[3]!, slowTwin, ...samples.slice(0, 15)])
    const arrived = [...samples.slice(15), samples[3]!, slowTwin, ...samples.slice(0, 15)]
    expect(live.score()).toEqual(scoreDrive(drive(arrived)))
    // the slow twin arrived before the original sample 10, so it is the one kept
    expect(live.score().qualifyingSeconds).toBe(28)
    expect(live.score().duplicateSamples).toBe(2)
  })
})

describe("predictMinutesLeft", () => {
  const profile = { minQualifyingMinutes: 10, minFollowingMinutes: 2 }

  it("extrapolates the rate so far", () => {
    // 5 min qualifying in 10 min elapsed: rate 0.5, 5 min more needed -> 10 min
    // 1 min following in 10 min: rate 0.1, 1 min more needed -> 10 min
    const score = { qualifyingSecondsBeforeClear: 300, followingSecondsBeforeClear: 60, durationSeconds: 600 }
    expect(predictMinutesLeft(score, profile)).toEqual({
      qualifyingMinutesLeft: 10,
      followingMinutesLeft: 10,
      minutesLeft: 10,
    })
    expect(predictMinutesLeft(score, profile, { elapsedSeconds: 1200 }).qualifyingMinutesLeft).toBe(20)
  })

  it("says 0 once met and null when nothing has counted yet", () => {
    const score = { qualifyingSecondsBeforeClear: 600, followingSecondsBeforeClear: 0, durationSeconds: 700 }
    expect(predictMinutesLeft(score, profile)).toEqual({
      qualifyingMinutesLeft: 0,
      followingMinutesLeft: null,
      minutesLeft: null,
    })
  })

  it("works from a live score", () => {
    const live = createLiveScorer(profile)
    live.addSamples(steady(120, 20))
    live.addMarks([mark(0, "lead-on")])
    const left = predictMinutesLeft(live.score(), live.profile)
    expect(left.qualifyingMinutesLeft).toBeCloseTo(8, 9)
    expect(left.followingMinutesLeft).toBe(0)
    expect(left.minutesLeft).toBeCloseTo(8, 9)
  })
})
