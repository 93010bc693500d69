import type { AnyDriveFile, Mark2 as Mark, Profile, Sample } from "@/lib/drive-file/schema"
import { resolveProfile, type ResolvedProfile } from "@/lib/drive-file/profile"
import { hasLearn, type DriveKind, type RoadTestCheck } from "@/lib/drive-file/road-test"
import { mpsToMph } from "@/lib/units"
import { ScoringEngine, type EngineTotals } from "./engine"
import { scoreRoadTest, worseVerdict } from "./road-test"
import type { Condition, Score, Verdict } from "./types"

/**
 * Scores a drive file that has already passed parseDriveFile or parseAnyDriveFile (no validation here: this
 * is the hot path). A version 1 file is scored exactly as before; a version 2 file adds its road test.
 */
export function scoreDrive(file: AnyDriveFile): Score {
  const engine = new ScoringEngine(resolveProfile(file.profile))
  engine.addSamples(file.samples)
  engine.addMarks(file.marks)
  const score = buildScore(engine)
  if (file.format !== "straightaway.drive/2") return score
  return withRoadTest(score, engine, file.kind, file.roadTest?.checks ?? [])
}

/**
 * Version 2: `learn` is scored as version 1; `road_test` by its checks alone (the learn conditions are left
 * out, the advisory ones stay); `learn_and_road_test` gets the worse verdict of the two and both sets of reasons.
 */
function withRoadTest(score: Score, engine: ScoringEngine, kind: DriveKind, checks: readonly RoadTestCheck[]): Score {
  if (kind === "learn") return { ...score, kind }
  const road = scoreRoadTest(checks, engine.totals().marks, (ms) => engine.speedAtMoment(ms))
  const condition: Condition = {
    key: "road-test",
    label: "Road-test checks passed at their speeds",
    met: road.met,
    value: road.passedRequired,
    required: road.required,
    unit: "checks",
    advisory: false,
    ...(road.met ? {} : { reason: road.reasons.join(" ") }),
  }
  const notes = [...score.notes, ...road.checks.filter((c) => !c.blocks && c.reason).map((c) => c.reason!)]
  if (!hasLearn(kind)) {
    return {
      ...score,
      kind,
      verdict: road.verdict,
      reasons: road.reasons,
      notes,
      conditions: [condition, ...score.conditions.filter((c) => c.advisory)],
      roadTest: road,
    }
  }
  return {
    ...score,
    kind,
    verdict: worseVerdict(score.verdict, road.verdict),
    reasons: [...score.reasons, ...road.reasons],
    notes,
    conditions: [...score.conditions, condition],
    roadTest: road,
  }
}

export interface LiveScorer {
  readonly profile: ResolvedProfile
  addSamples(samples: readonly Sample[]): void
  addMarks(marks: readonly Mark[]): void
  /** Equal to scoreDrive over everything added so far (samples and marks in arrival order). */
  score(): Score
}

export function createLiveScorer(profile?: Profile | ResolvedProfile | null): LiveScorer {
  const engine = new ScoringEngine(resolveProfile(profile))
  return {
    profile: engine.profile,
    addSamples: (samples) => engine.addSamples(samples),
    addMarks: (marks) => engine.addMarks(marks),
    score: () => buildScore(engine),
  }
}

/** Rule 8, verified part: the last good `verified` after the clear, and whether a `verify-failed` follows it. */
interface Verification {
  good: boolean
  lastGoodSpeedMps: number | null
  failedAfter: boolean
  slowCount: number
  unknownCount: number
}

function checkVerification(engine: ScoringEngine, marks: readonly Mark[], clearedAtMs: number | null): Verification {
  const out: Verification = { good: false, lastGoodSpeedMps: null, failedAfter: false, slowCount: 0, unknownCount: 0 }
  if (clearedAtMs === null) return out
  let lastGood = -1
  for (let k = 0; k < marks.length; k++) {
    const m = marks[k]!
    if (m.kind !== "verified" || m.t < clearedAtMs) continue
    const v = engine.speedAtMoment(m.t)
    if (v === null) out.unknownCount++
    else if (v < engine.verifySpeedThresholdMps) out.slowCount++
    else {
      lastGood = k
      out.lastGoodSpeedMps = v
    }
  }
  out.good = lastGood >= 0
  if (out.good) {
    for (let k = lastGood + 1; k < marks.length; k++) if (marks[k]!.kind === "verify-failed") out.failedAfter = true
  }
  return out
}

