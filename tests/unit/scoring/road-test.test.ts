import { readFileSync } from "node:fs"
import path from "node:path"
import { describe, expect, it } from "vitest"
import {
  DEFAULT_ROAD_TEST_CHECKS,
  ROAD_TEST_SYSTEMS,
  mergeRoadTestChecks,
  parseAnyDriveFile,
  parseDriveFile,
  type DriveFile2,
} from "@/lib/drive-file"
import { scoreDrive, worseVerdict } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { T0 } from "../helpers/drive"
import { CHECKS, check, metRoadTest, roadTest } from "../helpers/road-test"

const fixture = (name: string) =>
  JSON.parse(readFileSync(path.join(__dirname, "../../fixtures/drive-files", name), "utf8"))
const outcome = (file: DriveFile2, key: string) => scoreDrive(file).roadTest!.checks.find((c) => c.key === key)!

// NIST SP 811: 1 mph = 0.44704 m/s exactly, so 20 m/s = 44.7 mph and 8 m/s = 17.9 mph.
describe("road-test verdict (lib/drive-file/FORMAT-2.md)", () => {
  it("is met when every required check passed at or above its speed", () => {
    const score = scoreDrive(metRoadTest())
    expect(score.verdict).toBe("met")
    expect(score.reasons).toEqual([])
    expect(score.kind).toBe("road_test")
    expect(score.roadTest!.checks.map((c) => [c.key, c.status, c.speedMph])).toEqual([
      ["acc-engages", "passed", 44.7],
      ["lane-keeping-engages", "passed", 44.7],
      ["sign-display", "not_equipped", 44.7],
    ])
    expect(score.conditions.find((c) => c.key === "road-test")).toMatchObject({
      met: true,
      value: 2,
      required: 2,
      unit: "checks",
    })
    // the learn's conditions say nothing about a road test
    expect(score.conditions.map((c) => c.key)).not.toContain("cleared")
  })

  it("does not count a pass below the check's speed", () => {
    const file = roadTest([check(30, "acc-engages", "pass"), check(10, "lane-keeping-engages", "pass")])
    const score = scoreDrive(file)
    expect(score.verdict).toBe("unverified")
    expect(outcome(file, "lane-keeping-engages")).toMatchObject({ status: "below_speed", speedMph: 17.9, blocks: true })
    expect(score.reasons).toEqual([
      'Road test: "Lane keeping engages" passed only at 17.9 mph; it counts at 40 mph or faster.',
    ])
    // the same check passed again at speed counts
    const again = roadTest([...file.marks, check(55, "lane-keeping-engages", "pass")])
    expect(scoreDrive(again).verdict).toBe("met")
  })

  it("gives not_met and a reason naming the check when a required check fails", () => {
    const file = metRoadTest()
    file.marks.push(check(70, "acc-engages", "fail"))
    const score = scoreDrive(file)
    expect(score.verdict).toBe("not_met")
    expect(score.reasons).toEqual(['Road test: "Adaptive cruise engages" failed (at 44.7 mph).'])
    expect(score.conditions.find((c) => c.key === "road-test")).toMatchObject({ met: false, value: 1, required: 2 })
  })

  it("a where-equipped check marked not equipped does not count against it; a required one does", () => {
    expect(scoreDrive(metRoadTest()).verdict).toBe("met")
    const requiredMissing = roadTest([
      check(30, "acc-engages", "pass"),
      check(50, "lane-keeping-engages", "not_equipped"),
    ])
    const score = scoreDrive(requiredMissing)
    expect(score.verdict).toBe("unverified")
    expect(score.reasons).toEqual(['Road test: "Lane keeping engages" is required but was marked not equipped.'])
  })

  it("a where-equipped check nobody logged is a note, not a reason; a required one not logged is unverified", () => {
    const noSign = roadTest([check(30, "acc-engages", "pass"), check(50, "lane-keeping-engages", "pass")])
    const score = scoreDrive(noSign)
    expect(score.verdict).toBe("met")
    expect(score.notes).toContain('Road test: "Sign display" (where equipped) was not logged.')
    const none = scoreDrive(roadTest([]))
    expect(none.verdict).toBe("unverified")
    expect(none.reasons).toHaveLength(2)
    expect(none.reasons[0]).toBe('Road test: "Adaptive cruise engages" was not logged as passed at 25 mph or faster.')
  })

  it("a where-equipped function that is fitted and fails is a failure", () => {
    const file = metRoadTest()
    file.marks.push(check(80, "sign-display", "fail"))
    expect(scoreDrive(file).verdict).toBe("not_met")
  })

  it("takes the speed at the mark from the track (rule 6); a pass where no position data shows the speed does not count", () => {
    const file = roadTest([
      check(30, "acc-engages", "pass"),
      check(50, "lane-keeping-engages", "pass"),
      check(500, "acc-engages", "fail"),
    ])
    // the fail after the track ends still counts: a failure needs no speed
    expect(scoreDrive(file).verdict).toBe("not_met")
    const late = roadTest([check(30, "acc-engages", "pass"), check(500, "lane-keeping-engages", "pass")])
    expect(outcome(late, "lane-keeping-engages")).toMatchObject({ status: "below_speed", speedMph: null })
  })

  it("the latest counted result decides, in time order whatever the order in the file", () => {
    // the fail at 40 s is followed by a pass at 90 s
    const inTimeOrder = [
      check(40, "acc-engages", "fail"),
      check(50, "lane-keeping-engages", "pass"),
      check(90, "acc-engages", "pass"),
    ]
    for (const marks of [inTimeOrder, [...inTimeOrder].reverse()])
      expect(scoreDrive(roadTest(marks)).verdict).toBe("met")
  })

  it("a drive that is learn and road test gets the worse verdict of the two, with both sets of reasons", () => {
    const learn = generateDrive({ seed: 7, minutes: 16, pattern: "met" })
    expect(scoreDrive(learn).verdict).toBe("met")
    const mid = learn.samples[Math.floor(learn.samples.length / 2)]!.t
    const checks = [CHECKS[0]!]
    const both = (result: "pass" | "fail"): DriveFile2 => ({
      ...learn,
      format: "straightaway.drive/2",
      kind: "learn_and_road_test",
      roadTest: { checks },
      marks: [...learn.marks, { t: mid, kind: "check", checkKey: "acc-engages", result }],
    })
    expect(scoreDrive(both("pass")).verdict).toBe("met")
    const failed = scoreDrive(both("fail"))
    expect(failed.verdict).toBe("not_met")
    expect(failed.conditions.map((c) => c.key)).toEqual(
      expect.arrayContaining(["cleared", "qualifying-time", "road-test"]),
    )
    const short = generateDrive({ seed: 7, minutes: 16, pattern: "short" })
    const shortBoth: DriveFile2 = {
      ...short,
      format: "straightaway.drive/2",
      kind: "learn_and_road_test",
      roadTest: { checks },
      marks: [...short.marks, { t: short.samples[600]!.t, kind: "check", checkKey: "acc-engages", result: "pass" }],
    }
    const s = scoreDrive(shortBoth)
    expect(s.verdict).toBe(scoreDrive(short).verdict)
    expect(s.reasons).toEqual(scoreDrive(short).reasons)
  })

  it("orders verdicts not_met, short, unverified, met", () => {
    expect(worseVerdict("met", "unverified")).toBe("unverified")
    expect(worseVerdict("short", "unverified")).toBe("short")
    expect(worseVerdict("unverified", "not_met")).toBe("not_met")
    expect(worseVerdict("met", "met")).toBe("met")
  })

  it("scores the fixture files as their names say", () => {
    const met = parseAnyDriveFile(fixture("valid-2-road-test-met.json"))
    const failed = parseAnyDriveFile(fixture("valid-2-road-test-failed-check.json"))
    if (!met.ok || !failed.ok) throw new Error("fixtures must parse")
    expect(scoreDrive(met.file).verdict).toBe("met")
    const f = scoreDrive(failed.file)
    expect(f.verdict).toBe("not_met")
    expect(f.reasons[0]).toMatch(/Lane keeping or centring engages on marked lanes" failed \(at 44\.7 mph\)/)
  })
})

describe("version 1 beside version 2", () => {
  it("scores a version 1 file exactly as before, whichever parser read it", () => {
    const file = generateDrive({ seed: 11, minutes: 16, pattern: "unverified" })
    const a = parseDriveFile(JSON.parse(JSON.stringify(file)))
    const b = parseAnyDriveFile(JSON.parse(JSON.stringify(file)))
    if (!a.ok || !b.ok) throw new Error("must parse")
    expect(scoreDrive(b.file)).toEqual(scoreDrive(a.file))
    expect(scoreDrive(a.file)).not.toHaveProperty("roadTest")
    expect(scoreDrive(a.file)).not.toHaveProperty("kind")
  })

  it("a version 2 learn drive scores as version 1 does", () => {
    const file = generateDrive({ seed: 12, minutes: 16, pattern: "met" })
    const v2 = scoreDrive({ ...file, format: "straightaway.drive/2", kind: "learn" })
    const { kind, ...rest } = v2
    expect(kind).toBe("learn")
    expect(rest).toEqual(scoreDrive(file))
  })

  it("refuses a check mark in a version 1 file and names both versions for an unknown format", () => {
    const file = {
      format: "straightaway.drive/1",
      samples: [],
      marks: [{ t: T0, kind: "check", checkKey: "acc-engages", result: "pass" }],
    }
    const r = parseAnyDriveFile(file)
    expect(r.ok).toBe(false)
    expect(r.ok ? "" : r.path).toBe("marks[0].kind")
    const u = parseAnyDriveFile({ format: "straightaway.drive/3", samples: [], marks: [] })
    expect(u).toEqual({
      ok: false,
      path: "format",
      message: 'must be "straightaway.drive/1" or "straightaway.drive/2"',
    })
  })

  it("refuses a check mark naming a check the file does not hold", () => {
    const file = metRoadTest()
    file.marks.push(check(70, "rear-cross-traffic", "pass"))
    const r = parseAnyDriveFile(JSON.parse(JSON.stringify(file)))
    expect(r).toEqual({ ok: false, path: "marks[3].checkKey", message: "is not one of the file's roadTest.checks" })
  })
})

describe("default road-test checks (common practice, no published source)", () => {
  it("cover each calibrated system named in the trade's road test", () => {
    expect(DEFAULT_ROAD_TEST_CHECKS.forward_radar.map((c) => c.key)).toEqual(["acc-engages", "acc-follows-lead"])
    expect(DEFAULT_ROAD_TEST_CHECKS.forward_camera.map((c) => [c.key, c.need])).toEqual([
      ["lane-keeping-engages", "required"],
      ["lane-departure-warning", "required"],
      ["sign-display", "where_equipped"],
    ])
    expect(DEFAULT_ROAD_TEST_CHECKS.corner_radar.map((c) => c.key)).toEqual([
      "blind-spot-left",
      "blind-spot-right",
      "rear-cross-traffic",
    ])
    expect(DEFAULT_ROAD_TEST_CHECKS.surround_camera.map((c) => c.minSpeedMph)).toEqual([null, null])
    for (const system of ROAD_TEST_SYSTEMS)
      for (const c of DEFAULT_ROAD_TEST_CHECKS[system]) expect(c.system).toBe(system)
  })

  it("merging the systems of one job keeps a shared key once", () => {
    const merged = mergeRoadTestChecks([DEFAULT_ROAD_TEST_CHECKS.corner_radar, DEFAULT_ROAD_TEST_CHECKS.rear_radar])
    expect(merged.map((c) => c.key)).toEqual(["blind-spot-left", "blind-spot-right", "rear-cross-traffic"])
  })
})
