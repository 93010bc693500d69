// Invented drive tracks, made by code from a seed: the same options always give the same file.
// Roads are straight stretches joined by gentle bends (radius 1.5 km, well above the ~290 m
// minimum for 55 mph; AASHTO Green Book §3.3 simplified curve formula). Nothing here is a real route.

import { DRIVE_FORMAT, type DriveFile, type Mark, type Profile, type Sample } from "@/lib/drive-file/schema"
import { WGS84_A, WGS84_F } from "@/lib/scoring/geodesy"
import { mphToMps } from "@/lib/units"

export type DrivePattern = "met" | "short" | "never-cleared" | "harsh" | "unverified"

export interface GenerateDriveOptions {
  seed: number
  /** Start time, ms since the epoch. Default 2026-01-01T10:00:00Z. */
  startMs?: number
  /** Samples per second. Default 1. */
  hz?: number
  /** Drive length. Default 20. */
  minutes?: number
  /** Default: an invented spot in the US Midwest. */
  startLat?: number
  startLon?: number
  /** Initial heading in degrees from north; default drawn from the seed. */
  headingDeg?: number
  pattern?: DrivePattern
  profile?: Profile
  /** Share of samples (0..1) that come without a device speed. Default 0. */
  speedMissingShare?: number
  /** Number of 12 s reception drop-outs (data gaps). Default 0. */
  dataGaps?: number
}

/** Shortest drive, in minutes, that can show each pattern. */
export const PATTERN_MIN_MINUTES: Record<DrivePattern, number> = {
  met: 16,
  harsh: 16,
  unverified: 16,
  short: 8,
  "never-cleared": 1,
}

const DEFAULT_START_MS = Date.UTC(2026, 0, 1, 10, 0, 0)
const LEAD_GAPS_FT = [130, 145, 120, 150] as const

