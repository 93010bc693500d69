// One scored drive turned into its contribution to the shop's road model: per H3 cell and local time slot,
// seconds driven, seconds qualifying and following, harsh events and a speed histogram. Contributions
// add (and subtract) cell by cell, so the model is updated drive by drive, never rebuilt from all samples.
// The interval rules are the scorer's (shared/specs/drive-file.md rules 1-5); an interval belongs to the
// cell and the local hour of its first sample.
import { resolveProfile, type ResolvedProfile } from "@/lib/drive-file/profile"
import type { AnyDriveFile, Mark, Sample } from "@/lib/drive-file/schema"
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import { applyLeadMark, type LeadState } from "@/lib/scoring/lead-state"
import { MPS_PER_MPH } from "@/lib/units"
import { createCellLocator, parentCell } from "./cells"
import { createLocalClock, type LocalSlot } from "./clock"

/** Speed histogram: 2 mph buckets from 0; the last bucket holds 100 mph and above. Values are seconds. */
export const SPEED_BUCKET_MPH = 2
export const SPEED_BUCKETS = 51
/** `hour` / `weekday` of -1 mean "all": a row per cell for all times, per cell and hour, per cell and weekday. */
export const ALL = -1

export interface CellStat {
  cell: string
  hour: number
  weekday: number
  seconds: number
  qualifyingSeconds: number
  followingSeconds: number
  harshEvents: number
  speedHist: number[]
}

interface DriveRoadSummary {
  startedAtMs: number
  startLat: number
  startLon: number
  /** Local hour and weekday of the first sample, in the shop's zone. */
  start: LocalSlot
  /** Seconds of driving outside data gaps. */
  drivenSeconds: number
  qualifyingSeconds: number
  followingSeconds: number
  harshEvents: number
  /** The res-9 cells in the order driven (a cell repeats when the drive comes back to it). */
  route: string[]
  /** The res-8 cells the drive passed through, sorted: what decides its loop. */
  loopCells: string[]
  /** A thinned track for drawing: [lat, lon] at least ~60 m apart, at most 400 points. */
  track: [number, number][]
}

export interface DriveContribution {
  stats: CellStat[]
  /** The same, compact: one entry per (cell, weekday, hour) with the non-empty histogram buckets; what is stored. */
  buckets: StoredBucket[]
  summary: DriveRoadSummary | null
}

/** [cell, weekday, hour, seconds, qualifying s, following s, harsh events, [bucket, seconds, bucket, seconds, ...]] */
export type StoredBucket = [string, number, number, number, number, number, number, number[]]

function speedBucket(speedMps: number): number {
  return Math.min(SPEED_BUCKETS - 1, Math.floor(speedMps / MPS_PER_MPH / SPEED_BUCKET_MPH))
}

function keptSamples(samples: Sample[], profile: ResolvedProfile): Sample[] {
  const maxAcc = profile.maxAccuracyM
  // The usual file: every fix accurate enough, in time order, no repeated time. Then the samples serve as they are.
  let clean = true
  for (let i = 0; i < samples.length && clean; i++) {
    const s = samples[i]!
    if ((s.accuracy != null && s.accuracy > maxAcc) || (i > 0 && s.t <= samples[i - 1]!.t)) clean = false
  }
  if (clean) return samples
  const kept = samples.filter((s) => s.accuracy == null || s.accuracy <= maxAcc)
  let sorted = true
  for (let i = 1; i < kept.length && sorted; i++) if (kept[i]!.t < kept[i - 1]!.t) sorted = false
  if (!sorted) kept.sort((a, b) => a.t - b.t)
  const out: Sample[] = []
  for (const s of kept) if (!out.length || out[out.length - 1]!.t !== s.t) out.push(s)
  return out
}

interface Acc {
  seconds: number
  qualifyingSeconds: number
  followingSeconds: number
  harshEvents: number
  speedHist: number[]
}
const newAcc = (): Acc => ({
  seconds: 0,
  qualifyingSeconds: 0,
  followingSeconds: 0,
  harshEvents: 0,
  speedHist: new Array(SPEED_BUCKETS).fill(0),
})

