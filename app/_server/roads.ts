// Everything the Roads page, /api/roads and the recorder's "good roads now" line show, read from the
// stored road model (db/queries/roads): never recomputed from samples.
import "server-only"
import type { Db } from "@/db/client"
import { countRoadDrives, findLocationFromStarts, findRoadTracks, listCellTotals, listLoopDrives, listLoops } from "@/db/queries/roads"
import { findShopSettings } from "@/db/queries/shop-settings"
import { cellCentre, cellCorners } from "@/lib/roads/cells"
import { dayKindOf, localSlot, type DayKind } from "@/lib/roads/clock"
import { cellFigures, compassWord, HOUR_WINDOW, rankLoops, TRUSTED_DRIVES, type CellFigures, type RankedLoop } from "@/lib/roads/model"
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import type { RoadsQuery } from "@/lib/validation/roads"

/** Cells farther than this from the shop are left off the map. */
const MAP_RADIUS_M = 15_000
const LOOPS_SHOWN = 3

interface RoadLoopView extends RankedLoop {
  rank: number
  number: number
  name: string
  direction: string
  lengthMeters: number
  track: [number, number][]
}

export interface RoadsView {
  enabled: boolean
  timeZone: string
  units: "imperial" | "metric"
  location: { lat: number; lon: number; source: "settings" | "drive starts" } | null
  hour: number | null
  dayKind: DayKind | null
  /** The hour and kind of day it is now at the shop. */
  now: { hour: number; weekday: number; dayKind: DayKind }
  drives: number
  completedDrives: number
  cells: (CellFigures & { corners: [number, number][] })[]
  loops: RoadLoopView[]
  trustedDrives: number
}

export async function loadRoadsView(db: Db, shopId: string, q: RoadsQuery, nowMs = Date.now(), { withCells = true } = {}): Promise<RoadsView> {
  const settings = await findShopSettings(db, shopId)
  const nowSlot = localSlot(nowMs, settings.timeZone)
  const now = { ...nowSlot, dayKind: dayKindOf(nowSlot.weekday) }
  const hour = q.hour === "now" ? now.hour : q.hour === "all" ? null : q.hour
  const dayKind = q.day === "now" ? now.dayKind : q.day === "all" ? null : q.day
  const base = { timeZone: settings.timeZone, units: settings.units, hour, dayKind, now, trustedDrives: TRUSTED_DRIVES }
  if (!settings.roadKnowledge) {
    return { ...base, enabled: false, location: null, drives: 0, completedDrives: 0, cells: [], loops: [] }
  }
  const [drives, totals, loops, derived, counts] = await Promise.all([
    listLoopDrives(db, shopId, hour == null ? undefined : hourWindow(hour)),
    withCells ? listCellTotals(db, shopId, { hour, weekday: null }) : Promise.resolve([]),
    listLoops(db, shopId),
    settings.location ? Promise.resolve(null) : findLocationFromStarts(db, shopId),
    countRoadDrives(db, shopId),
  ])
  const location = settings.location
    ? { ...settings.location, source: "settings" as const }
    : derived
      ? { ...derived, source: "drive starts" as const }
      : null
  const home = location ? { lat: location.lat, lon: location.lon } : null
  const ranked = rankLoops(drives, { hour, dayKind, profileId: q.profileId ?? null, home }).slice(0, LOOPS_SHOWN)
  const tracks = await findRoadTracks(db, shopId, ranked.map((l) => l.fastestDriveId))
  const loopById = new Map(loops.map((l) => [l.id, l]))
  const loopViews = ranked.map((l, i): RoadLoopView => {
    const loop = loopById.get(l.loopId)
    const track = tracks.get(l.fastestDriveId) ?? []
    const far = farthest(track, home)
    return {
      ...l,
      rank: i + 1,
      number: loop?.number ?? 0,
      name: loop?.name ?? `Loop ${loop?.number ?? "?"}`,
      direction: home && far ? compassWord(home, { lat: far[0], lon: far[1] }) : "",
      lengthMeters: trackLength(track),
      track,
    }
  })
  const cells = totals
    .filter((t) => !home || geodesicDistanceM(home.lat, home.lon, ...cellCentre(t.cell)) <= MAP_RADIUS_M)
    .map((t) => ({ ...cellFigures(t), corners: cellCorners(t.cell) }))
  return {
    ...base,
    enabled: true,
    location,
    drives: counts.drives,
    completedDrives: counts.completed,
    cells,
    loops: loopViews,
  }
}

function hourWindow(hour: number): number[] {
  const hours: number[] = []
  for (let d = -HOUR_WINDOW; d <= HOUR_WINDOW; d++) hours.push((hour + d + 24) % 24)
  return hours
}

function farthest(track: [number, number][], home: { lat: number; lon: number } | null) {
  if (!home || !track.length) return null
  let best = track[0]!
  let bestD = -1
  for (const p of track) {
    const d = (p[0] - home.lat) ** 2 + ((p[1] - home.lon) * Math.cos((home.lat * Math.PI) / 180)) ** 2
    if (d > bestD) {
      best = p
      bestD = d
    }
  }
  return best
}

function trackLength(track: [number, number][]): number {
  let m = 0
  for (let i = 1; i < track.length; i++) m += geodesicDistanceM(track[i - 1]![0], track[i - 1]![1], track[i]![0], track[i]![1])
  return m
}

/** The recorder's one line: the best loop for this hour and kind of day. */
export async function loadGoodRoadsNow(db: Db, shopId: string, nowMs = Date.now()) {
  const view = await loadRoadsView(db, shopId, { hour: "now", day: "now" }, nowMs, { withCells: false })
  const best = view.loops[0]
  return {
    enabled: view.enabled,
    line: best
      ? {
          loopId: best.loopId,
          name: best.name,
          direction: best.direction,
          medianClearMinutes: Math.round(best.medianClearSeconds / 60),
          drives: best.drives,
          trusted: best.trusted,
        }
      : null,
  }
}
