// Reading the road model: figures per cell, loops ranked by how fast their learns completed, the
// legend's words, and the local projection the hex map is drawn in. Pure: the data comes from db/queries/roads.
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import { dayKindOf, hoursApart, type DayKind } from "./clock"
import { SPEED_BUCKET_MPH } from "./aggregate"

/** Below this many drives a figure is shown with a warning that it is too few to trust. */
export const TRUSTED_DRIVES = 5
/** A loop counts for "now" when its drives started within this many hours of the hour asked about. */
export const HOUR_WINDOW = 1
/** "Starting near the shop": the first sample within this distance of the shop's location. */
export const NEAR_SHOP_M = 1500
/** Two drives take the same loop when their res-8 cells overlap this much (Jaccard index). */
const SAME_LOOP_OVERLAP = 0.5

export interface CellTotals {
  cell: string
  seconds: number
  qualifyingSeconds: number
  followingSeconds: number
  harshEvents: number
  speedHist: number[]
}

export interface CellFigures {
  cell: string
  minutes: number
  qualifyingShare: number
  followingShare: number
  medianSpeedMph: number | null
  harshPerHour: number
}

/** The time-weighted median speed from the histogram, interpolated inside its bucket. */
export function medianFromHistogram(hist: number[], bucketMph = SPEED_BUCKET_MPH): number | null {
  const total = hist.reduce((s, x) => s + x, 0)
  if (!(total > 0)) return null
  let below = 0
  for (let b = 0; b < hist.length; b++) {
    const h = hist[b]!
    if (h > 0 && below + h >= total / 2) return (b + (total / 2 - below) / h) * bucketMph
    below += h
  }
  return (hist.length - 1) * bucketMph
}

export function cellFigures(t: CellTotals): CellFigures {
  const s = t.seconds
  return {
    cell: t.cell,
    minutes: s / 60,
    qualifyingShare: s > 0 ? t.qualifyingSeconds / s : 0,
    followingShare: s > 0 ? t.followingSeconds / s : 0,
    medianSpeedMph: medianFromHistogram(t.speedHist),
    harshPerHour: s > 0 ? t.harshEvents / (s / 3600) : 0,
  }
}

export const SHARE_CLASSES = [
  { key: "most", min: 0.75, words: "Mostly qualifying (75 % or more)" },
  { key: "often", min: 0.5, words: "Often qualifying (50-75 %)" },
  { key: "some", min: 0.25, words: "Sometimes qualifying (25-50 %)" },
  { key: "rare", min: 0, words: "Rarely qualifying (under 25 %)" },
] as const
export type ShareClass = (typeof SHARE_CLASSES)[number]["key"]

export function shareClass(share: number): ShareClass {
  return (SHARE_CLASSES.find((c) => share >= c.min) ?? SHARE_CLASSES[3]).key
}

export function jaccard(a: readonly string[], b: readonly string[]): number {
  if (!a.length && !b.length) return 1
  const set = new Set(a)
  let both = 0
  for (const x of b) if (set.has(x)) both++
  return both / (a.length + b.length - both)
}

/** The loop a drive belongs to: the known loop it overlaps most (at least SAME_LOOP_OVERLAP), else none. */
export function matchLoop<L extends { id: string; cells: string[] }>(cells: string[], loops: L[]): L | null {
  let best: L | null = null
  let bestOverlap = SAME_LOOP_OVERLAP
  for (const loop of loops) {
    const o = jaccard(cells, loop.cells)
    if (o >= bestOverlap) {
      best = loop
      bestOverlap = o
    }
  }
  return best
}

export interface LoopDrive {
  driveId: string
  loopId: string | null
  profileId: string | null
  hour: number
  weekday: number
  startLat: number
  startLon: number
  drivenSeconds: number
  qualifyingSeconds: number
  clearedSeconds: number | null
}

export interface RankedLoop {
  loopId: string
  /** Cleared drives matching the hour and day that the figures rest on. */
  drives: number
  trusted: boolean
  medianClearSeconds: number
  qualifyingShare: number
  fastestDriveId: string
  fastestClearSeconds: number
}

export interface LoopQuery {
  /** null = any hour */
  hour: number | null
  /** null = any day */
  dayKind: DayKind | null
  /** 0 = Sunday ... 6; null = any weekday (narrower than dayKind when both are given) */
  weekday?: number | null
  profileId?: string | null
  home: { lat: number; lon: number } | null
}

export function median(values: number[]): number {
  const v = [...values].sort((a, b) => a - b)
  const m = v.length >> 1
  return v.length % 2 ? v[m]! : (v[m - 1]! + v[m]!) / 2
}