export function computeDriveContribution(file: AnyDriveFile, timeZone: string): DriveContribution {
  const profile = resolveProfile(file.profile)
  const samples = keptSamples(file.samples, profile)
  if (samples.length < 2) return { stats: [], buckets: [], summary: null }
  // Road-test check marks (format /2) say nothing about the lead vehicle: only the learn marks count here.
  const marks = file.marks.filter((m): m is Mark => m.kind !== "check").sort((a, b) => a.t - b.t)
  const locate = createCellLocator()
  const clock = createLocalClock(timeZone)
  const minMps = profile.minSpeedMph * MPS_PER_MPH
  const maxMps = profile.maxSpeedMph == null ? Infinity : profile.maxSpeedMph * MPS_PER_MPH
  const gapMin = profile.leadGapFt.min
  const gapMax = profile.leadGapFt.max
  const n = samples.length

  // Interval speeds, then each sample's speed (rule 5).
  const intervalMps = new Float64Array(n - 1)
  const isGap = new Uint8Array(n - 1)
  for (let i = 0; i < n - 1; i++) {
    const a = samples[i]!
    const b = samples[i + 1]!
    const dt = (b.t - a.t) / 1000
    if (dt > profile.maxGapSeconds) isGap[i] = 1
    intervalMps[i] =
      a.speed != null && b.speed != null ? (a.speed + b.speed) / 2 : geodesicDistanceM(a.lat, a.lon, b.lat, b.lon) / dt
  }
  const sampleMps = (i: number): number => samples[i]!.speed ?? (i > 0 ? intervalMps[i - 1]! : intervalMps[0]!)

  const cells = new Map<string, Acc>()
  let lastCell = ""
  let lastSlot: LocalSlot | null = null
  let lastAcc: Acc | null = null
  const accFor = (cell: string, slot: LocalSlot): Acc => {
    if (lastAcc && cell === lastCell && slot === lastSlot) return lastAcc
    const key = `${cell}|${slot.weekday}|${slot.hour}`
    let acc = cells.get(key)
    if (!acc) cells.set(key, (acc = newAcc()))
    lastCell = cell
    lastSlot = slot
    lastAcc = acc
    return acc
  }
  const lead: LeadState = { leadOn: false, gapFt: null }
  let markIx = 0
  let accelRun = false
  let decelRun = false
  let driven = 0
  let qualifying = 0
  let following = 0
  let harsh = 0
  const route: string[] = []
  const loopSet = new Set<string>()
  const track: [number, number][] = []
  let lastTrack: Sample | null = null

  for (let i = 0; i < n - 1; i++) {
    const a = samples[i]!
    while (markIx < marks.length && marks[markIx]!.t <= a.t) applyLeadMark(lead, marks[markIx++]!)
    const cell = locate(a.lat, a.lon)
    if (route[route.length - 1] !== cell) {
      route.push(cell)
      loopSet.add(parentCell(cell))
    }
    if (!lastTrack || planarM2(lastTrack, a) >= 3600) {
      track.push([round6(a.lat), round6(a.lon)])
      lastTrack = a
    }
    if (isGap[i]) {
      accelRun = decelRun = false
      continue
    }
    const dt = (samples[i + 1]!.t - a.t) / 1000
    const v = intervalMps[i]!
    const acc = accFor(cell, clock(a.t))
    acc.seconds += dt
    driven += dt
    acc.speedHist[speedBucket(v)]! += dt
    const qualifies = v >= minMps && v <= maxMps
    if (qualifies) {
      acc.qualifyingSeconds += dt
      qualifying += dt
      if (lead.leadOn && (lead.gapFt == null || (lead.gapFt >= gapMin && lead.gapFt <= gapMax))) {
        acc.followingSeconds += dt
        following += dt
      }
    }
    const accel = (sampleMps(i + 1) - sampleMps(i)) / dt
    const isAccel = accel > profile.maxAccelMps2
    const isDecel = accel < -profile.maxDecelMps2
    if ((isAccel && !accelRun) || (isDecel && !decelRun)) {
      acc.harshEvents += 1
      harsh += 1
    }
    accelRun = isAccel
    decelRun = isDecel
  }
  const lastSample = samples[n - 1]!
  track.push([round6(lastSample.lat), round6(lastSample.lon)])
  const first = samples[0]!
  const summary: DriveRoadSummary = {
    startedAtMs: first.t,
    startLat: first.lat,
    startLon: first.lon,
    start: clock(first.t),
    drivenSeconds: driven,
    qualifyingSeconds: qualifying,
    followingSeconds: following,
    harshEvents: harsh,
    route,
    loopCells: [...loopSet].sort(),
    track: thin(track, 400),
  }
  return { stats: rollUp(cells), buckets: toStored(cells), summary }
}