function buildScore(engine: ScoringEngine): Score {
  const profile = engine.profile
  const x = engine.totals()
  const cleared = x.clearedAtMs !== null
  const verification = checkVerification(engine, x.marks, x.clearedAtMs)
  const conditions = buildConditions(profile, x, verification)
  const byKey = (key: Condition["key"]) => conditions.find((c) => c.key === key)!

  let verdict: Verdict
  let deciding: Condition["key"][]
  if (!cleared) {
    verdict = "not_met"
    deciding = ["cleared", "time-limit", "qualifying-time", "following-time"]
  } else if (!byKey("qualifying-time").met || !byKey("following-time").met) {
    verdict = "short"
    deciding = ["qualifying-time", "following-time"]
  } else if (!byKey("verified").met) {
    verdict = "unverified"
    deciding = ["verified"]
  } else {
    verdict = "met"
    deciding = []
  }
  const reasons = deciding
    .map(byKey)
    .filter((c) => !c.met)
    .map((c) => c.reason!)
  const notes = conditions.filter((c) => c.advisory && !c.met).map((c) => c.reason!)

  return {
    verdict,
    reasons,
    notes,
    durationSeconds: round3(x.durationSeconds),
    distanceMeters: round3(x.distanceMeters),
    gapSeconds: round3(x.gapSeconds),
    qualifyingSeconds: round3(x.qualifyingSeconds),
    followingSeconds: round3(x.followingSeconds),
    qualifyingSecondsBeforeClear: round3(x.qualifyingSecondsBeforeClear),
    followingSecondsBeforeClear: round3(x.followingSecondsBeforeClear),
    clearedAtSeconds: clearedAtSeconds(x),
    harshEvents: { accel: x.accelEvents, decel: x.decelEvents },
    samplesUsed: x.samplesUsed,
    samplesDropped: x.samplesReceived - x.samplesUsed,
    samplesDroppedForAccuracy: x.samplesDroppedForAccuracy,
    duplicateSamples: x.duplicateSamples,
    startedAtMs: x.startedAtMs,
    endedAtMs: x.endedAtMs,
    conditions,
    profile,
  }
}

function clearedAtSeconds(x: EngineTotals): number | null {
  if (x.clearedAtMs === null) return null
  // Measured from the first kept sample; with no samples there is nothing to measure from.
  return x.startedAtMs === null ? null : round3((x.clearedAtMs - x.startedAtMs) / 1000)
}

