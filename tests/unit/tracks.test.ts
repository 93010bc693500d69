import { describe, expect, it } from "vitest"
import { parseDriveFile } from "@/lib/drive-file"
import { geodesicDistanceM, scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"

describe("generateDrive", () => {
  it("is deterministic for a seed and differs between seeds", () => {
    const a = generateDrive({ seed: 42, minutes: 16 })
    expect(generateDrive({ seed: 42, minutes: 16 })).toEqual(a)
    expect(generateDrive({ seed: 43, minutes: 16 }).samples[100]).not.toEqual(a.samples[100])
  })

  it("makes valid drive files", () => {
    const file = generateDrive({ seed: 7, minutes: 16, hz: 2, speedMissingShare: 0.2, dataGaps: 1 })
    const r = parseDriveFile(JSON.parse(JSON.stringify(file)))
    expect(r.ok ? "ok" : `${r.path}: ${r.message}`).toBe("ok")
  })

  it("makes 36,000 samples for an hour at 10 Hz", () => {
    expect(generateDrive({ seed: 1, hz: 10, minutes: 60 }).samples).toHaveLength(36_000)
  })

  it.each([
    ["met", "met"],
    ["harsh", "met"],
    ["short", "short"],
    ["never-cleared", "not_met"],
    ["unverified", "unverified"],
  ] as const)("pattern %s scores %s", (pattern, verdict) => {
    const s = scoreDrive(generateDrive({ seed: 9, minutes: 20, pattern }))
    expect(s.verdict).toBe(verdict)
    if (pattern === "harsh") expect(s.harshEvents).toEqual({ accel: 1, decel: 2 })
    else expect(s.harshEvents).toEqual({ accel: 0, decel: 0 })
  })

  it("times out a never-cleared drive longer than the limit", () => {
    const s = scoreDrive(generateDrive({ seed: 9, minutes: 31, pattern: "never-cleared" }))
    expect(s.reasons.join(" ")).toMatch(/timed out/)
  })

  it("moves consistently with its speeds along a mostly straight road", () => {
    const file = generateDrive({ seed: 12, minutes: 20, hz: 1 })
    const kept = file.samples
    let speedTimesDt = 0
    for (let i = 1; i < kept.length; i++) {
      speedTimesDt += ((kept[i - 1]!.speed! + kept[i]!.speed!) / 2) * ((kept[i]!.t - kept[i - 1]!.t) / 1000)
    }
    const s = scoreDrive(file)
    expect(Math.abs(s.distanceMeters - speedTimesDt) / speedTimesDt).toBeLessThan(0.01)
    // straight-line distance start to end is most of the driven distance (gentle bends only)
    const a = kept[0]!
    const b = kept.at(-1)!
    expect(geodesicDistanceM(a.lat, a.lon, b.lat, b.lon) / s.distanceMeters).toBeGreaterThan(0.6)
  })

  it("refuses a drive too short for its pattern", () => {
    expect(() => generateDrive({ seed: 1, minutes: 5, pattern: "met" })).toThrow(/at least 16 minutes/)
  })
})