function toStored(cells: Map<string, Acc>): StoredBucket[] {
  const out: StoredBucket[] = []
  for (const [key, acc] of cells) {
    const [cell, weekday, hour] = key.split("|") as [string, string, string]
    const hist: number[] = []
    acc.speedHist.forEach((x, b) => x && hist.push(b, x))
    out.push([
      cell,
      Number(weekday),
      Number(hour),
      acc.seconds,
      acc.qualifyingSeconds,
      acc.followingSeconds,
      acc.harshEvents,
      hist,
    ])
  }
  return out
}

/** The cell rows (all times, per hour, per weekday) of stored buckets: what a drive added, to take it back out. */
export function statsFromStored(buckets: StoredBucket[]): CellStat[] {
  const cells = new Map<string, Acc>()
  for (const [cell, weekday, hour, seconds, q, f, h, hist] of buckets) {
    const acc = newAcc()
    acc.seconds = seconds
    acc.qualifyingSeconds = q
    acc.followingSeconds = f
    acc.harshEvents = h
    for (let i = 0; i + 1 < hist.length; i += 2) acc.speedHist[hist[i]!] = hist[i + 1]!
    cells.set(`${cell}|${weekday}|${hour}`, acc)
  }
  return rollUp(cells)
}

/** Rows per cell: each (weekday, hour) folded into "all times", "this hour, any day" and "this weekday, any hour". */
function rollUp(cells: Map<string, Acc>): CellStat[] {
  const rows = new Map<string, CellStat>()
  const add = (cell: string, hour: number, weekday: number, acc: Acc) => {
    const key = `${cell}|${hour}|${weekday}`
    let row = rows.get(key)
    if (!row) rows.set(key, (row = { cell, hour, weekday, ...newAcc() }))
    row.seconds += acc.seconds
    row.qualifyingSeconds += acc.qualifyingSeconds
    row.followingSeconds += acc.followingSeconds
    row.harshEvents += acc.harshEvents
    for (let b = 0; b < SPEED_BUCKETS; b++) row.speedHist[b]! += acc.speedHist[b]!
  }
  for (const [key, acc] of cells) {
    const [cell, weekday, hour] = key.split("|") as [string, string, string]
    add(cell, ALL, ALL, acc)
    add(cell, Number(hour), ALL, acc)
    add(cell, ALL, Number(weekday), acc)
  }
  return [...rows.values()]
}

function thin(points: [number, number][], max: number): [number, number][] {
  if (points.length <= max) return points
  const step = points.length / max
  const out: [number, number][] = []
  for (let k = 0; k < max - 1; k++) out.push(points[Math.floor(k * step)]!)
  out.push(points[points.length - 1]!)
  return out
}

/** Squared distance in metres on a flat local approximation: plenty to thin a track for drawing. */
function planarM2(a: Sample, b: Sample): number {
  const dy = (b.lat - a.lat) * 110_574
  const dx = (b.lon - a.lon) * Math.cos((a.lat * Math.PI) / 180) * 111_320
  return dx * dx + dy * dy
}

function round6(x: number): number {
  return Math.round(x * 1e6) / 1e6
}

/** Adds `b` into `a`, scaled by `sign` (-1 takes a drive's old contribution back out). */
export function mergeStat(a: CellStat, b: CellStat, sign = 1): CellStat {
  return {
    ...a,
    seconds: a.seconds + sign * b.seconds,
    qualifyingSeconds: a.qualifyingSeconds + sign * b.qualifyingSeconds,
    followingSeconds: a.followingSeconds + sign * b.followingSeconds,
    harshEvents: a.harshEvents + sign * b.harshEvents,
    speedHist: a.speedHist.map((x, i) => x + sign * (b.speedHist[i] ?? 0)),
  }
}
