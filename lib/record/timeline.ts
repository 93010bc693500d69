import type { ResolvedProfile } from "@/lib/drive-file/profile"
import type { Mark2 as Mark, Sample } from "@/lib/drive-file/schema"
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import { mphToMps, mpsToMph } from "@/lib/units"

export type StretchState = "qualifying" | "following" | "slow" | "gap"

export interface TimelinePoint {
  /** Seconds from the first kept sample. */
  tS: number
  lat: number
  lon: number
  speedMph: number | null
  /** State of the interval that starts at this point (the last point repeats the one before it). */
  state: StretchState
}

/**
 * For pictures only (chart, track, record): the state of each interval under drive-file rules 1-4.
 * The verdict and the minutes always come from the stored score, never from here.
 */
export function computeTimeline(
  samples: readonly Sample[],
  marks: readonly Mark[],
  profile: ResolvedProfile,
): TimelinePoint[] {
  const kept: Sample[] = []
  const seen = new Set<number>()
  for (const s of [...samples]
    .filter((s) => s.accuracy == null || s.accuracy <= profile.maxAccuracyM)
    .sort((a, b) => a.t - b.t)) {
    if (seen.has(s.t)) continue
    seen.add(s.t)
    kept.push(s)
  }
  if (kept.length === 0) return []
  const sortedMarks = [...marks].sort((a, b) => a.t - b.t)
  const minMps = mphToMps(profile.minSpeedMph)
  const maxMps = profile.maxSpeedMph == null ? Infinity : mphToMps(profile.maxSpeedMph)
  const t0 = kept[0]!.t
  const points: TimelinePoint[] = []
  let markIndex = 0
  let leadOn = false
  let gapFt: number | null = null
  for (let i = 0; i < kept.length; i++) {
    const a = kept[i]!
    while (markIndex < sortedMarks.length && sortedMarks[markIndex]!.t <= a.t) {
      const m = sortedMarks[markIndex++]!
      if (m.kind === "lead-on") {
        leadOn = true
        gapFt = m.gapFt ?? null
      } else if (m.kind === "gap" && leadOn) gapFt = m.gapFt ?? gapFt
      else if (m.kind === "lead-off") {
        leadOn = false
        gapFt = null
      }
    }
    const b = kept[i + 1]
    let state: StretchState = points.at(-1)?.state ?? "slow"
    let intervalMps: number | null = null
    if (b) {
      const dtS = (b.t - a.t) / 1000
      if (dtS > profile.maxGapSeconds) state = "gap"
      else {
        intervalMps =
          a.speed != null && b.speed != null
            ? (a.speed + b.speed) / 2
            : geodesicDistanceM(a.lat, a.lon, b.lat, b.lon) / dtS
        const qualifying = intervalMps >= minMps && intervalMps <= maxMps
        const gapInWindow = gapFt == null || (gapFt >= profile.leadGapFt.min && gapFt <= profile.leadGapFt.max)
        state = !qualifying ? "slow" : leadOn && gapInWindow ? "following" : "qualifying"
      }
    }
    const ownMps = a.speed ?? intervalMps ?? null
    points.push({
      tS: (a.t - t0) / 1000,
      lat: a.lat,
      lon: a.lon,
      speedMph: ownMps == null ? null : mpsToMph(ownMps),
      state,
    })
  }
  return points
}

/** Keeps at most `max` points, always the first and last and every change of state, for light pictures. */
export function thinTimeline(points: readonly TimelinePoint[], max: number): TimelinePoint[] {
  if (points.length <= max) return [...points]
  const step = Math.ceil(points.length / max)
  return points.filter(
    (p, i) => i === 0 || i === points.length - 1 || i % step === 0 || p.state !== points[i - 1]!.state,
  )
}

export interface TrackPath {
  state: StretchState
  /** Points in the picture's own units, y down. */
  points: Array<[number, number]>
}

/**
 * Projects the track into a width x height box (equirectangular around the mid latitude, which is
 * plenty for a few km of road), split into runs of one state. Keeps the aspect ratio.
 */
export function projectTrack(
  points: readonly TimelinePoint[],
  width: number,
  height: number,
  padding = 8,
): TrackPath[] {
  if (points.length < 2) return []
  const midLat = (Math.min(...points.map((p) => p.lat)) + Math.max(...points.map((p) => p.lat))) / 2
  const k = Math.cos((midLat * Math.PI) / 180)
  const xs = points.map((p) => p.lon * k)
  const ys = points.map((p) => p.lat)
  const minX = Math.min(...xs)
  const maxX = Math.max(...xs)
  const minY = Math.min(...ys)
  const maxY = Math.max(...ys)
  const spanX = Math.max(maxX - minX, 1e-9)
  const spanY = Math.max(maxY - minY, 1e-9)
  const scale = Math.min((width - 2 * padding) / spanX, (height - 2 * padding) / spanY)
  const offX = (width - spanX * scale) / 2
  const offY = (height - spanY * scale) / 2
  const at = (i: number): [number, number] => [
    round2(offX + (xs[i]! - minX) * scale),
    round2(height - (offY + (ys[i]! - minY) * scale)),
  ]
  const paths: TrackPath[] = []
  for (let i = 0; i < points.length - 1; i++) {
    const state = points[i]!.state
    const current = paths.at(-1)
    if (current && current.state === state) current.points.push(at(i + 1))
    else paths.push({ state, points: [at(i), at(i + 1)] })
  }
  return paths
}

function round2(x: number) {
  return Math.round(x * 100) / 100
}

export const STATE_LABEL: Record<StretchState, string> = {
  qualifying: "Qualifying",
  following: "Following",
  slow: "Not qualifying",
  gap: "No signal",
}
