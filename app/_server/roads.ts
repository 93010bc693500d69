// Everything the Roads page, /api/roads and the recorder's "good roads now" line show, read from the
// stored road model (db/queries/roads): never recomputed from samples.
import "server-only"
import type { Db } from "@/db/client"
import {
  countRoadDrives,
  findLocationFromStarts,
  findRoadModelVersion,
  findRoadTracks,
  listCellTotals,
  listLoopDrives,
  listLoops,
} from "@/db/queries/roads"
import { findShopSettings, type ResolvedShopSettings } from "@/db/queries/shop-settings"
import { wholeSeconds } from "@/lib/format"
import { cellCentre, cellCorners } from "@/lib/roads/cells"
import { dayKindOf, localSlot, WEEKDAYS, type DayKind } from "@/lib/roads/clock"
import {
  cellFigures,
  compassWord,
  HOUR_WINDOW,
  rankLoopsOnBasis,
  TRUSTED_DRIVES,
  type CellFigures,
  type LoopBasis,
  type RankedLoop,
} from "@/lib/roads/model"
import { geodesicDistanceM } from "@/lib/scoring/geodesy"
import { WEEKDAY_KEYS, type RoadsQuery } from "@/lib/validation/roads"

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
  /** The day the loops are ranked for: one weekday (0 = Sunday), a kind of day, or neither (any day). */
  weekday: number | null
  dayKind: DayKind | null
  /** The weekday asked about (directly or as "now") when the history held too few drives for it: the loops rest on `dayKind`, or any day. */
  fellBackFromWeekday: number | null
  /** The hour and kind of day it is now at the shop. */
  now: { hour: number; weekday: number; dayKind: DayKind }
  drives: number
  completedDrives: number
  /** Which rows colour the map: the hour's (any day), the weekday's (any hour, when no hour is chosen), or all. */
  cellsBy: "hour" | "weekday" | "all"
  cells: (CellFigures & { corners: [number, number][] })[]
  loops: RoadLoopView[]
  trustedDrives: number
}

type ModelPart = Omit<RoadsView, "enabled" | "timeZone" | "units" | "hour" | "now" | "trustedDrives">

/**
 * The model's part of a view, kept per shop, model version (db road_model: a new token on every change) and
 * question, so a page view reads one small row while the model has not changed. Bounded: oldest out first.
 */
const VIEW_CACHE_MAX = 300
const viewCache = new Map<string, Promise<ModelPart>>()

export async function loadRoadsView(
  db: Db,
  shopId: string,
  q: RoadsQuery,
  nowMs = Date.now(),
  { withCells = true } = {},
): Promise<RoadsView> {
  const [settings, version] = await Promise.all([findShopSettings(db, shopId), findRoadModelVersion(db, shopId)])
  const nowSlot = localSlot(nowMs, settings.timeZone)
  const now = { ...nowSlot, dayKind: dayKindOf(nowSlot.weekday) }
  const hour = q.hour === "now" ? now.hour : q.hour === "all" ? null : q.hour
  const askedWeekday = q.day === "now" ? now.weekday : WEEKDAY_KEYS.indexOf(q.day as (typeof WEEKDAY_KEYS)[number])
  const bases: LoopBasis[] =
    askedWeekday >= 0
      ? [
          { weekday: askedWeekday, dayKind: null },
          { weekday: null, dayKind: dayKindOf(askedWeekday) },
          { weekday: null, dayKind: null },
        ]
      : [{ weekday: null, dayKind: q.day === "weekday" || q.day === "weekend" ? q.day : null }]
  const base = { timeZone: settings.timeZone, units: settings.units, hour, now, trustedDrives: TRUSTED_DRIVES }
  if (!settings.roadKnowledge) {
    return {
      ...base,
      enabled: false,
      weekday: null,
      dayKind: null,
      fellBackFromWeekday: null,
      location: null,
      drives: 0,
      completedDrives: 0,
      cellsBy: "all",
      cells: [],
      loops: [],
    }
  }
  const key = JSON.stringify([
    shopId,
    version,
    hour,
    bases,
    q.profileId ?? null,
    withCells,
    settings.location,
    settings.timeZone,
  ])
  let part = viewCache.get(key)
  if (!part) {
    part = loadModelPart(
      db,
      shopId,
      settings,
      hour,
      bases,
      q.profileId ?? null,
      askedWeekday >= 0 ? askedWeekday : null,
      withCells,
    )
    viewCache.set(key, part)
    part.catch(() => viewCache.delete(key))
    if (viewCache.size > VIEW_CACHE_MAX) viewCache.delete(viewCache.keys().next().value!)
  }
  return { ...base, enabled: true, ...(await part) }
}

async function loadModelPart(
  db: Db,
  shopId: string,
  settings: ResolvedShopSettings,
  hour: number | null,
  bases: LoopBasis[],
  profileId: string | null,
  askedWeekday: number | null,
  withCells: boolean,
): Promise<ModelPart> {
  // The map: the hour's rows when an hour is chosen (the model keeps hour and weekday apart), else the weekday's.
  const cellsBy = hour != null ? "hour" : askedWeekday != null ? "weekday" : "all"
  const [drives, totals, loops, derived, counts] = await Promise.all([
    listLoopDrives(db, shopId, hour == null ? undefined : hourWindow(hour)),
    withCells
      ? listCellTotals(db, shopId, { hour, weekday: cellsBy === "weekday" ? askedWeekday : null })
      : Promise.resolve([]),
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
  const { basis, loops: allRanked } = rankLoopsOnBasis(drives, { hour, profileId, home }, bases)
  const ranked = allRanked.slice(0, LOOPS_SHOWN)
  const tracks = await findRoadTracks(
    db,
    shopId,
    ranked.map((l) => l.fastestDriveId),
  )
  const loopById = new Map(loops.map((l) => [l.id, l]))
  const loopViews = ranked.map((l, i): RoadLoopView => {
    const loop = loopById.get(l.loopId)
    const found = tracks.get(l.fastestDriveId)
    const track = found?.track ?? []
    const far = farthest(track, home)
    return {
      ...l,
      fastestDriveId: found?.publicId ?? l.fastestDriveId,
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
    location,
    weekday: basis.weekday,
    dayKind: basis.dayKind,
    fellBackFromWeekday: askedWeekday != null && basis.weekday == null ? askedWeekday : null,
    drives: counts.drives,
    completedDrives: counts.completed,
    cellsBy,
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
  for (let i = 1; i < track.length; i++)
    m += geodesicDistanceM(track[i - 1]![0], track[i - 1]![1], track[i]![0], track[i]![1])
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
          /** Whole seconds, rounded down (lib/format wholeSeconds): what the recorder's line writes with formatDuration. */
          medianClearSeconds: wholeSeconds(best.medianClearSeconds),
          drives: best.drives,
          trusted: best.trusted,
          /** the days the figure rests on: "Tuesdays", "weekdays", "weekends", or null for every day */
          days:
            view.weekday != null
              ? `${WEEKDAYS[view.weekday]}s`
              : view.dayKind === "weekday"
                ? "weekdays"
                : view.dayKind === "weekend"
                  ? "weekends"
                  : null,
        }
      : null,
  }
}