function buildConditions(p: ResolvedProfile, x: EngineTotals, v: Verification): Condition[] {
  const cleared = x.clearedAtMs !== null
  const when = cleared ? "before the clear was" : "so far is"
  const speedBand =
    p.maxSpeedMph === null
      ? `${num(p.minSpeedMph)} mph or faster`
      : `${num(p.minSpeedMph)} to ${num(p.maxSpeedMph)} mph`
  const qualRequiredS = p.minQualifyingMinutes * 60
  const follRequiredS = p.minFollowingMinutes * 60
  const timeLimitS = p.maxDriveMinutes * 60
  const timedOut = !cleared && x.durationSeconds >= timeLimitS
  const qualMet = x.qualifyingSecondsBeforeClear >= qualRequiredS
  const follMet = x.followingSecondsBeforeClear >= follRequiredS
  const verifiedMet = v.good && !v.failedAfter
  const harshTotal = x.accelEvents + x.decelEvents

  return [
    {
      key: "cleared",
      label: "Learn reported complete",
      met: cleared,
      value: clearedAtSeconds(x),
      required: null,
      unit: "s",
      advisory: false,
      ...(cleared ? {} : { reason: "The vehicle never reported the learn complete (no cleared mark)." }),
    },
    {
      key: "time-limit",
      label: "Within the drive time limit",
      met: !timedOut,
      value: round3(x.durationSeconds),
      required: timeLimitS,
      unit: "s",
      advisory: false,
      ...(timedOut
        ? {
            reason: `The drive timed out: ${minutes(x.durationSeconds, Infinity)} min without a clear; the limit is ${num(p.maxDriveMinutes)} min.`,
          }
        : {}),
    },
    {
      key: "qualifying-time",
      label: `Qualifying time (${speedBand})`,
      met: qualMet,
      value: round3(x.qualifyingSecondsBeforeClear),
      required: qualRequiredS,
      unit: "s",
      advisory: false,
      ...(qualMet
        ? {}
        : {
            reason: `Qualifying time (${speedBand}) ${when} ${minutes(x.qualifyingSecondsBeforeClear, qualRequiredS)} min; ${num(p.minQualifyingMinutes)} min needed.`,
          }),
    },
    {
      key: "following-time",
      label: `Following time (lead ${num(p.leadGapFt.min)}-${num(p.leadGapFt.max)} ft ahead)`,
      met: follMet,
      value: round3(x.followingSecondsBeforeClear),
      required: follRequiredS,
      unit: "s",
      advisory: false,
      ...(follMet
        ? {}
        : {
            reason: `Following time (lead ${num(p.leadGapFt.min)}-${num(p.leadGapFt.max)} ft ahead, ${speedBand}) ${when} ${minutes(x.followingSecondsBeforeClear, follRequiredS)} min; ${num(p.minFollowingMinutes)} min needed.`,
          }),
    },
    {
      key: "verified",
      label: `Driver-assist seen working after the clear (${num(p.verifySpeedMph)} mph or faster)`,
      met: verifiedMet,
      value: v.lastGoodSpeedMps === null ? null : Math.round(mpsToMph(v.lastGoodSpeedMps) * 10) / 10,
      required: p.verifySpeedMph,
      unit: "mph",
      advisory: false,
      ...(verifiedMet ? {} : { reason: verificationReason(p, cleared, v) }),
    },
    {
      key: "harsh-events",
      label: "Harsh acceleration and braking",
      met: harshTotal === 0,
      value: harshTotal,
      required: 0,
      unit: "events",
      advisory: true,
      ...(harshTotal === 0
        ? {}
        : {
            reason: `${count(x.decelEvents, "hard-braking event")} (over ${num(p.maxDecelMps2)} m/s²) and ${count(x.accelEvents, "hard-acceleration event")} (over ${num(p.maxAccelMps2)} m/s²).`,
          }),
    },
    {
      key: "data-gaps",
      label: `Data gaps (pauses over ${num(p.maxGapSeconds)} s)`,
      met: x.gapSeconds === 0,
      value: round3(x.gapSeconds),
      required: 0,
      unit: "s",
      advisory: true,
      ...(x.gapSeconds === 0
        ? {}
        : {
            reason: `Position data stopped for ${num(Math.round(x.gapSeconds))} s in total (pauses over ${num(p.maxGapSeconds)} s); that time counts toward nothing.`,
          }),
    },
  ]
}

function verificationReason(p: ResolvedProfile, cleared: boolean, v: Verification): string {
  if (!cleared) return "Not checked: the learn never cleared."
  if (v.good && v.failedAfter) return "A verify-failed mark came after the last good verified mark."
  if (v.slowCount > 0)
    return `No verified mark after the clear at ${num(p.verifySpeedMph)} mph or faster (${count(v.slowCount, "verified mark")} below that speed).`
  if (v.unknownCount > 0)
    return `No verified mark after the clear at a known speed (${count(v.unknownCount, "verified mark")} where no position data shows the speed).`
  return "No verified mark after the clear: nobody recorded the driver-assist function working."
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000
}

/** Minutes with one decimal, rounded down while below `requiredS` so a shortfall never reads as met. */
function minutes(seconds: number, requiredS: number): string {
  const m = seconds / 60
  const shown = seconds < requiredS ? Math.floor(m * 10) / 10 : Math.round(m * 10) / 10
  return shown.toFixed(1)
}

function num(x: number): string {
  return String(Math.round(x * 100) / 100)
}

function count(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? "" : "s"}`
}