/** Past learn drives that completed, grouped by loop and ranked: fastest median time to learn complete first. */
export function rankLoops(drives: LoopDrive[], q: LoopQuery): RankedLoop[] {
  const byLoop = new Map<string, LoopDrive[]>()
  for (const d of drives) {
    if (d.loopId == null || d.clearedSeconds == null) continue
    if (q.profileId && d.profileId !== q.profileId) continue
    if (q.hour != null && hoursApart(d.hour, q.hour) > HOUR_WINDOW) continue
    if (q.dayKind && dayKindOf(d.weekday) !== q.dayKind) continue
    if (q.weekday != null && d.weekday !== q.weekday) continue
    if (q.home && geodesicDistanceM(q.home.lat, q.home.lon, d.startLat, d.startLon) > NEAR_SHOP_M) continue
    const list = byLoop.get(d.loopId)
    if (list) list.push(d)
    else byLoop.set(d.loopId, [d])
  }
  const ranked: RankedLoop[] = []
  for (const [loopId, list] of byLoop) {
    const fastest = list.reduce((f, d) => (d.clearedSeconds! < f.clearedSeconds! ? d : f))
    const driven = list.reduce((s, d) => s + d.drivenSeconds, 0)
    ranked.push({
      loopId,
      drives: list.length,
      trusted: list.length >= TRUSTED_DRIVES,
      medianClearSeconds: median(list.map((d) => d.clearedSeconds!)),
      qualifyingShare: driven > 0 ? list.reduce((s, d) => s + d.qualifyingSeconds, 0) / driven : 0,
      fastestDriveId: fastest.driveId,
      fastestClearSeconds: fastest.clearedSeconds!,
    })
  }
  // Trusted loops first, then by median time; ties by qualifying share.
  return ranked.sort(
    (a, b) =>
      Number(b.trusted) - Number(a.trusted) ||
      a.medianClearSeconds - b.medianClearSeconds ||
      b.qualifyingShare - a.qualifyingShare,
  )
}

export type LoopBasis = { weekday: number | null; dayKind: DayKind | null }

/**
 * Ranks on the narrowest basis the history can carry: the first of `bases` (e.g. this weekday, then this kind
 * of day, then any day) whose best loop rests on at least TRUSTED_DRIVES drives; when none does, the last
 * (the broadest). Says which basis it used.
 */
export function rankLoopsOnBasis(
  drives: LoopDrive[],
  q: Omit<LoopQuery, "dayKind" | "weekday">,
  bases: LoopBasis[],
): { basis: LoopBasis; loops: RankedLoop[] } {
  let result: { basis: LoopBasis; loops: RankedLoop[] } | null = null
  for (const basis of bases) {
    result = { basis, loops: rankLoops(drives, { ...q, ...basis }) }
    if (result.loops[0]?.trusted) return result
  }
  return (
    result ?? {
      basis: { weekday: null, dayKind: null },
      loops: rankLoops(drives, { ...q, weekday: null, dayKind: null }),
    }
  )
}

/** The shop's place when settings name none: the median start of its drives. */
export function locationFromStarts(starts: { lat: number; lon: number }[]): { lat: number; lon: number } | null {
  if (!starts.length) return null
  return { lat: median(starts.map((s) => s.lat)), lon: median(starts.map((s) => s.lon)) }
}

const COMPASS = ["north", "north-east", "east", "south-east", "south", "south-west", "west", "north-west"] as const

/** "north-east": the direction of `to` seen from `from`. */
export function compassWord(from: { lat: number; lon: number }, to: { lat: number; lon: number }): string {
  const dx = (to.lon - from.lon) * Math.cos((from.lat * Math.PI) / 180)
  const dy = to.lat - from.lat
  const deg = ((Math.atan2(dx, dy) * 180) / Math.PI + 360) % 360
  return COMPASS[Math.round(deg / 45) % 8]!
}

/** Flat local projection around `origin`, metres east (x) and south (y, as SVG draws). Fine for ~30 km. */
export function createProjection(origin: { lat: number; lon: number }) {
  const cosLat = Math.cos((origin.lat * Math.PI) / 180)
  return (lat: number, lon: number): [number, number] => [
    (lon - origin.lon) * cosLat * 111_320,
    -(lat - origin.lat) * 110_574,
  ]
}

/** A round scale-bar length (1, 2, 5 x 10^n metres, or miles) no longer than `maxM`. */
export function niceScale(maxM: number, units: "imperial" | "metric"): { meters: number; label: string } {
  const unitM = units === "imperial" ? 1609.344 : 1000
  const unitWord = units === "imperial" ? "mi" : "km"
  const inUnits = maxM / unitM
  const pow = 10 ** Math.floor(Math.log10(inUnits))
  const step = [5, 2, 1].map((k) => k * pow).find((s) => s <= inUnits) ?? pow
  return { meters: step * unitM, label: `${step >= 1 ? step : step.toFixed(String(pow).length - 2)} ${unitWord}` }
}