/** mulberry32: small, fast, well-mixed 32-bit PRNG; plenty for invented data. */
export function createRng(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export function generateDrive(options: GenerateDriveOptions): DriveFile {
  const {
    seed,
    startMs = DEFAULT_START_MS,
    hz = 1,
    minutes = 20,
    pattern = "met",
    speedMissingShare = 0,
    dataGaps = 0,
  } = options
  if (!(hz > 0)) throw new RangeError("hz must be more than 0")
  if (minutes < PATTERN_MIN_MINUTES[pattern]) {
    throw new RangeError(`pattern "${pattern}" needs at least ${PATTERN_MIN_MINUTES[pattern]} minutes`)
  }
  const rng = createRng(seed)
  const between = (lo: number, hi: number) => lo + (hi - lo) * rng()
  const totalS = minutes * 60
  const count = Math.max(2, Math.round(totalS * hz))
  const dtS = 1 / hz

  const lastMs = startMs + Math.round(((count - 1) * 1000) / hz)
  const marks = planMarks(pattern, totalS, startMs, lastMs)
  const gapWindows = planGaps(dataGaps, totalS, marks, startMs)
  const harshWindows =
    pattern === "harsh"
      ? [
          { fromS: 3 * 60 + 20, toS: 3 * 60 + 22.5, accel: -4.5 },
          { fromS: 9 * 60 + 40, toS: 9 * 60 + 42.5, accel: -4.8 },
          { fromS: 9 * 60 + 46, toS: 9 * 60 + 48.5, accel: 3.6 },
        ]
      : []

  let lat = options.startLat ?? between(41.2, 43.8)
  let lon = options.startLon ?? between(-95.5, -89.5)
  let headingRad = ((options.headingDeg ?? between(0, 360)) * Math.PI) / 180
  const cruiseMps = mphToMps(between(50, 62))
  const wigglePeriodS = between(70, 120)
  const wiggleMps = mphToMps(between(0.8, 2))
  // Road: straight for 2-6 km, then a bend of 5-30 degrees on a 1.5 km radius.
  let straightLeftM = between(2000, 6000)
  let bendLeftRad = 0
  let bendSign = 1
  const bendRadiusM = 1500

  let v = 0
  const samples: Sample[] = []
  for (let i = 0; i < count; i++) {
    const tS = i * dtS
    const t = startMs + Math.round((i * 1000) / hz)
    const inGap = gapWindows.some((g) => t > g.fromMs && t < g.toMs)
    if (!inGap) {
      const accuracy = rng() < 0.001 ? 48 : Math.round(between(3, 8) * 10) / 10
      const sample: Sample = { t, lat: round(lat, 7), lon: round(lon, 7), accuracy }
      if (!(rng() < speedMissingShare)) sample.speed = round(v, 2)
      samples.push(sample)
    } else {
      rng() // keep the random stream independent of drop-outs
    }
    // Speed for the next step.
    const harsh = harshWindows.find((w) => tS >= w.fromS && tS < w.toS)
    let accel: number
    if (harsh) accel = harsh.accel
    else {
      const target = tS >= totalS - 35 ? 0 : cruiseMps + wiggleMps * Math.sin((2 * Math.PI * tS) / wigglePeriodS)
      accel = clamp(0.5 * (target - v), -1.2, 1.2)
    }
    const stepM = Math.max(0, v + (accel * dtS) / 2) * dtS
    v = Math.max(0, v + accel * dtS)
    // Heading along the road.
    if (straightLeftM > 0) straightLeftM -= stepM
    else if (bendLeftRad <= 0) {
      bendLeftRad = (between(5, 30) * Math.PI) / 180
      bendSign = rng() < 0.5 ? -1 : 1
    } else {
      const turn = Math.min(bendLeftRad, stepM / bendRadiusM)
      headingRad += bendSign * turn
      bendLeftRad -= turn
      if (bendLeftRad <= 0) straightLeftM = between(2000, 6000)
    }
    ;[lat, lon] = stepOnEllipsoid(lat, lon, headingRad, stepM)
  }

  const file: DriveFile = { format: DRIVE_FORMAT, samples, marks }
  if (options.profile) file.profile = options.profile
  return file
}

function planMarks(pattern: DrivePattern, totalS: number, startMs: number, lastMs: number): Mark[] {
  const at = (s: number) => startMs + Math.round(s * 1000)
  const marks: Mark[] = [
    { t: at(45), kind: "lead-on", gapFt: LEAD_GAPS_FT[0] },
    { t: at(60), kind: "note", text: "Tires at placard pressure; alignment checked before the drive." },
  ]
  const add = (s: number, m: Omit<Mark, "t">) => {
    if (s < totalS - 40) marks.push({ t: at(s), ...m } as Mark)
  }
  add(150, { kind: "gap", gapFt: LEAD_GAPS_FT[1] })
  add(240, { kind: "gap", gapFt: LEAD_GAPS_FT[2] })
  add(330, { kind: "lead-off" })
  add(480, { kind: "lead-on" })
  add(540, { kind: "gap", gapFt: LEAD_GAPS_FT[3] })
  add(660, { kind: "lead-off" })
  if (pattern === "short") {
    add(6 * 60, { kind: "cleared" })
    add(7 * 60, { kind: "verified" })
  } else if (pattern !== "never-cleared") {
    add(13 * 60, { kind: "cleared" })
    add(14 * 60, { kind: "verified" })
    if (pattern === "unverified") add(15 * 60, { kind: "verify-failed" })
  }
  marks.push({ t: lastMs, kind: "stopped" })
  marks.sort((a, b) => a.t - b.t)
  return marks
}

function planGaps(k: number, totalS: number, marks: Mark[], startMs: number): { fromMs: number; toMs: number }[] {
  const windows: { fromMs: number; toMs: number }[] = []
  const verifyTimes = marks.filter((m) => m.kind === "verified").map((m) => m.t)
  for (let g = 0; g < k; g++) {
    let fromMs = startMs + Math.round(((g + 1) * totalS * 1000) / (k + 1))
    if (verifyTimes.some((t) => Math.abs(t - fromMs) < 60_000)) fromMs += 90_000
    windows.push({ fromMs, toMs: fromMs + 12_000 })
  }
  return windows
}

/** Moves a short step along a heading on the WGS-84 ellipsoid (local meridian and prime-vertical radii). */
function stepOnEllipsoid(latDeg: number, lonDeg: number, headingRad: number, stepM: number): [number, number] {
  const phi = (latDeg * Math.PI) / 180
  const e2 = WGS84_F * (2 - WGS84_F)
  const s = Math.sin(phi)
  const w = Math.sqrt(1 - e2 * s * s)
  const meridianM = (WGS84_A * (1 - e2)) / (w * w * w)
  const primeM = WGS84_A / w
  const dLat = (stepM * Math.cos(headingRad)) / meridianM
  const dLon = (stepM * Math.sin(headingRad)) / (primeM * Math.cos(phi))
  let lon = lonDeg + (dLon * 180) / Math.PI
  if (lon >= 180) lon -= 360
  else if (lon < -180) lon += 360
  return [clamp(latDeg + (dLat * 180) / Math.PI, -89.9, 89.9), lon]
}

function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x
}

function round(x: number, digits: number): number {
  const k = 10 ** digits
  return Math.round(x * k) / k
}
